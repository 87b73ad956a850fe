// GET /api/jobs/:jobId/progress: status, latest figures and the iteration history of the
// current attempt, for the live convergence plot (polled while the job runs).
import { requireJob } from "~/lib/access.server";
import { notFound, withDependencies } from "~/lib/http.server";
import { getJob, getJobHistory } from "~/lib/jobs/queue.server";
import type { Route } from "./+types/jobs.$jobId.progress";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireJob(request, params.jobId, "read:job");
  const job = await getJob(params.jobId);
  if (!job) notFound(`Job ${params.jobId}`);
  const history = await getJobHistory(job.id);
  return Response.json(
    { id: job.id, status: job.status, outcome: job.outcome, attempt: job.attempts, progress: job.progress, history, error: job.error },
    { headers: { "Cache-Control": "no-store" } },
  );
});
