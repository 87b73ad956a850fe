// The "Additions to version 1" of docs/model-format.md: bucklingFactor, section, sections,
// selfWeight, combinations, design.sizing. Valid files load; bad ones are refused with a
// message naming the item.
import { describe, expect, it } from "vitest";
import { rejections } from "../../support/model-rejections";
import { parseModel } from "~/engine/truss";

const base = () => ({
  format: "strutwise.truss",
  version: 1,
  name: "Harrowgate depot canopy (invented)",
  units: { length: "mm", force: "N", mass: "t" },
  dimension: 2,
  materials: [{ id: "steel", E: 210000, density: 7.85e-9, allowableTension: 235, allowableCompression: 235 }],
  nodes: [
    { id: "A", x: 0, y: 0, fixed: ["x", "y"] },
    { id: "B", x: 4000, y: 0, fixed: ["y"] },
    { id: "C", x: 2000, y: 1500 },
  ] as Record<string, unknown>[],
  members: [
    { id: "AB", start: "A", end: "B", material: "steel", area: 1000, group: "chord", bucklingFactor: 0.9 },
    { id: "BC", start: "B", end: "C", material: "steel", section: "CHS 60.3x4" },
    { id: "CA", start: "C", end: "A", material: "steel", area: 800 },
  ] as Record<string, unknown>[],
  sections: [
    { id: "CHS 60.3x4", area: 707.5, I: 2.7e5, family: "CHS" },
    { id: "CHS 88.9x4", area: 1066.9, I: 9.6e5, family: "CHS" },
  ] as Record<string, unknown>[],
  loadCases: [
    { id: "G", name: "Own weight", selfWeight: 1, loads: [] },
    { id: "S", name: "Snow", loads: [{ node: "C", fy: -20000 }] },
  ] as Record<string, unknown>[],
  combinations: [
    { id: "ULS-1", use: "strength", factors: { G: 1.35, S: 1.5 } },
    { id: "SLS-1", use: "service", factors: { G: 1, S: 1 } },
  ] as Record<string, unknown>[],
  design: {
    objective: "mass",
    sizing: "catalogue",
    areaBounds: { min: 10, max: 20000 },
    groups: [{ id: "chord", min: 100, max: 8000 }],
    constraints: { stress: true, buckling: { effectiveLengthFactor: 1 } },
  } as Record<string, unknown>,
});

type M = ReturnType<typeof base>;
const { expectError } = rejections(base);

describe("model additions: valid files", () => {
  it("load, and a member with a section takes the section's area", () => {
    const r = parseModel(base());
    expect(r.ok, JSON.stringify(!r.ok && r.errors)).toBe(true);
    if (!r.ok) return;
    expect(r.model.members[1].area).toBe(707.5);
    expect(r.model.members[0].bucklingFactor).toBe(0.9);
    expect(r.model.loadCases[0].selfWeight).toBe(1);
    expect(r.model.combinations?.map((c) => c.use)).toEqual(["strength", "service"]);
    expect(r.model.design?.sizing).toBe("catalogue");
    expect(r.warnings).toEqual([]);
  });

  it("warn that the area of a member with a section is ignored", () => {
    const m = base();
    m.members[1].area = 500;
    const r = parseModel(m);
    expect(r.ok).toBe(true);
    expect(r.warnings.some((w) => w.path === "members[1].area" && /ignored.*CHS 60\.3x4/.test(w.message))).toBe(true);
  });
});

describe("model additions: bad input names the item", () => {
  it("a combination factor on an unknown load case", () =>
    expectError((m) => (m.combinations[0].factors = { G: 1.35, W: 1.5 }), "combinations[0].factors.W", /unknown load case "W"/));
  it("a duplicate id between cases and combinations", () =>
    expectError((m) => (m.combinations[1].id = "S"), "combinations[1].id", /"S" is also a load case id/));
  it("a duplicate combination id", () =>
    expectError((m) => (m.combinations[1].id = "ULS-1"), "combinations[1].id", /duplicate combination id "ULS-1"/));
  it("a combination without use", () =>
    expectError((m) => delete m.combinations[0].use, "combinations[0].use", /strength or service/));
  it("a member section not in the catalogue", () =>
    expectError((m) => (m.members[1].section = "SHS 50x3"), "members[1].section", /"SHS 50x3", which is not in the model's sections/));
  it("a member with neither area nor section", () =>
    expectError((m) => delete m.members[2].area, "members[2].area", /missing.*area or a section/));
  it("catalogue sizing without sections", () =>
    expectError((m) => {
      delete (m as Partial<M>).sections;
      m.members[1].section = undefined;
      m.members[1].area = 700;
    }, "design.sizing", /catalogue sizing needs a section catalogue/));
  it("a non-positive I", () =>
    expectError((m) => (m.sections[0].I = 0), "sections[0].I", /I \(least second moment of area\) must be greater than zero/));
  it("a variable with no section within its bounds", () =>
    expectError((m) => (m.design.groups = [{ id: "chord", min: 2000, max: 8000 }]), "design.sizing", /group "chord" has no section with an area within its bounds 2000\.\.8000/));
  it("a non-positive bucklingFactor", () =>
    expectError((m) => (m.members[0].bucklingFactor = -1), "members[0].bucklingFactor", /greater than zero/));
  it("buckling without sections needs sectionRatio", () =>
    expectError((m) => {
      delete (m as Partial<M>).sections;
      m.members[1].section = undefined;
      m.members[1].area = 700;
      m.design.sizing = "continuous";
    }, "design.constraints.buckling.sectionRatio", /sectionRatio is needed/));
  it("a duplicate section id", () =>
    expectError((m) => (m.sections[1].id = "CHS 60.3x4"), "sections[1].id", /duplicate section id/));
  it("an unknown use", () =>
    expectError((m) => (m.combinations[0].use = "ultimate"), "combinations[0].use", /strength or service/));
});
