// The checker's decision on a finished job. Four-eyes: nobody reviews a job they submitted.
// Decisions are appended, never edited (database triggers refuse UPDATE/DELETE); a later
// decision supersedes the earlier one, and both stay on record. A re-run is a new job with
// its own reviews, so an approval never carries over to different numbers.
import { randomUUID } from "node:crypto";
import { asc, eq, sql } from "drizzle-orm";
import { z } from "zod";
import { db as defaultDb, type Db } from "~/db/client.server";
import { auditLog, jobs, reviews, user } from "~/db/schema";
import { jsonError } from "~/lib/http.server";
import { mailInsert } from "~/lib/mail/outbox.server";
import { decisionMails } from "~/lib/notify.server";
import { OUTCOMES_WITHOUT_REVIEW } from "~/lib/review-request";
import { auditValues } from "./audit.server";
import { forbidden, type SessionUser } from "./authorize.server";
import { can } from "./permissions";

export const DECISIONS = ["approved", "changes-requested"] as const;
export type Decision = (typeof DECISIONS)[number];

export const reviewInputSchema = z
  .object({
    decision: z.enum(DECISIONS, "decision must be approved or changes-requested"),
    comment: z.string().trim().max(4000, "A comment has at most 4000 characters").default(""),
  })
  .refine((v) => v.decision !== "changes-requested" || v.comment.length > 0, {
    path: ["comment"],
    message: "Say what should change: a comment is required when returning a job",
  });

export interface Review {
  id: string;
  jobId: string;
  reviewerId: string;
  reviewerName: string;
  reviewerEmail: string;
  decision: Decision;
  comment: string;
  createdAt: string; // ISO
  supersededBy: string | null; // id of the later decision that replaced this one
  current: boolean; // the decision in force
}

/**
 * Record a decision. Throws a Response: 403 (no review permission, or the four-eyes rule),
 * 404 (no such job), 409 (the job has not succeeded, or an approval of an infeasible run),
 * 400 (missing comment).
 */
export async function createReview(
  input: { jobId: string; reviewer: SessionUser; decision: Decision; comment?: string; request?: Request },
  database: Db = defaultDb(),
): Promise<Review> {
  const { reviewer } = input;
  if (!can(reviewer.role, "review:job")) {
    throw forbidden(`Reviewing needs permission review:job; your role is ${reviewer.role}`);
  }
  const parsed = reviewInputSchema.safeParse({ decision: input.decision, comment: input.comment ?? "" });
  if (!parsed.success) {
    throw jsonError(400, "The review is incomplete", parsed.error.issues.map((i) => ({ path: i.path.join("."), message: i.message })));
  }
  const job = await database.query.jobs.findFirst({ where: eq(jobs.id, input.jobId) });
  if (!job) throw jsonError(404, `Job ${input.jobId} not found`);
  if (job.submittedBy === reviewer.id) {
    throw forbidden("Four-eyes rule: you submitted this job, so a different checker must review it");
  }
  if (job.status !== "succeeded") {
    throw jsonError(409, `Only a succeeded job can be reviewed; job ${job.id} is ${job.status}`);
  }
  if (parsed.data.decision === "approved" && OUTCOMES_WITHOUT_REVIEW.includes(job.outcome ?? "")) {
    throw jsonError(409, `Job ${job.id} ended ${job.outcome}: it has no design to approve; return it with comments instead`);
  }
  const id = randomUUID();
  const decision = { id, jobId: job.id, reviewerId: reviewer.id, decision: parsed.data.decision, comment: parsed.data.comment, createdAt: new Date() };
  const audited = await auditValues({
    request: input.request,
    actor: reviewer,
    action: `review.${parsed.data.decision}`,
    entityType: "job",
    entityId: job.id,
    detail: { reviewId: id, comment: parsed.data.comment || undefined },
  });
  const mails = await decisionMails(database, decision);
  // the decision, its audit row and the submitter's mail are stored in one batch (one
  // transaction): all of them or none
  await database.batch([database.insert(reviews).values(decision), database.insert(auditLog).values(audited), ...mails.map((m) => mailInsert(database, m))]);
  const all = await listReviews(job.id, database);
  return all.find((r) => r.id === id)!;
}

/** Every decision on a job, oldest first; the last one is in force. */
export async function listReviews(jobId: string, database: Db = defaultDb()): Promise<Review[]> {
  const rows = await database
    .select({
      id: reviews.id,
      jobId: reviews.jobId,
      reviewerId: reviews.reviewerId,
      reviewerName: user.name,
      reviewerEmail: user.email,
      decision: reviews.decision,
      comment: reviews.comment,
      createdAt: reviews.createdAt,
    })
    .from(reviews)
    .innerJoin(user, eq(user.id, reviews.reviewerId))
    .where(eq(reviews.jobId, jobId))
    .orderBy(asc(reviews.createdAt), asc(sql`"reviews"."rowid"`));
  // createdAt has millisecond resolution; rowid (insertion order, never reused: rows are
  // never deleted) breaks ties between decisions of the same millisecond
  return rows.map((r, i) => ({
    ...r,
    createdAt: r.createdAt.toISOString(),
    supersededBy: rows[i + 1]?.id ?? null,
    current: i === rows.length - 1,
  }));
}

/** The decision in force, or null when the job has not been reviewed. */
export async function currentReview(jobId: string, database: Db = defaultDb()): Promise<Review | null> {
  const all = await listReviews(jobId, database);
  return all.at(-1) ?? null;
}
