// GET /api/jobs/:jobId/result: the result JSON of docs/model-format.md, passed on from the bucket
// as a stream (a large result is never held whole in the web process); 409 while there is none.
import { requireJob } from "~/lib/access.server";
import { jsonError, notFound, withDependencies } from "~/lib/http.server";
import { getJob, getJobResultStream } from "~/lib/jobs/queue.server";
import type { Route } from "./+types/jobs.$jobId.result";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireJob(request, params.jobId, "read:job");
  const job = await getJob(params.jobId);
  if (!job) notFound(`Job ${params.jobId}`);
  if (job.status === "queued" || job.status === "running") {
    return jsonError(409, `Job ${job.id} is ${job.status}; its result is there once it has finished`);
  }
  // a run stopped on request may have kept its best design so far
  if (job.status !== "succeeded" && !job.hasResult) {
    return jsonError(409, `Job ${job.id} ${job.status === "failed" ? "failed" : "was cancelled"}, so it has no result${job.error ? `: ${job.error}` : ""}`);
  }
  const stored = await getJobResultStream(job.id);
  if (stored === null) return jsonError(500, `The result of job ${job.id} is missing from storage`);
  const download = new URL(request.url).searchParams.has("download");
  return new Response(stored.body, {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      ...(stored.length !== null ? { "Content-Length": String(stored.length) } : {}),
      "Cache-Control": "private, max-age=3600", // a stored result never changes
      ...(download ? { "Content-Disposition": `attachment; filename="job-${job.id}.result.json"` } : {}),
    },
  });
});
