// Fonts shipped from npm (@fontsource): IBM Plex Sans for text, Roboto Mono for figures.
// Fontsource splits each face per Unicode subset and pdfkit embeds one file per font name,
// so every subset is registered under its own name and text is cut into runs, each run set
// in the first subset whose declared unicode-range holds its characters (stack.md pitfall 10).
import fs from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import zlib from "node:zlib";
import { stripBidi } from "~/lib/text-hygiene";

export type Face = "sans" | "sans-semibold" | "sans-bold" | "sans-italic" | "mono";

interface FaceFiles {
  pkg: "@fontsource/ibm-plex-sans" | "@fontsource/roboto-mono";
  weight: number;
  style: "normal" | "italic";
  /** subsets tried in order; the mono face falls back to the sans subsets for letters it lacks */
  subsets: string[];
  fallback?: Face;
}

const FACES: Record<Face, FaceFiles> = {
  sans: { pkg: "@fontsource/ibm-plex-sans", weight: 400, style: "normal", subsets: ["latin", "latin-ext", "greek", "cyrillic", "cyrillic-ext"] },
  "sans-semibold": { pkg: "@fontsource/ibm-plex-sans", weight: 600, style: "normal", subsets: ["latin", "latin-ext", "greek", "cyrillic", "cyrillic-ext"] },
  "sans-bold": { pkg: "@fontsource/ibm-plex-sans", weight: 700, style: "normal", subsets: ["latin", "latin-ext", "greek", "cyrillic", "cyrillic-ext"] },
  "sans-italic": { pkg: "@fontsource/ibm-plex-sans", weight: 400, style: "italic", subsets: ["latin", "latin-ext", "greek", "cyrillic", "cyrillic-ext"] },
  mono: { pkg: "@fontsource/roboto-mono", weight: 400, style: "normal", subsets: ["latin", "latin-ext", "greek", "cyrillic", "cyrillic-ext"], fallback: "sans" },
};

// Characters no shipped subset holds, written in words or ASCII instead of a missing glyph.
const SUBSTITUTES: Record<string, string> = {
  "→": "->",
  "←": "<-",
  "≤": "<=",
  "≥": ">=",
  "≈": "~",
  "✓": "ok",
  "✗": "x",
  "∞": "inf",
  "√": "sqrt",
};

/**
 * WOFF 1.0 → plain sfnt (TrueType/OpenType), once per process: pdfkit would otherwise inflate
 * every WOFF table again for each document, in JavaScript. Layout of both formats per the W3C
 * WOFF 1.0 recommendation: a 44-byte header, 20-byte table entries, zlib-compressed tables.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.readUInt32BE(0) !== 0x774f4646) throw new Error("not a WOFF 1.0 font file");
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const entries = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20;
    return {
      tag: woff.readUInt32BE(at),
      offset: woff.readUInt32BE(at + 4),
      compLength: woff.readUInt32BE(at + 8),
      origLength: woff.readUInt32BE(at + 12),
      checksum: woff.readUInt32BE(at + 16),
    };
  });
  const tables = entries.map((e) => {
    const raw = woff.subarray(e.offset, e.offset + e.compLength);
    const data = e.compLength < e.origLength ? zlib.inflateSync(raw) : raw;
    if (data.length !== e.origLength) throw new Error("WOFF table has the wrong length after inflating");
    return { ...e, data };
  });
  const pow2 = 2 ** Math.floor(Math.log2(numTables));
  const headerLength = 12 + 16 * numTables;
  const pad4 = (n: number) => (n + 3) & ~3;
  const total = tables.reduce((sum, t) => sum + pad4(t.origLength), headerLength);
  const out = Buffer.alloc(total);
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(pow2 * 16, 6);
  out.writeUInt16BE(Math.log2(pow2), 8);
  out.writeUInt16BE(numTables * 16 - pow2 * 16, 10);
  let offset = headerLength;
  tables.forEach((t, i) => {
    const rec = 12 + i * 16;
    out.writeUInt32BE(t.tag, rec);
    out.writeUInt32BE(t.checksum, rec + 4);
    out.writeUInt32BE(offset, rec + 8);
    out.writeUInt32BE(t.origLength, rec + 12);
    t.data.copy(out, offset);
    offset += pad4(t.origLength);
  });
  return out;
}

interface Subset {
  name: string; // the pdfkit font name
  bytes: Buffer;
  ranges: [number, number][];
}

const require = createRequire(import.meta.url);
function packageDir(pkg: string): string {
  return path.dirname(require.resolve(`${pkg}/package.json`));
}

/** unicode-range of each subset file, read from the package's own CSS. */
function subsetRanges(pkgDir: string, cssFile: string): Map<string, [number, number][]> {
  const css = fs.readFileSync(path.join(pkgDir, cssFile), "utf8");
  const out = new Map<string, [number, number][]>();
  for (const block of css.split("@font-face").slice(1)) {
    const file = block.match(/url\(\.\/files\/([\w-]+)\.woff2\)/)?.[1];
    const range = block.match(/unicode-range:\s*([^;]+);/)?.[1];
    if (!file || !range) continue;
    out.set(
      file,
      range.split(",").map((part) => {
        const [a, b] = part.trim().replace(/^U\+/i, "").split("-");
        const lo = parseInt(a!, 16);
        return [lo, b ? parseInt(b, 16) : lo] as [number, number];
      }),
    );
  }
  return out;
}

let loaded: Map<Face, Subset[]> | undefined;
function faces(): Map<Face, Subset[]> {
  if (loaded) return loaded;
  const map = new Map<Face, Subset[]>();
  for (const [face, spec] of Object.entries(FACES) as [Face, FaceFiles][]) {
    const dir = packageDir(spec.pkg);
    const cssFile = `${spec.weight}${spec.style === "italic" ? "-italic" : ""}.css`;
    const ranges = subsetRanges(dir, cssFile);
    const family = path.basename(spec.pkg);
    const subsets: Subset[] = [];
    for (const sub of spec.subsets) {
      const base = `${family}-${sub}-${spec.weight}-${spec.style}`;
      const file = path.join(dir, "files", `${base}.woff`);
      const r = ranges.get(base);
      if (!r || !fs.existsSync(file)) continue;
      subsets.push({ name: `${face}:${sub}`, bytes: woffToSfnt(fs.readFileSync(file)), ranges: r });
    }
    if (subsets.length === 0) throw new Error(`No font files found for ${family} ${spec.weight} ${spec.style}`);
    map.set(face, subsets);
  }
  loaded = map;
  return map;
}

export function registerFonts(doc: PDFKit.PDFDocument): void {
  for (const subsets of faces().values()) for (const s of subsets) doc.registerFont(s.name, s.bytes);
}

const covers = (s: Subset, cp: number) => s.ranges.some(([lo, hi]) => cp >= lo && cp <= hi);

const fontOfChar = new Map<string, string | null>();
function fontFor(face: Face, ch: string): string | null {
  const key = face + ch;
  let hit = fontOfChar.get(key);
  if (hit !== undefined) return hit;
  const cp = ch.codePointAt(0)!;
  hit = null;
  for (let f: Face | undefined = face; f && hit === null; f = FACES[f].fallback) {
    hit = faces().get(f)!.find((s) => covers(s, cp))?.name ?? null;
  }
  fontOfChar.set(key, hit);
  return hit;
}

export interface Run {
  font: string;
  text: string;
}

const ASCII_PRINTABLE = /^[\x20-\x7e]*$/;

/** What the page prints for a character no shipped font has: it says so, instead of a "?". */
export function missingGlyphText(ch: string): string {
  return `[no glyph U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, "0")}]`;
}

/**
 * Cut a text into runs of one font subset each. Bidirectional control characters (which could
 * reorder a typed name) are dropped; characters no subset has are written in words or ASCII,
 * or named by their code point (missingGlyphText).
 */
export function runs(face: Face, text: string): Run[] {
  const first = faces().get(face)![0]!.name;
  if (ASCII_PRINTABLE.test(text)) return [{ font: first, text }];
  const out: Run[] = [];
  for (const raw of stripBidi(text)) {
    let ch = raw;
    let font = fontFor(face, ch);
    if (!font) {
      ch = SUBSTITUTES[raw] ?? missingGlyphText(raw);
      font = first;
    }
    const last = out[out.length - 1];
    if (last && last.font === font) last.text += ch;
    else out.push({ font, text: ch });
  }
  return out;
}
