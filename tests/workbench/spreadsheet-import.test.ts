// Spreadsheet import: models round-trip JSON -> CSV (and -> .xlsx) -> import -> JSON unchanged
// (the ten-bar benchmark fixture, the demo relay mast in 3D, a generated tower), and broken
// spreadsheets are refused with every problem named by file (or sheet), row and column, rows
// numbered as a spreadsheet shows them (header = row 1). Workbooks are written and read with
// exceljs; the CSV side is plain RFC 4180 text read by papaparse.
import fs from "node:fs";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { generateModel } from "~/engine/generators";
import { importSpreadsheet, modelToCsvFiles, writeWorkbook, type SpreadsheetFiles } from "~/lib/models/spreadsheet";

const enc = (s: string) => new TextEncoder().encode(s);
const readJson = (f: string) => JSON.parse(fs.readFileSync(f, "utf8")) as Record<string, unknown>;
const tower = () => {
  const r = generateModel("lattice-tower", { legs: 3, panels: 4, bracing: "k" });
  if (!r?.ok) throw new Error("tower refused");
  return JSON.parse(JSON.stringify(r.model)) as Record<string, unknown>;
};

function csvFiles(model: Record<string, unknown>): SpreadsheetFiles {
  const f = modelToCsvFiles(model);
  return {
    nodes: { name: "nodes.csv", bytes: enc(f.nodes) },
    members: { name: "members.csv", bytes: enc(f.members) },
    loads: { name: "loads.csv", bytes: enc(f.loads) },
    settings: { name: "settings.json", text: f.settings },
  };
}

describe("round trip JSON -> spreadsheet -> import -> JSON", () => {
  const models: [string, () => Record<string, unknown>][] = [
    ["the ten-bar benchmark (2D)", () => readJson("tests/fixtures/models/design/ten-bar.truss.json")],
    ["the Halvard Point relay mast (3D demo)", () => readJson("demo/models/halvard-point-relay-mast.truss.json")],
    ["a generated 3-leg K-braced tower (3D)", tower],
  ];
  for (const [label, load] of models) {
    it(`${label} through CSV files`, async () => {
      const model = load();
      const r = await importSpreadsheet(csvFiles(model));
      if (!r.ok) throw new Error(JSON.stringify(r.problems.slice(0, 3)));
      expect(r.model).toEqual(model);
    });
    it(`${label} through an .xlsx workbook`, async () => {
      const model = load();
      const bytes = await writeWorkbook(model);
      const r = await importSpreadsheet({ workbook: { name: "model.xlsx", bytes } });
      if (!r.ok) throw new Error(JSON.stringify(r.problems.slice(0, 3)));
      expect(r.model).toEqual(model);
    });
  }
});

// the ten-bar as CSV text, to break one thing at a time
const base = modelToCsvFiles(readJson("tests/fixtures/models/design/ten-bar.truss.json"));
const lines = (t: string) => t.trimEnd().split("\r\n");
const replaceLine = (t: string, row: number, line: string) => lines(t).map((l, i) => (i === row - 1 ? line : l)).join("\r\n") + "\r\n";
const editCell = (t: string, row: number, col: number, value: string) => {
  const ls = lines(t);
  const cells = ls[row - 1]!.split(",");
  cells[col] = value;
  ls[row - 1] = cells.join(",");
  return ls.join("\r\n") + "\r\n";
};
type Broken = { label: string; files: Partial<Record<"nodes" | "members" | "loads" | "settings", string>>; path: RegExp };

const broken: Broken[] = [
  { label: "a node x that is text", files: { nodes: editCell(base.nodes, 3, 1, "12m") }, path: /^nodes\.csv row 3 x$/ },
  { label: "an empty node y", files: { nodes: editCell(base.nodes, 4, 2, "") }, path: /^nodes\.csv row 4 y$/ },
  { label: "a decimal comma", files: { nodes: editCell(base.nodes, 2, 1, '"720,5"') }, path: /^nodes\.csv row 2 x$/ },
  { label: "fixed axes that are not axes", files: { nodes: editCell(base.nodes, 6, 4, "xw") }, path: /^nodes\.csv row 6 fixed$/ },
  { label: "an axis fixed twice", files: { nodes: editCell(base.nodes, 6, 4, "xx") }, path: /^nodes\.csv row 6 fixed$/ },
  { label: "a duplicate node id", files: { nodes: editCell(base.nodes, 3, 0, "1") }, path: /^nodes\.csv row 3 id$/ },
  { label: "an empty node id", files: { nodes: editCell(base.nodes, 5, 0, "") }, path: /^nodes\.csv row 5 id$/ },
  { label: "an unknown column in nodes", files: { nodes: replaceLine(base.nodes, 1, "id,x,y,z,fixd") }, path: /^nodes\.csv row 1 fixd$/ },
  { label: "a missing required column", files: { nodes: replaceLine(base.nodes, 1, "id,x,q,z,fixed") }, path: /^nodes\.csv row 1/ },
  { label: "a member ending at an unknown node", files: { members: editCell(base.members, 7, 2, "99") }, path: /^members\.csv row 7 end$/ },
  { label: "a member starting at an unknown node", files: { members: editCell(base.members, 2, 1, "Q") }, path: /^members\.csv row 2 start$/ },
  { label: "a member from a node to itself", files: { members: editCell(base.members, 4, 2, lines(base.members)[3]!.split(",")[1]!) }, path: /^members\.csv row 4 / },
  { label: "a negative area", files: { members: editCell(base.members, 5, 4, "-3") }, path: /^members\.csv row 5 area$/ },
  { label: "an area that is text", files: { members: editCell(base.members, 5, 4, "big") }, path: /^members\.csv row 5 area$/ },
  { label: "an unknown material", files: { members: editCell(base.members, 3, 3, "oak") }, path: /^members\.csv row 3 material$/ },
  { label: "a duplicate member id", files: { members: editCell(base.members, 11, 0, "m1") }, path: /^members\.csv row 11 id$/ },
  { label: "a header cell left empty", files: { members: replaceLine(base.members, 1, "id,start,end,material,area,,section,bucklingFactor") }, path: /^members\.csv row 1 column F$/ },
  { label: "a value beyond the last column", files: { members: replaceLine(base.members, 3, lines(base.members)[2]! + ",stray") }, path: /^members\.csv row 3 column I$/ },
  { label: "a load on an unknown node", files: { loads: editCell(base.loads, 2, 1, "77") }, path: /^loads\.csv row 2 node$/ },
  { label: "a load that is text", files: { loads: editCell(base.loads, 3, 3, "-100 kip") }, path: /^loads\.csv row 3 fy$/ },
  { label: "a load row without a case", files: { loads: editCell(base.loads, 2, 0, "") }, path: /^loads\.csv row 2 case$/ },
  { label: "an empty nodes file", files: { nodes: "" }, path: /^nodes\.csv row 1$/ },
  { label: "a blank line keeps the row numbers (the bad row is row 5)", files: { nodes: editCell(replaceLine(base.nodes, 3, lines(base.nodes)[2]! + "\r\n"), 5, 1, "abc") }, path: /^nodes\.csv row 5 x$/ },
  { label: "settings that are not JSON", files: { settings: "{ name: ten }" }, path: /^settings\.json$/ },
  { label: "settings with an unknown key", files: { settings: JSON.stringify({ ...JSON.parse(base.settings), nodez: [] }) }, path: /^settings\.json nodez$/ },
  { label: "settings with a bad unit", files: { settings: JSON.stringify({ ...JSON.parse(base.settings), units: { length: "furlong", force: "kip", mass: "lb" } }) }, path: /^settings\.json units\.length$/ },
];

describe("broken spreadsheets: every problem named by file, row and column; nothing built", () => {
  it(`has at least 20 cases (${broken.length})`, () => expect(broken.length).toBeGreaterThanOrEqual(20));
  it.each(broken.map((b) => [b.label, b] as const))("%s", async (_label, b) => {
    const f = { ...base, ...b.files };
    const r = await importSpreadsheet({
      nodes: { name: "nodes.csv", bytes: enc(f.nodes) },
      members: { name: "members.csv", bytes: enc(f.members) },
      loads: { name: "loads.csv", bytes: enc(f.loads) },
      settings: { name: "settings.json", text: f.settings },
    });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map((p) => p.path).some((p) => b.path.test(p)), JSON.stringify(r.problems)).toBe(true);
    for (const p of r.problems) expect(p.message.length).toBeGreaterThan(5);
  });

  it("a workbook missing a sheet names the sheet; a bad cell names sheet, row and column", async () => {
    const model = readJson("tests/fixtures/models/design/ten-bar.truss.json");
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load((await writeWorkbook(model)).buffer as ArrayBuffer);
    wb.getWorksheet("members")!.getCell("E4").value = "thick";
    wb.removeWorksheet(wb.getWorksheet("loads")!.id);
    const bytes = new Uint8Array(await wb.xlsx.writeBuffer());
    const r = await importSpreadsheet({ workbook: { name: "hall.xlsx", bytes } });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems[0]!.message).toMatch(/no sheet named "loads"/);
    wb.addWorksheet("loads").addRow(["case", "node", "fx", "fy", "fz"]);
    const r2 = await importSpreadsheet({ workbook: { name: "hall.xlsx", bytes: new Uint8Array(await wb.xlsx.writeBuffer()) } });
    expect(!r2.ok && r2.problems.map((p) => p.path)).toContain("sheet members of hall.xlsx row 4 area");
  });

  it("a file that is not a workbook is refused by name", async () => {
    const r = await importSpreadsheet({ workbook: { name: "notes.xlsx", bytes: enc("id,x,y\n1,2,3\n") } });
    expect(!r.ok && r.problems[0]!.path).toBe("notes.xlsx");
  });
});
