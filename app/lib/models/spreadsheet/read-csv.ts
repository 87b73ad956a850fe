// A CSV file's text to a RawTable (papaparse: quoted fields, commas or semicolons, CRLF).
import Papa from "papaparse";
import type { ImportProblem, RawTable } from "./tables";

export function readCsv(source: string, text: string, problems: ImportProblem[]): RawTable | null {
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // spreadsheet programs add a BOM
  if (!text.trim()) {
    problems.push({ path: `${source} row 1`, message: "the file is empty; it needs a header row" });
    return null;
  }
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: "greedy", delimitersToGuess: [",", ";", "\t"] });
  for (const e of parsed.errors) {
    // papaparse counts data rows from 0 with the header as row 0: a spreadsheet row is +1
    const row = typeof e.row === "number" ? e.row + 1 : undefined;
    problems.push({ path: `${source}${row ? ` row ${row}` : ""}`, message: `the CSV cannot be read: ${e.message}` });
  }
  const [header, ...rest] = parsed.data;
  if (!header) return null;
  // skipEmptyLines drops blank lines, so count physical lines to keep spreadsheet row numbers
  const rows: RawTable["rows"] = [];
  const lineRows = physicalRows(text);
  rest.forEach((cells, i) => rows.push({ row: lineRows[i + 1] ?? i + 2, cells: cells.map((c) => c.trim()) }));
  return { source, header: header.map((h) => h.trim()), rows };
}

/** The spreadsheet row number of each non-blank record (quoted line breaks stay in one record). */
function physicalRows(text: string): number[] {
  const out: number[] = [];
  let line = 1;
  let inQuote = false;
  let blank = true;
  let start = 1;
  for (let i = 0; i <= text.length; i++) {
    const c = text[i];
    if (c === undefined || (!inQuote && (c === "\n" || (c === "\r" && text[i + 1] !== "\n")))) {
      if (!blank) out.push(start);
      line++;
      start = line;
      blank = true;
      continue;
    }
    if (c === "\r") continue;
    if (c === '"') inQuote = !inQuote;
    else if (inQuote && c === "\n") line++;
    if (!/\s|,|;/.test(c)) blank = false;
  }
  return out;
}
