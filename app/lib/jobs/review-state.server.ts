// The review state in force of each job, for list columns and filters: the newest decision
// (reviews are append-only, rowid breaks ties within a millisecond), or whether the run is
// waiting for one. Only a succeeded run with a design to sign off waits (review-request.ts).
import { and, eq, inArray, notInArray, sql, type SQL } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { jobs, reviews } from "~/db/schema";
import type { ReviewFilter } from "~/lib/job-state";
import { OUTCOMES_WITHOUT_REVIEW } from "~/lib/review-request";

const latestDecision = sql<string | null>`(select r.decision from reviews r where r.job_id = ${jobs.id} order by r.created_at desc, r.rowid desc limit 1)`;
const reviewable = and(eq(jobs.status, "succeeded"), notInArray(jobs.outcome, [...OUTCOMES_WITHOUT_REVIEW] as ("infeasible" | "failed")[]))!;

export function reviewStateCondition(filter: ReviewFilter): SQL {
  switch (filter) {
    case "approved":
    case "changes-requested":
      return sql`${latestDecision} = ${filter}`;
    case "waiting":
      // an approval an admin reopened waits for a checker again
      return and(reviewable, sql`coalesce(${latestDecision}, 'reopened') = 'reopened'`)!;
    case "no-review":
      return sql`not (${reviewable})`;
  }
}

/** The decision in force per job id (absent: none yet). */
export async function latestDecisions(database: Db, jobIds: string[]): Promise<Map<string, string>> {
  if (jobIds.length === 0) return new Map();
  const rows = await database
    .select({ jobId: reviews.jobId, decision: reviews.decision })
    .from(reviews)
    .where(inArray(reviews.jobId, jobIds))
    .orderBy(reviews.createdAt, sql`${reviews}.rowid`);
  const out = new Map<string, string>();
  for (const r of rows) out.set(r.jobId, r.decision); // the last one wins
  return out;
}
