// The catalogue CSV reader: units read from the header and converted to mm, and every bad row
// named by row (as a spreadsheet numbers it, header = row 1) and column, with no sections
// returned for a file that has any problem.
import { describe, expect, it } from "vitest";
import { applyCatalogue, sectionsInUnit } from "~/lib/catalogues/apply";
import { catalogueTemplateCsv, columnLetter, normalizeHeader, parseCatalogueCsv } from "~/lib/catalogues/csv";

const paths = (r: ReturnType<typeof parseCatalogueCsv>) => (r.ok ? [] : r.details.map((d) => `${d.path}: ${d.message}`));

describe("parseCatalogueCsv", () => {
  it("reads the template; its rows match the round-tube formulas (A = π/4 (D² − d²), I = π/64 (D⁴ − d⁴), closed form)", () => {
    const r = parseCatalogueCsv(catalogueTemplateCsv(), "template.csv");
    if (!r.ok) throw new Error(r.error);
    expect(r.sections).toHaveLength(2);
    expect(r.dimensionNames).toEqual(["D", "t"]);
    expect(r.families).toEqual(["tube"]);
    for (const s of r.sections) {
      const D = s.dimensions!.D!;
      const d = D - 2 * s.dimensions!.t!;
      expect(s.area).toBeCloseTo((Math.PI / 4) * (D * D - d * d), 0); // 0.1 mm² in the file
      expect(s.I / ((Math.PI / 64) * (D ** 4 - d ** 4))).toBeCloseTo(1, 4);
      expect(s.massPerLength! / (s.area * 1e-6 * 7850)).toBeCloseTo(1, 3); // steel 7850 kg/m³, common practice
    }
  });

  it("converts cm, in and lb/ft headers to mm, mm², mm⁴ and kg/m (NIST SP 811 factors)", () => {
    const r = parseCatalogueCsv("id,family,area (cm²),I [cm4],D_in,mass (lb/ft)\nP1,pipe,10,100,2,1\n");
    if (!r.ok) throw new Error(r.error);
    const s = r.sections[0]!;
    expect(s.area).toBeCloseTo(1000, 9); // 10 cm² = 1000 mm²
    expect(s.I).toBeCloseTo(1e6, 6); // 100 cm⁴ = 1e6 mm⁴
    expect(s.dimensions!.D).toBeCloseTo(50.8, 12); // 2 in
    expect(s.massPerLength).toBeCloseTo(0.45359237 / 0.3048, 12); // 1 lb/ft = 1.48816 kg/m
  });

  it("names each bad row and column and returns no sections", () => {
    const csv = [
      "id,family,area_mm2,I_mm4", // row 1
      "A1,tube,500,2e5", // row 2: fine
      "A2,tube,600", // row 3: I missing (row ends early)
      "A3,tube,700,-5", // row 4: non-positive I
      "A1,tube,800,3e5", // row 5: duplicate id of row 2
      "A4,,900,4e5", // row 6: family missing
      "A5,tube,1 000,4e5", // row 7: not a number
      "A6,tube,0,4e5", // row 8: zero area
      "", // row 9: blank, skipped
      "A7,tube,900,4e5,extra", // row 10: too many values
    ].join("\n");
    const r = parseCatalogueCsv(csv, "stock.csv");
    expect(r.ok).toBe(false);
    expect(paths(r)).toEqual([
      "stock.csv row 3 I_mm4: column D: missing (the row ends early)",
      "stock.csv row 4 I_mm4: column D: the second moment of area must be greater than zero (found -5)",
      'stock.csv row 5 id: column A: the id "A1" is already used in row 2',
      "stock.csv row 6 family: column B: missing",
      'stock.csv row 7 area_mm2: column C: "1 000" is not a number (a point for decimals, no thousands separators)',
      "stock.csv row 8 area_mm2: column C: the area must be greater than zero (found 0)",
      "stock.csv row 10: 5 values, but the header names 4 columns",
    ]);
    expect(r.ok ? "" : r.error).toMatch(/7 problems; nothing was stored/);
  });

  it("refuses a header without units, without a required column, or with a repeated one", () => {
    expect(paths(parseCatalogueCsv("id,family,area,I_mm4\nX,f,1,1\n", "a.csv"))).toEqual([
      "a.csv row 1 area: column C: the area needs its unit in the header: area_mm2 (or area_cm2, area_m2, area_in2, area_ft2)",
      "a.csv row 1: the header has no area_mm2 (cross-section area, unit in the name) column",
    ]);
    expect(paths(parseCatalogueCsv("id,area_mm2,I_mm4,I_cm4\nX,1,1,1\n", "b.csv"))).toEqual([
      "b.csv row 1 I_cm4: column D repeats column C (I_mm4)",
      "b.csv row 1: the header has no family column",
    ]);
    expect(paths(parseCatalogueCsv("id,family,area_mm2,I_mm4,colour\n", "c.csv"))[0]).toMatch(/^c\.csv row 1 colour: column E: unknown column/);
  });

  it("refuses an empty file and a header without rows", () => {
    expect(parseCatalogueCsv("  \n", "e.csv")).toMatchObject({ ok: false, error: "e.csv is empty" });
    expect(parseCatalogueCsv("id,family,area_mm2,I_mm4\n\n", "h.csv")).toMatchObject({ ok: false, details: [{ path: "h.csv row 2", message: "no sections below the header" }] });
  });

  it("reads semicolon-separated files and a byte-order mark, as spreadsheets save them", () => {
    const r = parseCatalogueCsv("\ufeffid;family;area_mm2;I_mm4\nS1;solid;314.16;7854\n");
    expect(r.ok && r.sections[0]).toEqual({ id: "S1", family: "solid", area: 314.16, I: 7854 });
  });

  it("header forms and column letters", () => {
    expect(normalizeHeader(" area (mm²) ")).toBe("area_mm2");
    expect(normalizeHeader("mass [kg/m]")).toBe("mass_kg_per_m");
    expect([0, 25, 26, 27, 701, 702].map(columnLetter)).toEqual(["A", "Z", "AA", "AB", "ZZ", "AAA"]);
  });
});

describe("applyCatalogue", () => {
  const catalogue = {
    name: "Yard stock",
    sections: [
      { id: "T1", family: "tube", area: 1000, I: 2e6 },
      { id: "R1", family: "rod", area: 314.159, I: 7853.98 },
    ],
  };
  it("copies the sections into the model in its length unit (1 mm² = 1e-6 m², 1 mm⁴ = 1e-12 m⁴)", () => {
    const r = applyCatalogue({ name: "x", units: { length: "m", force: "kN", mass: "t" }, members: [] }, catalogue, ["tube"]);
    if (!r.ok) throw new Error(r.error);
    const s = (r.model.sections as { id: string; area: number; I: number; family: string }[])[0]!;
    expect(s.id).toBe("T1");
    expect(s.area).toBeCloseTo(1e-3, 15);
    expect(s.I).toBeCloseTo(2e-6, 18);
    expect(r.sectionCount).toBe(1);
    expect(sectionsInUnit(catalogue.sections, "in")[0]!.area).toBeCloseTo(1000 / 25.4 ** 2, 10);
  });
  it("warns when the file's own sections are replaced, and refuses an unknown family or unit", () => {
    const r = applyCatalogue({ units: { length: "mm" }, sections: [{ id: "old", area: 1, I: 1 }] }, catalogue);
    expect(r.ok && r.warnings[0]!.message).toBe('the file\'s own 1 sections were replaced by 2 from the catalogue "Yard stock"');
    expect(applyCatalogue({ units: { length: "mm" } }, catalogue, ["angle"])).toMatchObject({ ok: false, details: [{ path: "catalogueFamilies" }] });
    expect(applyCatalogue({ units: { length: "furlong" } }, catalogue)).toMatchObject({ ok: false, details: [{ path: "units.length" }] });
  });
});
