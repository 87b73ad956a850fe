// POST /api/jobs/:jobId/cancel: the submitter or an admin stops a queued or running job.
import { audit } from "~/lib/auth/audit.server";
import { requireJob } from "~/lib/access.server";
import { can } from "~/lib/auth/permissions";
import { jsonError, withDependencies } from "~/lib/http.server";
import { cancelJob } from "~/lib/jobs/queue.server";
import type { Route } from "./+types/jobs.$jobId.cancel";

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST to cancel`);
  const { user } = await requireJob(request, params.jobId, "cancel:job:own");
  // the submitter may; anyone else needs cancel:job:any (cancelJob answers 403 otherwise)
  const job = await cancelJob(params.jobId, { id: user.id, name: user.name, role: user.role, canCancelAny: can(user.role, "cancel:job:any") });
  await audit({ request, actor: user, action: "job.cancel", entityType: "job", entityId: job.id, detail: { status: job.status } });
  return Response.json({ id: job.id, status: job.status, cancelRequested: job.cancelRequested });
});
