// Page geometry and the text primitives every section uses. Sections write top to bottom;
// `ensure` starts a new page when a block would not fit, so blocks are never split mid-way.
import PDFDocument from "pdfkit";
import { runs, type Face } from "./fonts";
import { INK, INK_MUTED, RULE } from "./palette";

export const PAGE_SIZE: [number, number] = [595.28, 841.89]; // A4 in points
export const MARGIN = { top: 78, bottom: 62, left: 50, right: 50 };

export class ReportWriter {
  readonly doc: PDFKit.PDFDocument;

  constructor(doc: PDFKit.PDFDocument) {
    this.doc = doc;
  }

  get left() {
    return MARGIN.left;
  }
  get right() {
    return PAGE_SIZE[0] - MARGIN.right;
  }
  get width() {
    return this.right - this.left;
  }
  get bottom() {
    return PAGE_SIZE[1] - MARGIN.bottom;
  }
  get y() {
    return this.doc.y;
  }
  set y(v: number) {
    this.doc.y = v;
  }

  newPage() {
    this.doc.addPage();
    this.doc.x = this.left;
    this.doc.y = MARGIN.top;
  }

  /** Start a new page unless `height` points still fit below the cursor. */
  ensure(height: number) {
    if (this.doc.y + height > this.bottom) this.newPage();
  }

  /** Width of a text in a face and size, over its font runs. */
  measure(face: Face, size: number, text: string): number {
    let w = 0;
    for (const r of runs(face, text)) w += this.doc.font(r.font).fontSize(size).widthOfString(r.text);
    return w;
  }

  /** One line at a fixed place, never wrapped and never starting a page (headers, cells). */
  line(face: Face, size: number, text: string, x: number, y: number, opts: { color?: string; align?: "left" | "right" | "center"; width?: number } = {}) {
    let t = text;
    if (opts.width !== undefined) t = this.fit(face, size, t, opts.width);
    let cx = x;
    if (opts.align && opts.align !== "left" && opts.width !== undefined) {
      const w = this.measure(face, size, t);
      cx = opts.align === "right" ? x + opts.width - w : x + (opts.width - w) / 2;
    }
    this.doc.fillColor(opts.color ?? INK);
    for (const r of runs(face, t)) {
      this.doc.font(r.font).fontSize(size);
      this.doc.text(r.text, cx, y, { lineBreak: false });
      cx += this.doc.widthOfString(r.text);
    }
  }

  /** Shorten a text with an ellipsis until it fits a width. */
  fit(face: Face, size: number, text: string, width: number): string {
    if (this.measure(face, size, text) <= width) return text;
    let lo = 0;
    let hi = text.length;
    while (lo < hi) {
      const mid = Math.ceil((lo + hi) / 2);
      if (this.measure(face, size, text.slice(0, mid) + "…") <= width) lo = mid;
      else hi = mid - 1;
    }
    return text.slice(0, lo) + "…";
  }

  /** A wrapped paragraph at the cursor; moves the cursor below it. */
  paragraph(text: string, opts: { face?: Face; size?: number; color?: string; x?: number; width?: number; gap?: number; lineGap?: number } = {}) {
    const face = opts.face ?? "sans";
    const size = opts.size ?? 9.5;
    const x = opts.x ?? this.left;
    const width = opts.width ?? this.right - x;
    const parts = runs(face, text);
    this.doc.fillColor(opts.color ?? INK);
    parts.forEach((r, i) => {
      this.doc.font(r.font).fontSize(size);
      const o = { width, lineGap: opts.lineGap ?? 2, continued: i < parts.length - 1 };
      if (i === 0) this.doc.text(r.text, x, this.doc.y, o);
      else this.doc.text(r.text, o);
    });
    this.doc.x = this.left;
    this.doc.y += opts.gap ?? 5;
  }

  /** Height a paragraph would take, for keeping blocks together. */
  paragraphHeight(text: string, opts: { face?: Face; size?: number; width?: number; lineGap?: number } = {}): number {
    const r = runs(opts.face ?? "sans", text)[0]!;
    this.doc.font(r.font).fontSize(opts.size ?? 9.5);
    return this.doc.heightOfString(text, { width: opts.width ?? this.width, lineGap: opts.lineGap ?? 2 });
  }

  heading(text: string, level: 1 | 2 = 1) {
    const size = level === 1 ? 15 : 11.5;
    this.ensure(level === 1 ? 90 : 60); // keep a heading with some of what follows
    if (level === 1) this.doc.y += 6;
    this.line(level === 1 ? "sans-bold" : "sans-semibold", size, text, this.left, this.doc.y);
    this.doc.y += size + 4;
    if (level === 1) {
      this.doc.moveTo(this.left, this.doc.y).lineTo(this.right, this.doc.y).lineWidth(0.6).strokeColor(RULE).stroke();
      this.doc.y += 8;
    }
  }

  /** Label / value pairs in two columns of a grid. */
  facts(rows: [string, string][], opts: { labelWidth?: number; size?: number; monoValues?: boolean } = {}) {
    const size = opts.size ?? 9;
    const lw = opts.labelWidth ?? 150;
    const lh = size + 5;
    for (const [k, v] of rows) {
      const valueWidth = this.width - lw;
      const h = Math.max(lh, this.paragraphHeight(v, { size, width: valueWidth }) + 3);
      this.ensure(h);
      const y = this.doc.y;
      this.line("sans", size, k, this.left, y, { color: INK_MUTED, width: lw - 8 });
      this.doc.y = y;
      this.paragraph(v, { face: opts.monoValues ? "mono" : "sans", size, x: this.left + lw, width: valueWidth, gap: 0, lineGap: 1 });
      this.doc.y = Math.max(this.doc.y, y + lh);
    }
    this.doc.y += 4;
  }

  space(h: number) {
    this.doc.y += h;
  }
}

export function createDocument(info: { title: string; author: string; subject: string }): PDFKit.PDFDocument {
  return new PDFDocument({
    size: PAGE_SIZE,
    margins: MARGIN,
    bufferPages: true, // the page marks (review state, page n of m) are drawn once all pages exist
    autoFirstPage: true,
    compress: true,
    info: { Title: info.title, Author: info.author, Subject: info.subject, Creator: "Strutwise", Producer: "Strutwise report" },
    pdfVersion: "1.7",
  });
}
