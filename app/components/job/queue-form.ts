// The queue form's fields → job options, shared by the browser (instant feedback) and the
// action (the truth). Empty fields mean "as the model's design block says"; the same zod
// schema (jobOptionsSchema) as the API and the worker decides what is valid.
import { jobOptionsSchema, type JobOptions } from "~/engine/design/options";

export const QUEUE_FIELDS = ["formulation", "objective", "maxIterations", "tolerance", "displacementLimit", "volumeMax", "stress", "buckling"] as const;
export type QueueField = (typeof QUEUE_FIELDS)[number];

export type QueueFormResult = { ok: true; options: JobOptions } | { ok: false; fieldErrors: Partial<Record<QueueField | "form", string>> };

const NUMBER_FIELDS = new Set<QueueField>(["maxIterations", "tolerance", "displacementLimit", "volumeMax"]);
const SWITCH_FIELDS = new Set<QueueField>(["stress", "buckling"]);

const LABELS: Record<QueueField, string> = {
  formulation: "Formulation",
  objective: "Objective",
  maxIterations: "Iteration cap",
  tolerance: "Tolerance",
  displacementLimit: "Displacement limit",
  volumeMax: "Volume limit",
  stress: "Stress check",
  buckling: "Buckling check",
};

export function parseQueueForm(get: (name: string) => FormDataEntryValue | null): QueueFormResult {
  const raw: Record<string, unknown> = {};
  const fieldErrors: Partial<Record<QueueField | "form", string>> = {};
  for (const f of QUEUE_FIELDS) {
    const v = get(f);
    const s = typeof v === "string" ? v.trim() : "";
    if (s === "" || s === "default") continue;
    if (NUMBER_FIELDS.has(f)) {
      const n = Number(s.replace(/\s/g, ""));
      if (!Number.isFinite(n)) fieldErrors[f] = `${LABELS[f]} must be a number`;
      else raw[f] = n;
    } else if (SWITCH_FIELDS.has(f)) {
      raw[f] = s === "on";
    } else raw[f] = s;
  }
  if (Object.keys(fieldErrors).length) return { ok: false, fieldErrors };
  const parsed = jobOptionsSchema.safeParse(raw);
  if (parsed.success) return { ok: true, options: parsed.data };
  for (const issue of parsed.error.issues) {
    const key = (issue.path[0] as QueueField | undefined) ?? "form";
    if (!fieldErrors[key]) fieldErrors[key] = `${key === "form" ? "" : LABELS[key as QueueField] + ": "}${friendly(issue.message)}`;
  }
  return { ok: false, fieldErrors };
}

function friendly(message: string): string {
  // zod's messages are terse ("Too big: expected number to be <=5000"); keep them but in lower case after the label
  return message.charAt(0).toLowerCase() + message.slice(1);
}
