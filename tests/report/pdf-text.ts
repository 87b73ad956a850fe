// Reads a PDF the way an outside program does: Debian's poppler-utils (pdftotext -raw keeps
// the order the text was drawn in, so table rows stay together; pdfinfo,
// pdffonts). Where poppler is missing the pdf-parse npm package extracts the text instead,
// and the test says so loudly.
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

export const havePoppler = spawnSync("pdftotext", ["-v"]).status === 0;
if (!havePoppler) console.warn("\n*** poppler-utils (pdftotext) is missing: PDF text is read with pdf-parse instead, fonts are not checked ***\n");

function tmpFile(bytes: Uint8Array): string {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-pdf-")), "r.pdf");
  fs.writeFileSync(file, bytes);
  return file;
}

/** Text of each page, whitespace collapsed and words split at a line-end hyphen joined again. */
export async function pageTexts(bytes: Uint8Array): Promise<string[]> {
  let pages: string[];
  if (havePoppler) {
    const file = tmpFile(bytes);
    pages = execFileSync("pdftotext", ["-raw", "-enc", "UTF-8", file, "-"], { encoding: "utf8", maxBuffer: 256 * 1024 * 1024 }).split("\f");
    if (pages[pages.length - 1]!.trim() === "") pages.pop();
  } else {
    const { default: pdfParse } = (await import("pdf-parse/lib/pdf-parse.js" as string)) as { default: (b: Buffer, o: object) => Promise<{ text: string }> };
    const out: string[] = [];
    await pdfParse(Buffer.from(bytes), {
      pagerender: async (page: { getTextContent(): Promise<{ items: { str: string }[] }> }) => {
        const t = await page.getTextContent();
        out.push(t.items.map((i) => i.str).join(" "));
        return "";
      },
    });
    pages = out;
  }
  return pages.map((p) => p.replace(/-\s*\n\s*/g, "-").replace(/\s+/g, " ").trim());
}

export function pageCount(bytes: Uint8Array): number | null {
  if (!havePoppler) return null;
  const info = execFileSync("pdfinfo", [tmpFile(bytes)], { encoding: "utf8" });
  return Number(/Pages:\s+(\d+)/.exec(info)?.[1]);
}

/** pdffonts rows: font name and whether it is embedded. */
export function fonts(bytes: Uint8Array): { name: string; embedded: boolean }[] | null {
  if (!havePoppler) return null;
  const out = execFileSync("pdffonts", [tmpFile(bytes)], { encoding: "utf8" }).split("\n").slice(2).filter(Boolean);
  return out.map((l) => {
    const cols = l.trim().split(/\s+/);
    // name type... encoding emb sub uni object ID
    return { name: cols[0]!, embedded: cols[cols.length - 5] === "yes" };
  });
}
