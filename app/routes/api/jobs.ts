// GET /api/jobs (?status=&projectId=&modelId=&limit=&cursor=), POST /api/jobs (queue a run, optionally
// answering a returned run of the same model).
import { z } from "zod";
import { JOB_STATUSES } from "~/db/schema";
import { audit } from "~/lib/auth/audit.server";
import { assertModelVisible, assertProjectVisible, requirePermission } from "~/lib/access.server";
import { jsonError, readJson, zodDetails, withDependencies } from "~/lib/http.server";
import { enqueueJob, LIST_LIMIT_MAX, listJobsJson } from "~/lib/jobs/queue.server";
import type { Route } from "./+types/jobs";

const listQuerySchema = z.object({
  status: z
    .string()
    .transform((s) => s.split(",").map((x) => x.trim()).filter(Boolean))
    .pipe(z.array(z.enum(JOB_STATUSES, { error: `status must be one of ${JOB_STATUSES.join(", ")}` })))
    .optional(),
  projectId: z.string().min(1).optional(),
  modelId: z.string().min(1).optional(),
  limit: z.coerce.number({ error: "limit must be a number" }).int("limit must be a whole number").min(1).max(LIST_LIMIT_MAX).optional(),
  cursor: z.string().min(1).optional(),
});

const submitSchema = z.object({
  modelId: z.string({ error: "modelId is required" }).min(1, "modelId is required"),
  version: z.number({ error: "version must be a whole number from 1" }).int("version must be a whole number from 1").min(1, "version must be a whole number from 1").optional(),
  kind: z.enum(["design", "analysis"], { error: 'kind must be "design" or "analysis"' }).optional(),
  options: z.record(z.string(), z.unknown()).optional(),
  /** the returned run ("changes requested") this run answers: a run of the same model */
  answersJobId: z.string({ error: "answersJobId must be a job id" }).min(1, "answersJobId must be a job id").optional(),
});

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "read:job");
  const params = Object.fromEntries([...new URL(request.url).searchParams].filter(([, v]) => v !== ""));
  const q = listQuerySchema.safeParse(params);
  if (!q.success) return jsonError(400, "The job list filter is not valid", zodDetails(q.error.issues));
  if (q.data.projectId) await assertProjectVisible(user, q.data.projectId);
  const body = await listJobsJson({ ...q.data, visibleTo: user });
  return new Response(body, { headers: { "Content-Type": "application/json", "Cache-Control": "no-store" } });
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST to queue a job`);
  const user = await requirePermission(request, "create:job");
  const body = submitSchema.safeParse(await readJson(request));
  if (!body.success) return jsonError(400, "The job request is not valid", zodDetails(body.error.issues));
  const { modelId, version, kind, options, answersJobId } = body.data;
  await assertModelVisible(user, modelId);
  const job = await enqueueJob({ modelId, version, kind, options, user, answers: answersJobId ?? null });
  await audit({ request, actor: user, action: "job.submit", entityType: "job", entityId: job.id, detail: { modelId: job.modelId, version: job.modelVersion, kind: job.kind, options: job.options, ...(job.answersJobId ? { answersJobId: job.answersJobId } : {}) } });
  return Response.json({ id: job.id, status: job.status }, { status: 202, headers: { Location: `/api/jobs/${job.id}` } });
});
