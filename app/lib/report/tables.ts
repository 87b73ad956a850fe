// Tables that paginate cleanly: fixed row height, the header row repeated on each page with
// the table's title marked "continued", numbers right-aligned in the mono face.
import type { Face } from "./fonts";
import type { ReportWriter } from "./layout";
import { INK, INK_MUTED, PAPER_SUNK, RULE } from "./palette";

export interface Column {
  header: string;
  /** relative width; the table spreads the columns over the text width */
  weight: number;
  align?: "left" | "right";
  face?: Face;
}

export interface TableOptions {
  title?: string;
  size?: number;
  /** colour of a small square drawn before the first cell of a row */
  marker?: (row: number) => string | undefined;
  /** text colour of one cell */
  cellColor?: (row: number, col: number) => string | undefined;
  /** an empty table says this instead of showing only a header */
  empty?: string;
}

export function table(w: ReportWriter, columns: Column[], rows: string[][], opts: TableOptions = {}) {
  const size = opts.size ?? 7.6;
  const rowH = size + 4.2;
  const headH = size + 7;
  const total = columns.reduce((s, c) => s + c.weight, 0);
  const markerW = opts.marker ? 9 : 0;
  const widths = columns.map((c) => ((w.width - markerW) * c.weight) / total);
  const xs: number[] = [];
  widths.reduce((x, cw) => (xs.push(x), x + cw), w.left + markerW);
  const pad = 3;
  const doc = w.doc;

  const title = (continued: boolean) => {
    if (!opts.title) return;
    w.line("sans-semibold", 9.5, continued ? `${opts.title} (continued)` : opts.title, w.left, w.y);
    w.y += 14;
  };
  const header = () => {
    const y = w.y;
    doc.rect(w.left, y, w.width, headH).fill(PAPER_SUNK);
    columns.forEach((c, i) =>
      w.line("sans-semibold", size - 0.4, c.header, xs[i]! + pad, y + 3.2, { color: INK_MUTED, width: widths[i]! - 2 * pad, align: c.align }),
    );
    w.y = y + headH + 1.5;
  };

  w.ensure((opts.title ? 14 : 0) + headH + rowH * Math.min(3, Math.max(1, rows.length)) + 4);
  title(false);
  header();
  if (rows.length === 0) {
    w.line("sans-italic", size, opts.empty ?? "none", w.left + pad, w.y + 1, { color: INK_MUTED });
    w.y += rowH + 6;
    return;
  }
  for (let r = 0; r < rows.length; r++) {
    if (w.y + rowH > w.bottom) {
      w.newPage();
      title(true);
      header();
    }
    const y = w.y;
    const marker = opts.marker?.(r);
    if (marker) doc.rect(w.left + 1, y + 1.8, 6, 6).fill(marker);
    const row = rows[r]!;
    for (let c = 0; c < columns.length; c++) {
      const col = columns[c]!;
      const text = row[c] ?? "";
      if (!text) continue;
      w.line(col.face ?? (col.align === "right" ? "mono" : "sans"), size, text, xs[c]! + pad, y + 1.6, {
        color: opts.cellColor?.(r, c) ?? INK,
        width: widths[c]! - 2 * pad,
        align: col.align,
      });
    }
    w.y = y + rowH;
    doc.moveTo(w.left, w.y - 0.6).lineTo(w.right, w.y - 0.6).lineWidth(0.3).strokeColor(RULE).stroke();
  }
  w.y += 8;
  doc.fillColor(INK);
}

/** Split a list into chunks, for load-case columns that would not fit one table. */
export function chunks<T>(items: T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out.length ? out : [[]];
}
