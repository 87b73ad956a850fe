// "Clean layout" as a service: a finished job's result and the model version it solved become
// the next version of that model, keeping only the members the least-mass LP (or the optimum)
// uses above a threshold (app/engine/lp/clean-layout.ts). Nothing is stored on refusal.
import { z } from "zod";
import { cleanLayout } from "~/engine/lp/clean-layout";
import { parseModel } from "~/engine/truss";
import type { ErrorDetail } from "~/lib/http.server";
import { getJob, getJobResult } from "~/lib/jobs/queue.server";
import { createModelVersion } from "~/lib/models/versions.server";
import { getModelVersionFile } from "~/lib/models/versions.server";

export const cleanLayoutFormSchema = z.object({
  source: z.enum(["lp", "optimum"], { error: "source must be lp or optimum" }),
  threshold: z.coerce
    .number({ error: "threshold must be a number (percent of the largest area)" })
    .gt(0, { error: "threshold must be above 0 %" })
    .lt(100, { error: "threshold must be below 100 %" }),
});

export type CleanLayoutOutcome =
  | { ok: true; modelId: string; version: number; summary: string }
  | { ok: false; status: 400 | 404 | 409; error: string; details: ErrorDetail[] };

/** `thresholdPercent`: keep members above this percentage of the largest area. */
export async function storeCleanLayout(input: { jobId: string; source: "lp" | "optimum"; thresholdPercent: number; user: { id: string } }): Promise<CleanLayoutOutcome> {
  const job = await getJob(input.jobId);
  if (!job) return { ok: false, status: 404, error: `Job ${input.jobId} not found`, details: [{ path: "jobId", message: "no such job" }] };
  const result = await getJobResult(input.jobId);
  if (!result) return { ok: false, status: 409, error: "This job has no result to clean a layout from", details: [{ path: "jobId", message: "no result yet" }] };
  const file = await getModelVersionFile(job.modelId, job.modelVersion);
  if (!file) return { ok: false, status: 404, error: `The model of job ${input.jobId} no longer exists`, details: [{ path: "modelId", message: "no such model" }] };
  const parsed = parseModel(JSON.parse(file.text));
  if (!parsed.ok) return { ok: false, status: 409, error: "The job's model no longer passes validation", details: parsed.errors.slice(0, 5) };
  const cleaned = cleanLayout(parsed.model, result, { source: input.source, threshold: input.thresholdPercent / 100 });
  if (!cleaned.ok) return { ok: false, status: 409, error: cleaned.reason, details: [{ path: "threshold", message: cleaned.reason }] };
  const bytes = new TextEncoder().encode(JSON.stringify(cleaned.model, null, 2));
  const created = await createModelVersion({
    modelId: job.modelId,
    fileName: file.fileName.replace(/(\.truss)?\.json$/i, "") + ".clean.truss.json",
    bytes,
    note: `Clean layout from job ${input.jobId.slice(0, 8)} (version ${file.version}): ${cleaned.summary}`,
    user: input.user,
  });
  if (!created.ok) return { ok: false, status: created.status === 413 ? 409 : created.status, error: created.error, details: created.details };
  return { ok: true, modelId: created.modelId, version: created.version.version, summary: cleaned.summary };
}
