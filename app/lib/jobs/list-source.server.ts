// Where a job list reads its rows from, for a given caller and filter. An admin's list, and
// any list without a caller, walks jobs by (created_at, id) as it always did. A member's list
// walks their own rows of member_jobs (user, created_at, job), which hold exactly the jobs of
// their projects in list order: a member of 5 projects in 50 reads the 51 jobs of their page,
// not the ~500 a walk of all jobs would pass over (docs/decisions/0023).
// A list of one project or one model stays on jobs' own index for that column and checks the
// membership with one probe per row: every row is of the same project.
import { and, eq, type SQL } from "drizzle-orm";
import type { SQLiteColumn } from "drizzle-orm/sqlite-core";
import { jobs, memberJobs } from "~/db/schema";
import { memberScope, seesEveryProject, type Caller } from "~/lib/project-scope.server";

export interface JobListSource {
  /** walk the caller's member_jobs rows (joined to their jobs) rather than jobs itself */
  memberRows: boolean;
  /** the columns the list orders, pages and filters (status, review state) on, in this source */
  createdAt: SQLiteColumn;
  id: SQLiteColumn;
  status: SQLiteColumn;
  outcome: SQLiteColumn;
  /** the membership condition, if any (for member rows: whose rows, and the join to jobs) */
  scope?: SQL;
}

const ALL_JOBS: JobListSource = { memberRows: false, createdAt: jobs.createdAt, id: jobs.id, status: jobs.status, outcome: jobs.outcome };

export function jobListSource(filter: { visibleTo?: Caller; projectId?: string; modelId?: string }): JobListSource {
  const caller = filter.visibleTo;
  if (!caller || seesEveryProject(caller)) return ALL_JOBS;
  if (filter.projectId || filter.modelId) return { ...ALL_JOBS, scope: memberScope(caller, jobs.projectId) };
  return {
    memberRows: true,
    createdAt: memberJobs.createdAt,
    id: memberJobs.jobId,
    status: memberJobs.status,
    outcome: memberJobs.outcome,
    scope: and(eq(memberJobs.userId, caller.id), eq(jobs.id, memberJobs.jobId)),
  };
}
