// A model to the three tables and the settings object: the export the editor and templates
// offer, and the inverse of buildModelFromTables (numbers written as JavaScript prints them,
// which reads back to the same double).
import Papa from "papaparse";
import { formulaSafe, stripBidi } from "~/lib/text-hygiene";
import { HEADERS, type TableName } from "./tables";

type Obj = Record<string, unknown>;

export interface ModelTables {
  rows: Record<TableName, (string | number)[][]>;
  settings: Obj;
}

const cell = (v: unknown): string | number => (v === undefined || v === null ? "" : typeof v === "number" ? v : String(v));

export function modelToTables(model: Obj): ModelTables {
  const nodes = ((model.nodes as Obj[]) ?? []).map((n) => [cell(n.id), cell(n.x), cell(n.y), cell(n.z), Array.isArray(n.fixed) ? (n.fixed as string[]).join("") : ""]);
  const members = ((model.members as Obj[]) ?? []).map((m) => HEADERS.members.map((h) => cell(m[h])));
  const loads: (string | number)[][] = [];
  const loadCases = ((model.loadCases as Obj[]) ?? []).map((lc) => {
    for (const l of (lc.loads as Obj[]) ?? []) loads.push([cell(lc.id), cell(l.node), cell(l.fx), cell(l.fy), cell(l.fz)]);
    const { loads: _loads, ...rest } = lc;
    return rest;
  });
  const settings: Obj = {};
  for (const key of ["name", "description", "units", "dimension", "materials"]) if (model[key] !== undefined) settings[key] = model[key];
  settings.loadCases = loadCases;
  for (const key of ["sections", "combinations", "design"]) if (model[key] !== undefined) settings[key] = model[key];
  return { rows: { nodes, members, loads }, settings };
}

/** One table as CSV text with its header row (CRLF, as spreadsheet programs write). */
export function tableCsv(name: TableName, rows: (string | number)[][]): string {
  // optional columns nobody used are left out of the file, except in templates
  // typed text (ids, groups) is guarded against spreadsheet formulas like every CSV cell we write
  return Papa.unparse({ fields: HEADERS[name], data: rows.map((r) => r.map((c) => (typeof c === "number" ? String(c) : formulaSafe(stripBidi(c))))) }, { newline: "\r\n" }) + "\r\n";
}

export function modelToCsvFiles(model: Obj): { nodes: string; members: string; loads: string; settings: string } {
  const t = modelToTables(model);
  return {
    nodes: tableCsv("nodes", t.rows.nodes),
    members: tableCsv("members", t.rows.members),
    loads: tableCsv("loads", t.rows.loads),
    settings: `${JSON.stringify(t.settings, null, 2)}\n`,
  };
}
