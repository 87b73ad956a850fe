// CSV text for table downloads (RFC 4180: comma separated, CRLF line ends, fields with a
// comma, quote or line break quoted, quotes doubled). Numbers are written in full precision
// (csvNumber: 15 significant figures) so a spreadsheet sees what the result holds, not the screen text.

import { csvNumber } from "~/lib/format";
import { formulaSafe, stripBidi } from "~/lib/text-hygiene";

export type CsvValue = string | number | boolean | null | undefined;

export function csvField(v: CsvValue): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return csvNumber(v);
  // names people typed: no bidi controls, and nothing a spreadsheet would run as a formula
  const safe = formulaSafe(stripBidi(String(v)));
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function toCsv(header: string[], rows: CsvValue[][]): string {
  return [header, ...rows].map((r) => r.map(csvField).join(",")).join("\r\n") + "\r\n";
}

/** Offer text as a file download from the browser. */
export function downloadText(fileName: string, text: string, type = "text/csv;charset=utf-8") {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement("a");
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/** A file-name-safe slug of a model or job name. */
export function fileSlug(name: string): string {
  return (
    name
      .normalize("NFKD")
      .replace(/[^\w\s-]/g, "")
      .trim()
      .replace(/[\s_]+/g, "-")
      .toLowerCase()
      .slice(0, 60) || "strutwise"
  );
}
