// The job list of each project member, kept by the database itself: one row per (member, job of
// a project they belong to), written by triggers on jobs and project_members (migrations
// "member_jobs_upkeep", then "member_jobs_outcome_upkeep"), never by the app. A member's
// newest-first list walks their own rows (user, created_at, job) and reads exactly the jobs it
// shows, instead of walking every job and skipping those of other projects
// (docs/decisions/0023). Admins, who see every project, have no rows here and list from jobs.
import { index, integer, primaryKey, sqliteTable, text } from "drizzle-orm/sqlite-core";
import type { JobStatus, jobs } from "../schema";

type JobOutcome = (typeof jobs.$inferSelect)["outcome"];

export const memberJobs = sqliteTable(
  "member_jobs",
  {
    // no foreign keys: the triggers add and remove rows with the jobs and memberships they
    // mirror (a removed membership, also one removed by a cascade, removes its rows)
    userId: text("user_id").notNull(),
    jobId: text("job_id").notNull(),
    // copies of the job's columns that the list orders and filters by (kept equal by triggers)
    projectId: text("project_id").notNull(),
    status: text("status").$type<JobStatus>().notNull(),
    outcome: text("outcome").$type<JobOutcome>(),
    createdAt: integer("created_at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [
    // a member's list newest first, and the cursor's (created_at, id) seek, without a sort
    primaryKey({ columns: [t.userId, t.createdAt, t.jobId] }),
    // the same with a status filter (the queue page's tabs, and "review waiting": succeeded
    // runs whose outcome a checker signs off, judged from this index alone)
    index("member_jobs_status_outcome_idx").on(t.userId, t.status, t.createdAt, t.jobId, t.outcome),
    // a job's rows, for the triggers that follow its status or remove it
    index("member_jobs_job_idx").on(t.jobId),
  ],
);
