// The query plans of the membership-filtered lists (EXPLAIN QUERY PLAN), for the plan test
// (membership-plan.test.ts) and the job-list benchmark. The SQL is the one the app runs: the
// list function is called on a Drizzle handle over the same client that records each query.
import { drizzle } from "drizzle-orm/libsql";
import type { Db } from "~/db/client.server";
import * as schema from "~/db/schema";

export interface PlannedQuery {
  sql: string;
  /** SQLite's plan, one step a line, indented by depth ("SCAN jobs USING INDEX …") */
  plan: string[];
}

/** Every query `run` makes on the handle it is given, each with its plan. */
export async function plansOf(database: Db, run: (recording: Db) => Promise<unknown>): Promise<PlannedQuery[]> {
  const seen: { sql: string; params: unknown[] }[] = [];
  const recording = drizzle(database.$client, { schema, logger: { logQuery: (sql, params) => void seen.push({ sql, params }) } }) as unknown as Db;
  await run(recording);
  const out: PlannedQuery[] = [];
  for (const q of seen) {
    const rows = (await database.$client.execute({ sql: `EXPLAIN QUERY PLAN ${q.sql}`, args: q.params as never })).rows;
    const depth = new Map<number, number>();
    const plan = rows.map((r) => {
      const d = (depth.get(Number(r.parent)) ?? -1) + 1;
      depth.set(Number(r.id), d);
      return `${"  ".repeat(d)}${String(r.detail)}`;
    });
    out.push({ sql: q.sql, plan });
  }
  return out;
}

/** The plan of listJobs for this filter (the shared short-lived copy bypassed). */
export async function jobListPlan(database: Db, filter: import("~/lib/jobs/queue.server").ListJobsFilter): Promise<string[]> {
  const { listJobs } = await import("~/lib/jobs/queue.server");
  const [first] = await plansOf(database, (recording) => listJobs(filter, recording, { fresh: true }));
  return first!.plan;
}
