// Reading a section catalogue from CSV. Pure (no I/O), so the page can offer the template and
// the tests can call it directly. Units travel in the header ("area_mm2", "I_cm4", "D_mm",
// "mass_kg_per_m"): a catalogue then says what its numbers mean without a separate setting,
// and the same names come back in every CSV the desk writes. Every problem is reported with
// its row (numbered as a spreadsheet shows them: the header is row 1) and column; a file with
// any problem yields no sections at all.
import Papa from "papaparse";
import type { ErrorDetail } from "~/lib/http.server";
import type { CatalogueSection } from "./types";

export const MAX_CATALOGUE_ROWS = 5000;
const MAX_REPORTED = 100;
const MAX_ID = 100;
const MAX_FAMILY = 60;

// factors to the stored units (mm, kg/m); exact by definition (NIST SP 811, appendix B)
const LENGTH_IN_MM: Record<string, number> = { mm: 1, cm: 10, m: 1000, in: 25.4, ft: 304.8 };
const MASS_IN_KG: Record<string, number> = { kg: 1, t: 1000, lb: 0.45359237 };
const LENGTH_UNITS = Object.keys(LENGTH_IN_MM).join("|");
const MASS_UNITS = Object.keys(MASS_IN_KG).join("|");

export const CATALOGUE_TEMPLATE_HEADER = ["id", "family", "area_mm2", "I_mm4", "D_mm", "t_mm", "mass_kg_per_m"];

/**
 * A template an engineer fills in: the header and two rows that show the units. The rows are
 * round tubes worked out from their diameter D and wall t: A = π/4 (D² − d²),
 * I = π/64 (D⁴ − d⁴) with d = D − 2t, mass = 7850 kg/m³ · A (steel density, common practice).
 */
export function catalogueTemplateCsv(): string {
  return [
    CATALOGUE_TEMPLATE_HEADER.join(","),
    "TUBE 60x3,tube,537.2,218780,60,3,4.217",
    "TUBE 76x4,tube,904.8,588110,76,4,7.103",
  ].join("\r\n") + "\r\n";
}

type ColumnRole =
  | { kind: "id" }
  | { kind: "family" }
  | { kind: "area"; factor: number }
  | { kind: "I"; factor: number }
  | { kind: "dimension"; name: string; factor: number }
  | { kind: "mass"; factor: number };

/** "area (mm²)" → "area_mm2", "mass [kg/m]" → "mass_kg_per_m"; case is kept for dimension names. */
export function normalizeHeader(raw: string): string {
  return raw
    .trim()
    .replace(/²/g, "2")
    .replace(/³/g, "3")
    .replace(/⁴/g, "4")
    .replace(/\s*\/\s*/g, "_per_")
    .replace(/[\s([\]{}]+/g, "_")
    .replace(/[)\]}]/g, "")
    .replace(/_+/g, "_")
    .replace(/^_|_$/g, "");
}

const RESERVED = new Set(["id", "family", "area", "i", "mass"]);

function classify(header: string): ColumnRole | string {
  const h = normalizeHeader(header);
  const lower = h.toLowerCase();
  if (lower === "id") return { kind: "id" };
  if (lower === "family") return { kind: "family" };
  let m = new RegExp(`^area_(${LENGTH_UNITS})2$`, "i").exec(h);
  if (m) return { kind: "area", factor: LENGTH_IN_MM[m[1]!.toLowerCase()]! ** 2 };
  m = new RegExp(`^I_(${LENGTH_UNITS})4$`, "i").exec(h);
  if (m) return { kind: "I", factor: LENGTH_IN_MM[m[1]!.toLowerCase()]! ** 4 };
  m = new RegExp(`^mass_(${MASS_UNITS})_per_(${LENGTH_UNITS})$`, "i").exec(h);
  if (m) return { kind: "mass", factor: MASS_IN_KG[m[1]!.toLowerCase()]! / (LENGTH_IN_MM[m[2]!.toLowerCase()]! / 1000) };
  m = new RegExp(`^([A-Za-z][A-Za-z0-9]*)_(${LENGTH_UNITS})$`, "i").exec(h);
  if (m && !RESERVED.has(m[1]!.toLowerCase())) return { kind: "dimension", name: m[1]!, factor: LENGTH_IN_MM[m[2]!.toLowerCase()]! };
  // say what was probably meant
  if (lower === "area") return "the area needs its unit in the header: area_mm2 (or area_cm2, area_m2, area_in2, area_ft2)";
  if (lower === "i") return "the second moment of area needs its unit in the header: I_mm4 (or I_cm4, I_m4, I_in4, I_ft4)";
  if (lower.startsWith("mass")) return "mass per length needs its units in the header: mass_kg_per_m (or mass_lb_per_ft, mass_t_per_m)";
  return "unknown column: the columns are id, family, area_<unit>2, I_<unit>4, optional dimensions such as D_mm or t_mm, and mass_kg_per_m";
}

/** Spreadsheet column letter of a 0-based index: 0 → A, 26 → AA. */
export function columnLetter(index: number): string {
  let s = "";
  for (let n = index + 1; n > 0; n = Math.floor((n - 1) / 26)) s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
  return s;
}

export type ParsedCatalogue =
  | { ok: true; sections: CatalogueSection[]; dimensionNames: string[]; families: string[] }
  | { ok: false; error: string; details: ErrorDetail[] };

/** Parse CSV text; `fileName` only names the file in messages. */
export function parseCatalogueCsv(text: string, fileName = "catalogue.csv"): ParsedCatalogue {
  const details: ErrorDetail[] = [];
  const at = (row: number, column: string) => `${fileName} row ${row}${column ? ` ${column}` : ""}`;
  const fail = (error: string) => {
    const shown = details.slice(0, MAX_REPORTED);
    if (details.length > MAX_REPORTED) shown.push({ path: fileName, message: `and ${details.length - MAX_REPORTED} more problems` });
    return { ok: false as const, error, details: shown };
  };

  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (!body.trim()) {
    details.push({ path: fileName, message: "the file is empty: the first row names the columns (id, family, area_mm2, I_mm4, ...), one section a row below it" });
    return fail(`${fileName} is empty`);
  }
  const parsed = Papa.parse<string[]>(body, { delimitersToGuess: [",", ";", "\t"], skipEmptyLines: false });
  const rows = parsed.data;
  for (const e of parsed.errors) {
    if (e.code === "MissingQuotes") details.push({ path: at((e.row ?? 0) + 1, ""), message: "a quoted field is not closed" });
  }

  // the header
  const header = rows[0] ?? [];
  const roles: (ColumnRole | null)[] = [];
  const seen = new Map<string, number>();
  header.forEach((raw, c) => {
    const name = raw.trim();
    const where = `${at(1, name || `(column ${columnLetter(c)})`)}`;
    if (!name) {
      roles.push(null);
      details.push({ path: where, message: `column ${columnLetter(c)} has no name` });
      return;
    }
    const role = classify(name);
    if (typeof role === "string") {
      roles.push(null);
      details.push({ path: where, message: `column ${columnLetter(c)}: ${role}` });
      return;
    }
    const key = role.kind === "dimension" ? `dimension:${role.name.toLowerCase()}` : role.kind;
    const first = seen.get(key);
    if (first !== undefined) {
      roles.push(null);
      details.push({ path: where, message: `column ${columnLetter(c)} repeats column ${columnLetter(first)} (${header[first]!.trim()})` });
      return;
    }
    seen.set(key, c);
    roles.push(role);
  });
  const required: [ColumnRole["kind"], string][] = [
    ["id", "id"],
    ["family", "family"],
    ["area", "area_mm2 (cross-section area, unit in the name)"],
    ["I", "I_mm4 (least second moment of area, unit in the name)"],
  ];
  for (const [kind, example] of required) {
    if (!roles.some((r) => r?.kind === kind)) details.push({ path: at(1, ""), message: `the header has no ${example} column` });
  }
  if (details.length) return fail(`The header of ${fileName} has ${details.length === 1 ? "a problem" : `${details.length} problems`}`);

  // the rows
  const dataRows = rows.slice(1);
  const nonEmpty = dataRows.filter((r) => r.some((f) => f.trim() !== "")).length;
  if (nonEmpty === 0) {
    details.push({ path: at(2, ""), message: "no sections below the header" });
    return fail(`${fileName} names its columns but lists no sections`);
  }
  if (nonEmpty > MAX_CATALOGUE_ROWS) {
    details.push({ path: fileName, message: `${nonEmpty} sections; a catalogue holds at most ${MAX_CATALOGUE_ROWS}` });
    return fail(`${fileName} is too long`);
  }

  const sections: CatalogueSection[] = [];
  const ids = new Map<string, number>();
  const dimensionNames = roles.flatMap((r) => (r?.kind === "dimension" ? [r.name] : []));
  dataRows.forEach((fields, i) => {
    const row = i + 2;
    if (fields.every((f) => f.trim() === "")) return; // a blank line, as spreadsheets leave at the end
    if (fields.length > header.length && fields.slice(header.length).some((f) => f.trim() !== "")) {
      details.push({ path: at(row, ""), message: `${fields.length} values, but the header names ${header.length} columns` });
    }
    const section: Partial<CatalogueSection> & { dimensions: Record<string, number> } = { dimensions: {} };
    roles.forEach((role, c) => {
      if (!role) return;
      const name = header[c]!.trim();
      const where = at(row, name);
      const col = `column ${columnLetter(c)}`;
      const raw = (fields[c] ?? "").trim();
      const optional = role.kind === "dimension" || role.kind === "mass";
      if (raw === "") {
        if (!optional) details.push({ path: where, message: `${col}: missing${c >= fields.length ? " (the row ends early)" : ""}` });
        return;
      }
      if (role.kind === "id") {
        if (raw.length > MAX_ID) details.push({ path: where, message: `${col}: at most ${MAX_ID} characters` });
        const first = ids.get(raw);
        if (first !== undefined) details.push({ path: where, message: `${col}: the id "${raw}" is already used in row ${first}` });
        else ids.set(raw, row);
        section.id = raw;
        return;
      }
      if (role.kind === "family") {
        if (raw.length > MAX_FAMILY) details.push({ path: where, message: `${col}: at most ${MAX_FAMILY} characters` });
        section.family = raw;
        return;
      }
      const value = Number(raw);
      if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(raw) || !Number.isFinite(value)) {
        details.push({ path: where, message: `${col}: "${raw}" is not a number (a point for decimals, no thousands separators)` });
        return;
      }
      if (!(value > 0)) {
        const what = role.kind === "area" ? "the area" : role.kind === "I" ? "the second moment of area" : role.kind === "mass" ? "the mass per length" : `the dimension ${role.name}`;
        details.push({ path: where, message: `${col}: ${what} must be greater than zero (found ${raw})` });
        return;
      }
      const stored = value * role.factor;
      if (role.kind === "area") section.area = stored;
      else if (role.kind === "I") section.I = stored;
      else if (role.kind === "mass") section.massPerLength = stored;
      else section.dimensions[role.name] = stored;
    });
    if (section.id !== undefined && section.family !== undefined && section.area !== undefined && section.I !== undefined) {
      sections.push({
        id: section.id,
        family: section.family,
        area: section.area,
        I: section.I,
        ...(Object.keys(section.dimensions).length ? { dimensions: section.dimensions } : {}),
        ...(section.massPerLength !== undefined ? { massPerLength: section.massPerLength } : {}),
      });
    }
  });
  if (details.length) {
    return fail(`${fileName} has ${details.length === 1 ? "a problem" : `${details.length} problems`}; nothing was stored`);
  }
  const families = [...new Set(sections.map((s) => s.family))];
  return { ok: true, sections, dimensionNames, families };
}
