// Runs side by side (issue 16, item 5): two or more runs of one model (any of its versions),
// each reduced to what an engineer compares — mass, each group's area, the limits that govern,
// the outcome, iterations, the least-mass bound — plus per-member areas and node positions for
// the view coloured by the change in area. Only runs in the caller's projects are found (404).
import { desc, eq, inArray } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { db as defaultDb } from "~/db/client.server";
import { jobs, models, projects, user as users } from "~/db/schema";
import type { TrussResult } from "~/engine/design/result-types";
import { isMember, type SessionUser } from "~/lib/access.server";
import { getJobResult } from "~/lib/jobs/queue.server";
import { latestDecisions } from "~/lib/jobs/review-state.server";
import { notFound } from "~/lib/http.server";
import { constraintKindWords } from "~/engine/design/constraint-words";

/** More runs than this do not fit side by side on a desktop; the page says so. */
export const COMPARE_MAX = 6;

export interface ComparedRun {
  id: string;
  /** "A", "B", …: the column letter, in the order of the address */
  letter: string;
  modelVersion: number | null;
  kind: "design" | "analysis";
  createdAt: string;
  submitter: string | null;
  state: { status: string; outcome: string | null; hasResult: boolean };
  review: string | null;
  objective: { kind: "mass" | "compliance"; initial: number; final: number } | null;
  mass: number | null;
  iterations: number | null;
  maxUtilization: number | null;
  allLimitsMet: boolean | null;
  lowerBound: { value: number; gap: number; basis: string } | null;
  /** active limits counted by kind ("stress": 12), the kinds ordered by count */
  governing: { kind: string; count: number }[];
  /** area per group (a member without a group stands for itself), model units */
  groupAreas: Record<string, number>;
  memberAreas: Record<string, number>;
  nodes: { id: string; x: number; y: number; z: number }[];
}

export interface Comparison {
  model: { id: string; name: string; projectId: string; projectCode: string };
  units: { length: string; force: string; mass: string } | null;
  runs: ComparedRun[];
  /** group keys in a stable order (first run first), with how many members each holds */
  groups: { key: string; members: number; grouped: boolean }[];
}

export type CompareOutcome = { ok: true; comparison: Comparison } | { ok: false; problem: string; runs?: { id: string; modelName: string }[] };

/** "a,b,,c" → ["a","b","c"] without repeats, in order. */
export function parseJobIds(param: string | null): string[] {
  return [...new Set((param ?? "").split(",").map((s) => s.trim()).filter(Boolean))];
}

/** Active limits counted by what they are, in plain words ("stress": 12, "minimum size": 3). */
export function governingKinds(active: { id: string }[]): { kind: string; count: number }[] {
  const counts = new Map<string, number>();
  for (const a of active) {
    const k = constraintKindWords(a.id);
    counts.set(k, (counts.get(k) ?? 0) + 1);
  }
  return [...counts].map(([kind, count]) => ({ kind, count })).sort((a, b) => b.count - a.count || a.kind.localeCompare(b.kind));
}

/** The area each group ends with: the mean over its members (equal within a group after a design run). */
export function groupAreasOf(members: { id: string; group?: string; area: number }[]): Record<string, number> {
  const sums = new Map<string, { sum: number; n: number }>();
  for (const m of members) {
    const key = m.group ?? m.id;
    const s = sums.get(key) ?? { sum: 0, n: 0 };
    s.sum += m.area;
    s.n += 1;
    sums.set(key, s);
  }
  return Object.fromEntries([...sums].map(([k, s]) => [k, s.sum / s.n]));
}

function runOf(letter: string, job: typeof jobs.$inferSelect, result: TrussResult | null, submitter: string | null, review: string | null): ComparedRun {
  const summary = job.summary as { objectiveKind?: "mass" | "compliance"; objectiveInitial?: number; objectiveFinal?: number; iterations?: number; maxUtilization?: number } | null;
  return {
    id: job.id,
    letter,
    modelVersion: job.modelVersion,
    kind: job.kind,
    createdAt: job.createdAt.toISOString(),
    submitter,
    state: { status: job.status, outcome: job.outcome, hasResult: result !== null },
    review,
    objective: result ? result.objective : summary?.objectiveKind && summary.objectiveFinal !== undefined ? { kind: summary.objectiveKind, initial: summary.objectiveInitial ?? NaN, final: summary.objectiveFinal } : null,
    mass: result?.mass ?? (result?.objective.kind === "mass" ? result.objective.final : null),
    iterations: result?.iterations ?? summary?.iterations ?? null,
    maxUtilization: result ? (result.verification?.maxUtilization ?? Math.max(0, ...result.members.map((m) => m.utilization))) : (summary?.maxUtilization ?? null),
    allLimitsMet: result?.verification ? result.verification.allLimitsMet : null,
    lowerBound: result?.lowerBound ? { value: result.lowerBound.value, gap: result.lowerBound.gap, basis: result.lowerBound.basis } : null,
    governing: result ? governingKinds(result.activeConstraints) : [],
    groupAreas: result ? groupAreasOf(result.members) : {},
    memberAreas: result ? Object.fromEntries(result.members.map((m) => [m.id, m.area])) : {},
    nodes: result ? result.nodes.map((n) => ({ id: n.id, x: n.x, y: n.y, z: n.z })) : [],
  };
}

/**
 * The comparison of the runs named, for this caller. A run outside the caller's projects (or
 * unknown) is a 404 naming it, before anything else is said about the list; fewer than two runs,
 * more than COMPARE_MAX, or runs of different models are problems the page explains.
 */
export async function compareRuns(user: SessionUser, ids: string[], database: Db = defaultDb()): Promise<CompareOutcome> {
  const rows = ids.length ? await database.select().from(jobs).where(inArray(jobs.id, ids)) : [];
  const byId = new Map(rows.map((r) => [r.id, r]));
  for (const id of ids) {
    const row = byId.get(id);
    if (!row || !(await isMember(user, row.projectId, database))) notFound(`Job ${id}`);
  }
  if (ids.length < 2) return { ok: false, problem: ids.length === 0 ? "Pick two or more runs of one model to compare them." : "Pick at least one more run of this model: a comparison needs two or more." };
  if (ids.length > COMPARE_MAX) return { ok: false, problem: `Pick at most ${COMPARE_MAX} runs: more do not fit side by side. You picked ${ids.length}.` };
  const ordered = ids.map((id) => byId.get(id)!);
  const modelIds = [...new Set(ordered.map((r) => r.modelId))];
  const modelRows = await database.select({ id: models.id, name: models.name, projectId: models.projectId, summary: models.summary }).from(models).where(inArray(models.id, modelIds));
  const modelOf = new Map(modelRows.map((m) => [m.id, m]));
  if (modelIds.length > 1)
    return {
      ok: false,
      problem: `These runs belong to ${modelIds.length} different models; only runs of one model (or of its versions) can be compared member by member.`,
      runs: ordered.map((r) => ({ id: r.id, modelName: modelOf.get(r.modelId)?.name ?? r.modelId })),
    };
  const model = modelOf.get(modelIds[0]!)!;
  const [proj] = await database.select({ code: projects.code }).from(projects).where(eq(projects.id, model.projectId)).limit(1);
  const submitterIds = [...new Set(ordered.map((r) => r.submittedBy).filter((x): x is string => !!x))];
  const names = new Map(
    submitterIds.length ? (await database.select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, submitterIds))).map((u) => [u.id, u.name || u.email]) : [],
  );
  const [results, decisions] = await Promise.all([Promise.all(ordered.map((r) => getJobResult(r.id, database))), latestDecisions(database, ids)]);
  const runs = ordered.map((r, i) => runOf(String.fromCharCode(65 + i), r, results[i]!, r.submittedBy ? (names.get(r.submittedBy) ?? "former user") : null, decisions.get(r.id) ?? null));
  const groups = new Map<string, { members: number; grouped: boolean }>();
  for (const res of results) {
    if (!res) continue;
    const seen = new Map<string, { members: number; grouped: boolean }>();
    for (const m of res.members) {
      const key = m.group ?? m.id;
      const g = seen.get(key) ?? { members: 0, grouped: m.group !== undefined };
      g.members += 1;
      seen.set(key, g);
    }
    for (const [k, g] of seen) if (!groups.has(k)) groups.set(k, g);
  }
  const units = results.find((r) => r)?.units ?? (model.summary as { units?: Comparison["units"] } | null)?.units ?? null;
  return {
    ok: true,
    comparison: {
      model: { id: model.id, name: model.name, projectId: model.projectId, projectCode: proj?.code ?? "" },
      units,
      runs,
      groups: [...groups].map(([key, g]) => ({ key, ...g })),
    },
  };
}

/** Other finished runs of a model with a result, newest first: the job page's "compare with…" list. */
export async function comparableRuns(modelId: string, exceptJobId: string, database: Db = defaultDb()): Promise<{ id: string; modelVersion: number | null; createdAt: string; outcome: string | null; status: string }[]> {
  const rows = await database
    .select({ id: jobs.id, modelVersion: jobs.modelVersion, createdAt: jobs.createdAt, outcome: jobs.outcome, status: jobs.status, resultKey: jobs.resultKey })
    .from(jobs)
    .where(eq(jobs.modelId, modelId))
    .orderBy(desc(jobs.createdAt))
    .limit(40);
  return rows
    .filter((r) => r.id !== exceptJobId && r.resultKey !== null && (r.status === "succeeded" || r.status === "cancelled"))
    .map((r) => ({ id: r.id, modelVersion: r.modelVersion, createdAt: r.createdAt.toISOString(), outcome: r.outcome, status: r.status }));
}
