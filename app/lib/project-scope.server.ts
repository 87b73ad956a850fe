// Which projects a caller sees, as SQL: kept apart from access.server.ts (which needs the auth
// instance) so that list queries in app/lib can filter without pulling better-auth in.
import { sql, type SQL, type SQLWrapper } from "drizzle-orm";
import type { SQLiteColumn } from "drizzle-orm/sqlite-core";
import { projectMembers } from "~/db/schema";

export interface Caller {
  id: string;
  role: string;
}

/** Admins are members of every project. */
export function seesEveryProject(user: Caller): boolean {
  return user.role === "admin";
}

/**
 * A WHERE condition keeping only rows whose project column names a project the caller belongs
 * to; undefined (no filter) for admins. A correlated EXISTS on project_members' primary key
 * (project_id, user_id): a newest-first list keeps walking its own index and probes one
 * membership row per candidate.
 */
export function memberScope(user: Caller, projectColumn: SQLiteColumn | SQLWrapper): SQL | undefined {
  if (seesEveryProject(user)) return undefined;
  return sql`exists (select 1 from ${projectMembers} where ${projectMembers.projectId} = ${projectColumn} and ${projectMembers.userId} = ${user.id})`;
}

/** A WHERE condition on the user table: the account is a member of the project of this job. */
export function memberOfJobProject(userIdColumn: SQLiteColumn | SQLWrapper, jobId: string): SQL {
  return sql`exists (select 1 from ${projectMembers} join "jobs" on "jobs"."project_id" = ${projectMembers.projectId} where "jobs"."id" = ${jobId} and ${projectMembers.userId} = ${userIdColumn})`;
}
