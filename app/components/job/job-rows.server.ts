// JobView (the queue's contract) → the rows the jobs tables show, with submitter names
// looked up in one query for the whole page.
import { inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { models, user as users } from "~/db/schema";
import { latestDecisions } from "~/lib/jobs/review-state.server";
import type { JobView } from "~/lib/jobs/queue.server";
import type { JobListRow } from "./JobsList";

export async function toJobRows(jobs: JobView[]): Promise<JobListRow[]> {
  const ids = [...new Set(jobs.map((j) => j.submittedBy).filter((x): x is string => !!x))];
  const names = new Map<string, string>();
  if (ids.length) {
    const rows = await db().select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, ids));
    for (const r of rows) names.set(r.id, r.name || r.email);
  }
  const modelIds = [...new Set(jobs.map((j) => j.modelId))];
  const [decisions, unitRows] = await Promise.all([
    latestDecisions(db(), jobs.map((j) => j.id)),
    modelIds.length ? db().select({ id: models.id, summary: models.summary }).from(models).where(inArray(models.id, modelIds)) : Promise.resolve([]),
  ]);
  const unitsOf = new Map(unitRows.map((m) => [m.id, (m.summary as { units?: { length: string; force: string; mass: string } } | null)?.units]));
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
    gap: j.summary?.lowerBoundGap ?? null,
    progress: j.progress,
    hasResult: j.hasResult,
    waitingFor: j.waitingFor,
    review: decisions.get(j.id) ?? null,
    units: unitsOf.get(j.modelId) ?? null,
  }));
}
