// JobView (the queue's contract) → the rows the jobs tables show, with submitter names
// looked up in one query for the whole page.
import { inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { user as users } from "~/db/schema";
import type { JobView } from "~/lib/jobs/queue.server";
import type { JobListRow } from "./JobsList";

export async function toJobRows(jobs: JobView[]): Promise<JobListRow[]> {
  const ids = [...new Set(jobs.map((j) => j.submittedBy).filter((x): x is string => !!x))];
  const names = new Map<string, string>();
  if (ids.length) {
    const rows = await db().select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, ids));
    for (const r of rows) names.set(r.id, r.name || r.email);
  }
  return jobs.map((j) => ({
    id: j.id,
    status: j.status,
    outcome: j.outcome,
    modelName: j.modelName ?? j.modelId,
    modelId: j.modelId,
    projectCode: j.projectCode ?? "",
    submitter: j.submittedBy ? (names.get(j.submittedBy) ?? "former user") : null,
    createdAt: j.createdAt,
    startedAt: j.startedAt,
    finishedAt: j.finishedAt,
    objective: j.summary ? { kind: j.summary.objectiveKind, final: j.summary.objectiveFinal } : null,
    progress: j.progress,
  }));
}
