// parseModel: the one gate every model passes (upload, API, worker, command line). Schema
// errors, cross-reference rules and the stability check are all collected, up to a cap.
import type { z } from "zod";
import { IssueList, type ModelIssue, type PathPart } from "./issues";
import { checkReferences } from "./rules";
import { trussModelSchema, type TrussModel } from "./schema";
import { findMechanisms } from "./stiffness";
import { buildStructure } from "./structure";
import { summarize, type ModelSummary } from "./summary";
import { modelWarnings, unknownFieldWarnings } from "./warnings";

export type ParseResult =
  | { ok: true; model: TrussModel; warnings: ModelIssue[]; summary: ModelSummary }
  | { ok: false; errors: ModelIssue[]; warnings: ModelIssue[] };

export interface ParseOptions {
  /** most errors listed (default 50); the last entry then says how many more there were */
  maxErrors?: number;
  /** most warnings listed (default 50) */
  maxWarnings?: number;
}

function valueAt(raw: unknown, path: readonly PathPart[]): unknown {
  let v = raw;
  for (const p of path) {
    if (v === null || typeof v !== "object") return undefined;
    v = (v as Record<string | number, unknown>)[p];
  }
  return v;
}

function schemaMessage(raw: unknown, issue: z.core.$ZodIssue): string {
  const path = issue.path as PathPart[];
  const last = path[path.length - 1];
  if (issue.code === "invalid_type" && valueAt(raw, path) === undefined && path.length > 0) {
    return `"${String(last)}" is missing`;
  }
  if (issue.code === "invalid_type" && typeof valueAt(raw, path) === "number" && !Number.isFinite(valueAt(raw, path) as number)) {
    return `${String(last)} is ${String(valueAt(raw, path))}; numbers must be finite`;
  }
  const v = valueAt(raw, path);
  if ((issue.code === "too_small" || issue.code === "too_big") && typeof v === "number") return `${issue.message} (got ${v})`;
  return issue.message;
}

export function parseModel(input: unknown, opts: ParseOptions = {}): ParseResult {
  const errors = new IssueList(input, opts.maxErrors ?? 50);
  const warnings = new IssueList(input, opts.maxWarnings ?? 50);
  if (typeof input !== "object" || input === null || Array.isArray(input)) {
    errors.add([], "the file must hold one JSON object (the truss model)");
    return { ok: false, errors: errors.finish("errors"), warnings: [] };
  }
  const parsed = trussModelSchema.safeParse(input);
  if (!parsed.success) for (const issue of parsed.error.issues) errors.add(issue.path as PathPart[], schemaMessage(input, issue));
  checkReferences(input, errors);
  unknownFieldWarnings(input, warnings);
  if (!parsed.success || errors.length > 0) {
    return { ok: false, errors: errors.finish("errors"), warnings: warnings.finish("warnings") };
  }

  const model = parsed.data;
  const s = buildStructure(model);
  modelWarnings(model, s, warnings);
  const mechanisms = findMechanisms(s, { max: 5 });
  if (mechanisms.length > 0) {
    const index = new Map(model.nodes.map((n, i) => [n.id, i]));
    for (const m of mechanisms) errors.addPlain(["nodes", index.get(m.node) ?? 0], m.message);
    return { ok: false, errors: errors.finish("errors"), warnings: warnings.finish("warnings") };
  }
  const summary = summarize(model, s, { ok: true, message: "stable: no mechanism, every free direction is held by members or supports" });
  return { ok: true, model, warnings: warnings.finish("warnings"), summary };
}

/** parseModel for the text of a file: size limit and JSON syntax are reported as errors too. */
export function parseModelText(text: string, opts: ParseOptions & { maxBytes?: number } = {}): ParseResult {
  if (opts.maxBytes !== undefined) {
    const bytes = new TextEncoder().encode(text).length;
    if (bytes > opts.maxBytes) {
      return { ok: false, errors: [{ path: "", message: `model: the file is ${bytes} bytes, over the upload limit of ${opts.maxBytes} bytes` }], warnings: [] };
    }
  }
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    const why = e instanceof Error ? e.message : String(e);
    return { ok: false, errors: [{ path: "", message: `model: the file is not valid JSON (${why})` }], warnings: [] };
  }
  return parseModel(data, opts);
}
