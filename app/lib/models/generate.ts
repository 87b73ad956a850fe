// A generator's model checked by the same gate as an upload: parameters in, a model that
// uploads (or the problems, named) out. Pure: the API route and the generator page call it.
import { generateModel } from "~/engine/generators";
import { parseModel, type TrussModelInput } from "~/engine/truss";
import type { ErrorDetail } from "~/lib/http.server";

export type GeneratedModel = { ok: true; model: TrussModelInput } | { ok: false; status: 400 | 404; error: string; details: ErrorDetail[] };

export function generateCheckedModel(kind: string, params: unknown): GeneratedModel {
  const r = generateModel(kind, params);
  if (!r) return { ok: false, status: 404, error: `There is no generator "${kind}"; GET /api/generators lists them`, details: [{ path: "kind", message: "unknown generator" }] };
  if (!r.ok) {
    const n = r.errors.length;
    return { ok: false, status: 400, error: `${n} parameter${n === 1 ? " is" : "s are"} not valid: ${r.errors.map((e) => e.path).join(", ")}`, details: r.errors };
  }
  // the generators build stable trusses; extreme parameters (e.g. a zero-length member) are still caught here
  const parsed = parseModel(r.model);
  if (!parsed.ok) {
    return { ok: false, status: 400, error: `These parameters give a model the gate refuses: ${parsed.errors[0]?.path}: ${parsed.errors[0]?.message}`, details: parsed.errors };
  }
  return { ok: true, model: r.model };
}
