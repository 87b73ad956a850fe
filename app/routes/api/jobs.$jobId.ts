// GET /api/jobs/:jobId: status, outcome, the state in words (as the pages say it, e.g. "waiting
// for storage — …"), latest progress, summary and review decisions.
import { requireJob } from "~/lib/access.server";
import { listReviews } from "~/lib/auth/reviews.server";
import { notFound, withDependencies } from "~/lib/http.server";
import { getJob } from "~/lib/jobs/queue.server";
import { jobState } from "~/lib/job-state";
import type { Route } from "./+types/jobs.$jobId";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireJob(request, params.jobId, "read:job");
  const job = await getJob(params.jobId);
  if (!job) notFound(`Job ${params.jobId}`);
  const reviews = await listReviews(job.id);
  return Response.json({ ...job, state: jobState(job).sentence, reviews }, { headers: { "Cache-Control": "no-store" } });
});
