// GET /api/jobs/:jobId/reviews (every decision, oldest first), POST a new decision (api.md).
import { requireJob } from "~/lib/access.server";
import { createReview, listReviews, reviewInputSchema } from "~/lib/auth/reviews.server";
import { jsonError, readJson, zodDetails, withDependencies } from "~/lib/http.server";
import type { Route } from "./+types/jobs.$jobId.reviews";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireJob(request, params.jobId, "read:job");
  return Response.json({ reviews: await listReviews(params.jobId) });
});

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST to add a decision`);
  const { user: reviewer } = await requireJob(request, params.jobId, "review:job");
  const parsed = reviewInputSchema.safeParse(await readJson(request));
  if (!parsed.success) return jsonError(400, "The review is incomplete", zodDetails(parsed.error.issues));
  const review = await createReview({ jobId: params.jobId, reviewer, ...parsed.data, request });
  return Response.json(review, { status: 201 });
});
