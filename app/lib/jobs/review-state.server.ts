// The review state in force of each job, for list columns and filters: the newest decision
// (reviews are append-only, rowid breaks ties within a millisecond), or whether the run is
// waiting for one. Only a succeeded run with a design to sign off waits (review-request.ts).
import { and, eq, inArray, notInArray, sql, type SQL } from "drizzle-orm";
import type { SQLiteColumn } from "drizzle-orm/sqlite-core";
import type { Db } from "~/db/client.server";
import { jobs, reviews } from "~/db/schema";
import type { ReviewFilter } from "~/lib/job-state";
import { OUTCOMES_WITHOUT_REVIEW } from "~/lib/review-request";

/** The job columns a review-state condition reads, as the list reads them. */
export interface ReviewColumns {
  id: SQLiteColumn;
  status: SQLiteColumn;
  outcome: SQLiteColumn;
}
const JOB_COLUMNS: ReviewColumns = { id: jobs.id, status: jobs.status, outcome: jobs.outcome };

const latestDecision = (jobId: SQLiteColumn) => sql<string | null>`(select r.decision from reviews r where r.job_id = ${jobId} order by r.created_at desc, r.rowid desc limit 1)`;
/**
 * `columns`: where the list reads the job's id, status and outcome. A member's list has copies
 * of them beside its own rows, on one index (app/lib/jobs/list-source.server.ts), so it judges
 * each run from that index and reads only the jobs it keeps.
 */
export function reviewStateCondition(filter: ReviewFilter, columns: ReviewColumns = JOB_COLUMNS): SQL {
  const reviewable = and(eq(columns.status, "succeeded"), notInArray(columns.outcome, [...OUTCOMES_WITHOUT_REVIEW] as ("infeasible" | "failed")[]))!;
  const decision = latestDecision(columns.id);
  switch (filter) {
    case "approved":
    case "changes-requested":
      return sql`${decision} = ${filter}`;
    case "waiting":
      // an approval an admin reopened waits for a checker again
      return and(reviewable, sql`coalesce(${decision}, 'reopened') = 'reopened'`)!;
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
