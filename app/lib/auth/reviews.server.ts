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
import { formatDateTime } from "~/lib/format";
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
  decision: Decision | "reopened";
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
  const inForce = (await listReviews(job.id, database)).at(-1);
  if (inForce?.decision === "approved") {
    throw jsonError(
      409,
      `Job ${job.id} was approved by ${inForce.reviewerName || inForce.reviewerEmail} on ${formatDateTime(inForce.createdAt)}; an approved run is closed. Queue a new run for a change, or ask an admin to reopen it with a reason.`,
    );
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

export const reopenInputSchema = z.object({
  reason: z.string().trim().min(10, "Give the reason for reopening in at least 10 characters").max(2000, "A reason has at most 2000 characters"),
});

/**
 * An admin withdraws the approval of a run, with a reason: a "reopened" entry joins the
 * append-only decisions (the approval stays on record) and the audit trail; the run then
 * waits for a new decision. Throws 403 (not an admin), 404, 409 (not approved), 400 (no reason).
 */
export async function reopenReview(
  input: { jobId: string; admin: SessionUser; reason: string; request?: Request },
  database: Db = defaultDb(),
): Promise<Review> {
  if (!can(input.admin.role, "manage:users")) throw forbidden(`Reopening an approved run is for admins; your role is ${input.admin.role}`);
  const parsed = reopenInputSchema.safeParse({ reason: input.reason });
  if (!parsed.success) throw jsonError(400, "The reason is missing", parsed.error.issues.map((i) => ({ path: i.path.join("."), message: i.message })));
  const job = await database.query.jobs.findFirst({ where: eq(jobs.id, input.jobId) });
  if (!job) throw jsonError(404, `Job ${input.jobId} not found`);
  const inForce = (await listReviews(job.id, database)).at(-1);
  if (inForce?.decision !== "approved") throw jsonError(409, `Job ${job.id} is not approved, so there is nothing to reopen`);
  const id = randomUUID();
  const audited = await auditValues({ request: input.request, actor: input.admin, action: "review.reopen", entityType: "job", entityId: job.id, detail: { reviewId: id, reopens: inForce.id, reason: parsed.data.reason } });
  // the reopening and its audit row together, or neither
  await database.batch([
    database.insert(reviews).values({ id, jobId: job.id, reviewerId: input.admin.id, decision: "reopened", comment: parsed.data.reason }),
    database.insert(auditLog).values(audited),
  ]);
  return (await listReviews(job.id, database)).find((r) => r.id === id)!;
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
