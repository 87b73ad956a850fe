// .xlsx workbooks (exceljs): sheets "nodes", "members", "loads" with the CSV columns, and a
// sheet "settings" whose cell A1 holds the settings JSON. Reading keeps spreadsheet row
// numbers; numbers typed as numbers arrive as numbers, text as text.
import ExcelJS from "exceljs";
import { modelToTables } from "./write-tables";
import { HEADERS, TABLES, type ImportProblem, type RawTable, type TableName } from "./tables";

export interface WorkbookTables {
  tables: Record<TableName, RawTable | null>;
  settingsText: string | null;
}

function cellText(v: ExcelJS.CellValue): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return String(v);
  if (typeof v === "string") return v;
  if (typeof v === "boolean") return String(v);
  if (v instanceof Date) return v.toISOString();
  if (typeof v === "object") {
    if ("result" in v) return cellText((v as { result?: ExcelJS.CellValue }).result ?? null); // a formula: its cached value
    if ("richText" in v) return (v as ExcelJS.CellRichTextValue).richText.map((r) => r.text).join("");
    if ("text" in v) return String((v as { text: unknown }).text);
    if ("error" in v) return String((v as { error: unknown }).error);
  }
  return String(v);
}

export async function readWorkbook(fileName: string, bytes: Uint8Array, problems: ImportProblem[]): Promise<WorkbookTables | null> {
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  } catch (e) {
    problems.push({ path: fileName, message: `not a readable .xlsx workbook (${(e as Error).message})` });
    return null;
  }
  const tables = {} as Record<TableName, RawTable | null>;
  for (const name of TABLES) {
    const ws = wb.getWorksheet(name);
    if (!ws) {
      tables[name] = null;
      problems.push({ path: `${fileName}`, message: `the workbook has no sheet named "${name}" (sheets: ${wb.worksheets.map((w) => w.name).join(", ") || "none"})` });
      continue;
    }
    const source = `sheet ${name} of ${fileName}`;
    let header: string[] | null = null;
    const rows: RawTable["rows"] = [];
    ws.eachRow({ includeEmpty: false }, (row, rowNumber) => {
      const values = row.values as ExcelJS.CellValue[]; // 1-based, index 0 unused
      const cells: string[] = [];
      for (let c = 1; c < values.length; c++) cells[c - 1] = cellText(values[c] ?? null).trim();
      for (let c = 0; c < cells.length; c++) cells[c] ??= "";
      if (cells.every((c) => c === "")) return;
      if (rowNumber === 1) header = cells;
      else rows.push({ row: rowNumber, cells });
    });
    if (!header) {
      problems.push({ path: `${source} row 1`, message: "the header row is missing; row 1 must name the columns" });
      tables[name] = null;
      continue;
    }
    tables[name] = { source, header, rows };
  }
  const settingsSheet = wb.getWorksheet("settings");
  const settingsText = settingsSheet ? cellText(settingsSheet.getCell("A1").value) : null;
  return { tables, settingsText };
}

/** A workbook of the model (or of an empty template when the rows are empty). */
export async function writeWorkbook(model: Record<string, unknown>): Promise<Uint8Array> {
  const t = modelToTables(model);
  const wb = new ExcelJS.Workbook();
  wb.creator = "Strutwise";
  for (const name of TABLES) {
    const ws = wb.addWorksheet(name);
    ws.addRow(HEADERS[name]);
    ws.getRow(1).font = { bold: true };
    for (const r of t.rows[name]) ws.addRow(r.map((c) => (c === "" ? null : c)));
    ws.columns.forEach((c) => (c.width = 14));
  }
  const ws = wb.addWorksheet("settings");
  ws.getCell("A1").value = JSON.stringify(t.settings, null, 2);
  ws.getCell("A1").alignment = { wrapText: true, vertical: "top" };
  ws.getColumn(1).width = 100;
  ws.getCell("A3").value = "Cell A1 holds the settings as JSON: name, units, dimension, materials, loadCases (names, selfWeight), design; the format is described in docs/model-format.md.";
  return new Uint8Array(await wb.xlsx.writeBuffer());
}
