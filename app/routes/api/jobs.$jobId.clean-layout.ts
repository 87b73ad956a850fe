// POST /api/jobs/:jobId/clean-layout: the next version of the job's model, keeping only the
// members the least-mass LP (source "lp") or the optimum ("optimum") uses above `threshold`
// percent of the largest area. JSON or form body; 201 with the new version, 409 with the reason
// (a mechanism, no LP design in the result) and nothing stored.
import { audit } from "~/lib/auth/audit.server";
import { requireJob } from "~/lib/access.server";
import { cleanLayoutFormSchema, storeCleanLayout } from "~/lib/clean-layout.server";
import { jsonError, readJson, zodDetails, withDependencies } from "~/lib/http.server";
import type { Route } from "./+types/jobs.$jobId.clean-layout";

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST`);
  const { user, job } = await requireJob(request, params.jobId, "create:model");
  const isForm = /form/.test(request.headers.get("content-type") ?? "");
  const body = isForm ? Object.fromEntries(await request.formData()) : await readJson(request);
  const parsed = cleanLayoutFormSchema.safeParse(body);
  if (!parsed.success) return jsonError(400, "The clean-layout request is not valid", zodDetails(parsed.error.issues));
  const out = await storeCleanLayout({ jobId: job.id, source: parsed.data.source, thresholdPercent: parsed.data.threshold, user });
  if (!out.ok) return jsonError(out.status, out.error, out.details);
  await audit({ request, actor: user, action: "model.clean-layout", entityType: "model", entityId: out.modelId, detail: { job: job.id, version: out.version, source: parsed.data.source, threshold: parsed.data.threshold } });
  return Response.json({ modelId: out.modelId, version: out.version, summary: out.summary }, { status: 201, headers: { Location: `/models/${out.modelId}` } });
});
