// Spreadsheet import and export of models: CSV files or one .xlsx workbook in, a model that
// passed the engine's gate out (or every problem with file, row and column). Pure apart from
// parsing bytes: no database, no bucket.
import { buildModelFromTables, type ImportResult } from "./build-model";
import { readCsv } from "./read-csv";
import type { ImportProblem } from "./tables";
import { readWorkbook } from "./workbook";

export { modelToCsvFiles, modelToTables } from "./write-tables";
export { writeWorkbook } from "./workbook";
export { HEADERS, COLUMNS, TABLES, type ImportProblem, type TableName } from "./tables";
export type { ImportResult } from "./build-model";

export interface SpreadsheetFiles {
  nodes?: { name: string; bytes: Uint8Array };
  members?: { name: string; bytes: Uint8Array };
  loads?: { name: string; bytes: Uint8Array };
  workbook?: { name: string; bytes: Uint8Array };
  /** the settings JSON as a file or text; optional with a workbook that has a settings sheet */
  settings?: { name: string; text: string };
}

function decode(name: string, bytes: Uint8Array, problems: ImportProblem[]): string | null {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    problems.push({ path: name, message: "not UTF-8 text; save the CSV as UTF-8" });
    return null;
  }
}

export async function importSpreadsheet(files: SpreadsheetFiles): Promise<ImportResult> {
  const problems: ImportProblem[] = [];
  let tables: Parameters<typeof buildModelFromTables>[0] | null = null;
  let settingsText = files.settings?.text ?? null;
  let settingsSource = files.settings?.name ?? "settings";
  if (files.workbook) {
    const wb = await readWorkbook(files.workbook.name, files.workbook.bytes, problems);
    if (!wb) return { ok: false, problems };
    if (settingsText === null && wb.settingsText !== null) {
      settingsText = wb.settingsText;
      settingsSource = `sheet settings of ${files.workbook.name} cell A1`;
    }
    tables = { ...wb.tables, settings: undefined, settingsSource };
  } else {
    const read = (key: "nodes" | "members" | "loads") => {
      const f = files[key];
      if (!f) return null;
      const text = decode(f.name, f.bytes, problems);
      return text === null ? null : readCsv(f.name, text, problems);
    };
    tables = { nodes: read("nodes"), members: read("members"), loads: read("loads"), settings: undefined, settingsSource };
  }
  if (settingsText === null || !settingsText.trim()) {
    problems.push({ path: settingsSource, message: "the settings are missing: a JSON object with name, units, dimension, materials (and design)" });
    return { ok: false, problems };
  }
  try {
    tables.settings = JSON.parse(settingsText);
  } catch (e) {
    problems.push({ path: settingsSource, message: `the settings are not valid JSON: ${(e as Error).message}` });
  }
  if (problems.length) return { ok: false, problems };
  return buildModelFromTables(tables);
}
