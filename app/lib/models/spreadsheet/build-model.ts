// Three tables and a settings object to a model: every cell checked and every problem named
// by file (or sheet), row and column; then the engine's own gate, its findings mapped back to
// the row they come from. Pure: callable from a worker thread.
import { AXES, parseModel, type ParseResult } from "~/engine/truss";
import { COLUMNS, type ImportProblem, type RawTable, type TableName } from "./tables";

export interface SpreadsheetInput {
  nodes: RawTable | null;
  members: RawTable | null;
  loads: RawTable | null;
  settings: unknown;
  /** how messages name the settings: "settings.json" or "sheet settings of frame.xlsx" */
  settingsSource: string;
}

export type ImportResult = { ok: true; model: Record<string, unknown>; parsed: ParseResult & { ok: true } } | { ok: false; problems: ImportProblem[] };

const SETTINGS_KEYS = ["name", "description", "units", "dimension", "materials", "design", "sections", "combinations", "loadCases"] as const;
const MAX_PROBLEMS = 200;

export function buildModelFromTables(input: SpreadsheetInput): ImportResult {
  const problems: ImportProblem[] = [];
  const at = (t: RawTable, row: number, column: string) => `${t.source} row ${row} ${column}`;

  const settings = input.settings;
  if (typeof settings !== "object" || settings === null || Array.isArray(settings)) {
    problems.push({ path: input.settingsSource, message: "the settings must be one JSON object (name, units, dimension, materials, design...)" });
    return { ok: false, problems };
  }
  const s = settings as Record<string, unknown>;
  for (const key of Object.keys(s)) {
    if (!(SETTINGS_KEYS as readonly string[]).includes(key)) {
      const where = ["nodes", "members"].includes(key) ? ` (${key} come from ${key}.csv)` : "";
      problems.push({ path: `${input.settingsSource} ${key}`, message: `"${key}" is not a setting${where}; settings hold ${SETTINGS_KEYS.join(", ")}` });
    }
  }

  const tables: Record<TableName, RawTable | null> = { nodes: input.nodes, members: input.members, loads: input.loads };
  const columnIndex = {} as Record<TableName, Map<string, number>>;
  for (const name of ["nodes", "members", "loads"] as const) {
    const t = tables[name];
    columnIndex[name] = new Map();
    if (!t) {
      problems.push({ path: `${name}.csv`, message: `the ${name} table is missing (header: ${[...COLUMNS[name].required, ...COLUMNS[name].optional].join(",")})` });
      continue;
    }
    const known = [...COLUMNS[name].required, ...COLUMNS[name].optional];
    t.header.forEach((h, i) => {
      const column = columnLetter(i);
      if (!h) problems.push({ path: `${t.source} row 1 column ${column}`, message: "a header cell is empty; name the column or delete it" });
      else if (!known.includes(h)) problems.push({ path: `${t.source} row 1 ${h}`, message: `"${h}" is not a column of ${name} (columns: ${known.join(", ")})` });
      else if (columnIndex[name].has(h)) problems.push({ path: `${t.source} row 1 ${h}`, message: `the column "${h}" appears twice` });
      else columnIndex[name].set(h, i);
    });
    for (const req of COLUMNS[name].required) if (!columnIndex[name].has(req)) problems.push({ path: `${t.source} row 1`, message: `the required column "${req}" is missing` });
    for (const r of t.rows) {
      if (r.cells.length > t.header.length && r.cells.slice(t.header.length).some((c) => c !== "")) {
        problems.push({ path: `${t.source} row ${r.row} column ${columnLetter(t.header.length)}`, message: "a value stands beyond the last named column" });
      }
    }
  }
  if (problems.length) return { ok: false, problems };

  const cell = (name: TableName, r: RawTable["rows"][number], col: string) => {
    const i = columnIndex[name].get(col);
    return i === undefined ? "" : (r.cells[i] ?? "").trim();
  };
  const number = (name: TableName, t: RawTable, r: RawTable["rows"][number], col: string, required: boolean): number | undefined => {
    const text = cell(name, r, col);
    if (text === "") {
      if (required) problems.push({ path: at(t, r.row, col), message: `${col} is empty; it must be a number` });
      return undefined;
    }
    const v = Number(text.replace(/^\+/, ""));
    if (!Number.isFinite(v) || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text)) {
      problems.push({ path: at(t, r.row, col), message: `"${text}" is not a number (use a point for decimals, no units or thousands separators)` });
      return undefined;
    }
    return v;
  };
  const text = (name: TableName, t: RawTable, r: RawTable["rows"][number], col: string, required: boolean): string | undefined => {
    const v = cell(name, r, col);
    if (v === "" && required) problems.push({ path: at(t, r.row, col), message: `${col} is empty` });
    return v === "" ? undefined : v;
  };

  // nodes
  const nodeRows: number[] = [];
  const nodes: Record<string, unknown>[] = [];
  const nt = tables.nodes!;
  for (const r of nt.rows) {
    const id = text("nodes", nt, r, "id", true);
    const x = number("nodes", nt, r, "x", true);
    const y = number("nodes", nt, r, "y", true);
    const z = number("nodes", nt, r, "z", false);
    const fixedText = cell("nodes", r, "fixed").toLowerCase().replace(/[\s,;+]/g, "");
    let fixed: string[] | undefined;
    if (fixedText) {
      const letters = [...fixedText];
      const bad = letters.filter((c) => !(AXES as readonly string[]).includes(c));
      if (bad.length) problems.push({ path: at(nt, r.row, "fixed"), message: `"${cell("nodes", r, "fixed")}" is not a set of axes; write the restrained axes, e.g. xy, xyz or y` });
      else if (new Set(letters).size !== letters.length) problems.push({ path: at(nt, r.row, "fixed"), message: `an axis is named twice in "${fixedText}"` });
      else fixed = letters;
    }
    nodes.push({ id, x, y, ...(z !== undefined ? { z } : {}), ...(fixed ? { fixed } : {}) });
    nodeRows.push(r.row);
  }

  // members
  const memberRows: number[] = [];
  const members: Record<string, unknown>[] = [];
  const mt = tables.members!;
  for (const r of mt.rows) {
    const section = text("members", mt, r, "section", false);
    const m: Record<string, unknown> = {
      id: text("members", mt, r, "id", true),
      start: text("members", mt, r, "start", true),
      end: text("members", mt, r, "end", true),
      material: text("members", mt, r, "material", true),
    };
    const area = number("members", mt, r, "area", section === undefined);
    if (area !== undefined) m.area = area;
    const group = text("members", mt, r, "group", false);
    if (group !== undefined) m.group = group;
    if (section !== undefined) m.section = section;
    const k = number("members", mt, r, "bucklingFactor", false);
    if (k !== undefined) m.bucklingFactor = k;
    members.push(m);
    memberRows.push(r.row);
  }

  // loads, grouped into load cases: the settings' cases first (names, own weight), then any
  // other case id in the order it first appears
  const lt = tables.loads!;
  const declared = Array.isArray(s.loadCases) ? (s.loadCases as unknown[]) : [];
  if (s.loadCases !== undefined && !Array.isArray(s.loadCases)) problems.push({ path: `${input.settingsSource} loadCases`, message: "loadCases must be a list of { id, name?, selfWeight? }" });
  const cases = new Map<string, { lc: Record<string, unknown>; loads: Record<string, unknown>[]; rows: number[] }>();
  declared.forEach((d, i) => {
    if (typeof d !== "object" || d === null || typeof (d as { id?: unknown }).id !== "string") {
      problems.push({ path: `${input.settingsSource} loadCases[${i}]`, message: "each load case needs a text id" });
      return;
    }
    const lc = { ...(d as Record<string, unknown>) };
    if ("loads" in lc) problems.push({ path: `${input.settingsSource} loadCases[${i}].loads`, message: "loads come from loads.csv, not from the settings" });
    delete lc.loads;
    cases.set(lc.id as string, { lc, loads: [], rows: [] });
  });
  for (const r of lt.rows) {
    const caseId = text("loads", lt, r, "case", true);
    const node = text("loads", lt, r, "node", true);
    const load: Record<string, unknown> = { node };
    for (const c of ["fx", "fy", "fz"]) {
      const v = number("loads", lt, r, c, false);
      if (v !== undefined) load[c] = v;
    }
    if (caseId === undefined) continue;
    if (!cases.has(caseId)) cases.set(caseId, { lc: { id: caseId }, loads: [], rows: [] });
    const entry = cases.get(caseId)!;
    entry.loads.push(load);
    entry.rows.push(r.row);
  }
  if (problems.length) return { ok: false, problems: problems.slice(0, MAX_PROBLEMS) };

  const loadCases = [...cases.values()].map(({ lc, loads }) => ({ ...lc, loads }));
  const model: Record<string, unknown> = { format: "strutwise.truss", version: 1 };
  for (const key of ["name", "description", "units", "dimension", "materials"] as const) if (s[key] !== undefined) model[key] = s[key];
  model.nodes = nodes;
  model.members = members;
  model.loadCases = loadCases;
  for (const key of ["sections", "combinations", "design"] as const) if (s[key] !== undefined) model[key] = s[key];

  const parsed = parseModel(model);
  if (!parsed.ok) {
    const caseRows = [...cases.values()].map((c) => c.rows);
    return { ok: false, problems: parsed.errors.map((e) => ({ path: locate(e.path, { nodes: [nt, nodeRows], members: [mt, memberRows] }, lt, caseRows, input.settingsSource), message: e.message })) };
  }
  return { ok: true, model, parsed };
}

const FIELD_COLUMNS: Record<string, string> = { id: "id", x: "x", y: "y", z: "z", fixed: "fixed", start: "start", end: "end", material: "material", area: "area", group: "group", section: "section", bucklingFactor: "bucklingFactor", node: "node", fx: "fx", fy: "fy", fz: "fz" };

/** An engine path ("members[3].end", "loadCases[1].loads[0].node") as file, row and column. */
function locate(path: string, tables: Record<"nodes" | "members", [RawTable, number[]]>, loads: RawTable, caseRows: number[][], settingsSource: string): string {
  let m = /^(nodes|members)\[(\d+)\](?:\.([A-Za-z]+))?/.exec(path);
  if (m) {
    const [t, rows] = tables[m[1] as "nodes" | "members"];
    const row = rows[Number(m[2])];
    const col = m[3] && FIELD_COLUMNS[m[3]] ? m[3] : "id";
    if (row !== undefined) return `${t.source} row ${row} ${col}`;
  }
  m = /^loadCases\[(\d+)\]\.loads\[(\d+)\](?:\.([A-Za-z]+))?/.exec(path);
  if (m) {
    const row = caseRows[Number(m[1])]?.[Number(m[2])];
    const col = m[3] && FIELD_COLUMNS[m[3]] ? m[3] : "node";
    if (row !== undefined) return `${loads.source} row ${row} ${col}`;
  }
  return `${settingsSource} ${path || "(model)"}`;
}

/** A, B, ..., Z, AA: the column letters a spreadsheet shows. */
export function columnLetter(index: number): string {
  let s = "";
  for (let n = index + 1; n > 0; n = Math.floor((n - 1) / 26)) s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
  return s;
}
