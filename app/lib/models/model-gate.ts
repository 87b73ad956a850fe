// The upload gate as a pure function: bytes in, a validated model (or the reasons it is
// refused) out. No database, no bucket, no config: the web thread, a worker thread and the
// tests call it alike. Uploads, new versions, the editor and the spreadsheet import all pass it.
import { createHash } from "node:crypto";
import { parseModel, type ModelSummary, type TrussModel } from "~/engine/truss";
import type { ErrorDetail } from "~/lib/http.server";
import { locateJsonError } from "./json-error";
import { findTooDeep, tooDeepMessage } from "~/lib/json-depth";

export type GateResult =
  | { ok: true; model: TrussModel; summary: ModelSummary; warnings: ErrorDetail[]; sha256: string; sizeBytes: number }
  | { ok: false; status: 400 | 413; error: string; details: ErrorDetail[] };

const mb = (n: number) => `${(n / (1024 * 1024)).toFixed(n < 1024 * 1024 ? 2 : 1)} MB`;

export function tooLargeRefusal(fileName: string | null, size: number | null, limit: number): GateResult & { ok: false } {
  const what = fileName ? `The file ${fileName}` : "The upload";
  const error = size === null ? `${what} is larger than the upload limit of ${mb(limit)}` : `${what} is ${mb(size)}, larger than the upload limit of ${mb(limit)}`;
  return { ok: false, status: 413, error, details: [{ path: "file", message: `over the upload limit of ${limit} bytes` }] };
}

/** Decode, parse and validate a model file; `limitBytes` is the upload limit. */
export function checkModelBytes(fileName: string, bytes: Uint8Array, limitBytes: number): GateResult {
  if (bytes.byteLength > limitBytes) return tooLargeRefusal(fileName, bytes.byteLength, limitBytes);
  if (bytes.byteLength === 0) return invalid(`The file ${fileName} is empty`, [{ path: "file", message: "no content" }]);

  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return invalid(`The file ${fileName} is not UTF-8 text`, [{ path: "file", message: "not UTF-8 encoded text" }]);
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // editors on some systems add a BOM

  const deep = findTooDeep(text);
  if (deep) return invalid(tooDeepMessage(`The file ${fileName}`, deep), [{ path: `(file) line ${deep.line}, column ${deep.column}`, message: "nested too deeply" }]);
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    const at = locateJsonError(text);
    const where = `line ${at.line}, column ${at.column}`;
    return invalid(`The file ${fileName} is not valid JSON: ${at.message} at ${where}`, [
      { path: `(file) ${where}`, message: at.message || (e as Error).message },
    ]);
  }
  return checkModelJson(fileName, json, bytes);
}

/** Validate an already parsed model; `bytes` are what will be stored (for the sha256). */
export function checkModelJson(fileName: string, json: unknown, bytes: Uint8Array): GateResult {
  const parsed = parseModel(json);
  if (!parsed.ok) {
    const n = parsed.errors.length;
    return invalid(
      `The model in ${fileName} has ${n} problem${n === 1 ? "" : "s"}; the first: ${parsed.errors[0]?.path}: ${parsed.errors[0]?.message} (the format: docs/model-format.md)`,
      parsed.errors,
    );
  }
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  return { ok: true, model: parsed.model, summary: parsed.summary, warnings: parsed.warnings, sha256, sizeBytes: bytes.byteLength };
}

function invalid(error: string, details: ErrorDetail[]): GateResult {
  return { ok: false, status: 400, error, details };
}
