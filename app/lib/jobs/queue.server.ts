// The queue as the routes and pages see it: submit, list, read, cancel, fetch the result.
// The worker's side (claim, lease, finish) lives in claim.server.ts.
import type { ReviewFilter } from "~/lib/job-state";
import { reviewStateCondition } from "./review-state.server";
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, inArray, lt, or, type SQL } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { jobProgress, jobs, memberJobs, models, projects, type JobStatus } from "~/db/schema";
import { jobOptionsSchema, type JobOptions } from "~/engine/design/options";
import type { HistoryEntry, JobSummary, TrussResult } from "~/engine/design/result-types";
import { config } from "~/lib/config.server";
import { jsonError } from "~/lib/http.server";
import { getModelVersion } from "~/lib/models/versions.server";
import { seesEveryProject } from "~/lib/project-scope.server";
import { getText, getObjectStream } from "~/lib/storage.server";
import { jobListSource, type JobListSource } from "./list-source.server";
import { fromStatuses, isTerminal } from "./transitions";

export type JobRow = typeof jobs.$inferSelect;

export interface JobProgressView {
  iteration: number;
  objective: number | null;
  maxViolation: number | null;
  kktResidual: number | null;
  at: string | null;
}

export interface JobView {
  id: string;
  projectId: string;
  projectCode: string | null;
  modelId: string;
  modelName: string | null;
  /** the model version the job runs (null only for jobs older than versions) */
  modelVersion: number | null;
  /** design: an optimization; analysis: the model as given */
  kind: "design" | "analysis";
  submittedBy: string | null;
  status: JobStatus;
  outcome: JobRow["outcome"];
  options: JobOptions;
  attempts: number;
  maxAttempts: number;
  cancelRequested: boolean;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  error: string | null;
  summary: JobSummary | null;
  progress: JobProgressView | null;
  hasResult: boolean;
  /** set while a queued job waits for a service that did not answer ("storage") */
  waitingFor: string | null;
  /** the returned run ("changes requested") this run answers */
  answersJobId: string | null;
}

export interface Actor {
  id: string;
  /** shown in the cancel note of the job; the id stands in without it */
  name?: string;
  role?: string;
  /** may cancel other people's jobs (permission cancel:job:any); admins by default */
  canCancelAny?: boolean;
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toJobView(r: JobRow, extra: { modelName?: string | null; projectCode?: string | null } = {}): JobView {
  return {
    id: r.id,
    projectId: r.projectId,
    projectCode: extra.projectCode ?? null,
    modelId: r.modelId,
    modelName: extra.modelName ?? null,
    modelVersion: r.modelVersion,
    kind: r.kind,
    submittedBy: r.submittedBy,
    status: r.status,
    outcome: r.outcome,
    options: (r.options as JobOptions) ?? {},
    attempts: r.attempts,
    maxAttempts: r.maxAttempts,
    cancelRequested: r.cancelRequested,
    createdAt: r.createdAt.toISOString(),
    startedAt: iso(r.startedAt),
    finishedAt: iso(r.finishedAt),
    error: r.error,
    summary: (r.summary as JobSummary | null) ?? null,
    progress:
      r.progressIteration === null
        ? null
        : {
            iteration: r.progressIteration,
            objective: r.progressObjective,
            maxViolation: r.progressMaxViolation,
            kktResidual: r.progressKktResidual,
            at: iso(r.progressAt),
          },
    // a run stopped on request keeps its best design so far (stored by the worker)
    hasResult: (r.status === "succeeded" || r.status === "cancelled") && r.resultKey !== null,
    waitingFor: r.status === "queued" ? r.waitingFor : null,
    answersJobId: r.answersJobId ?? null,
  };
}

/**
 * Queue a run of a stored model's version (the latest without one): an optimization, or with
 * kind "analysis" an analysis of the model as given. Throws a 400/404 Response for a bad request.
 */
export async function enqueueJob(
  input: { modelId: string; version?: number | null; kind?: "design" | "analysis"; options?: unknown; user: Actor | null; answers?: string | null },
  database: Db = defaultDb(),
): Promise<JobView> {
  const parsed = jobOptionsSchema.safeParse(input.options ?? {});
  if (!parsed.success) {
    throw jsonError(
      400,
      "The job options are not valid",
      parsed.error.issues.map((i) => ({ path: ["options", ...i.path].map(String).join("."), message: i.message })),
    );
  }
  const kind = input.kind ?? "design";
  const [model] = await database
    .select({ id: models.id, projectId: models.projectId, name: models.name, hasDesign: models.hasDesign })
    .from(models)
    .where(eq(models.id, input.modelId))
    .limit(1);
  if (!model) throw jsonError(404, `Model ${input.modelId} not found`, [{ path: "modelId", message: "no such model" }]);
  // a model row without version rows (put in place by hand, never uploaded) runs its own file
  const version =
    (await getModelVersion(model.id, input.version ?? null, database)) ??
    (input.version == null ? { version: null, name: model.name, hasDesign: model.hasDesign } : null);
  if (!version) {
    throw jsonError(404, `Model ${input.modelId} has no version ${input.version}`, [{ path: "version", message: "no such version of this model" }]);
  }
  if (kind === "design" && !version.hasDesign) {
    throw jsonError(
      400,
      `${version.version === null ? "Model" : `Version ${version.version} of model`} "${version.name}" has no design block, so there is nothing to optimize; add one in the editor (docs/model-format.md), or queue an analysis`,
      [{ path: "modelId", message: "the model has no design block" }],
    );
  }
  if (input.answers) {
    const [answered] = await database.select({ modelId: jobs.modelId }).from(jobs).where(eq(jobs.id, input.answers)).limit(1);
    if (!answered || answered.modelId !== model.id)
      throw jsonError(400, `Run ${input.answers} is not a run of model "${model.name}", so this run cannot answer it`, [{ path: "answers", message: "not a run of this model" }]);
  }
  const [row] = await database
    .insert(jobs)
    .values({
      answersJobId: input.answers || null,
      id: randomUUID(),
      projectId: model.projectId,
      modelId: model.id,
      modelVersion: version.version,
      kind,
      submittedBy: input.user?.id ?? null,
      status: "queued",
      options: parsed.data,
      maxAttempts: config().JOB_MAX_ATTEMPTS,
    })
    .returning();
  clearJobListCache();
  return toJobView(row!, { modelName: version.name });
}

async function selectJobs(where: SQL | undefined, database: Db, limit?: number, source: JobListSource = jobListSource({})) {
  const select = database.select({ job: jobs, modelName: models.name, projectCode: projects.code });
  // a CROSS JOIN keeps its order in SQLite: the walk is the member's rows, each joined to its job
  const from = source.memberRows ? select.from(memberJobs).crossJoin(jobs).$dynamic() : select.from(jobs).$dynamic();
  const q = from
    .leftJoin(models, eq(models.id, jobs.modelId))
    .leftJoin(projects, eq(projects.id, jobs.projectId))
    .where(where)
    .orderBy(desc(source.createdAt), desc(source.id));
  const rows = limit === undefined ? await q : await q.limit(limit);
  return rows.map((r) => toJobView(r.job, r));
}

export async function getJob(id: string, database: Db = defaultDb()): Promise<JobView | null> {
  const [view] = await selectJobs(eq(jobs.id, id), database, 1);
  return view ?? null;
}

export const LIST_LIMIT_DEFAULT = 50;
export const LIST_LIMIT_MAX = 200;

export interface ListJobsFilter {
  status?: JobStatus | JobStatus[];
  projectId?: string;
  modelId?: string;
  submittedBy?: string;
  /** only jobs of projects this caller belongs to (admins: all); routes always pass it */
  visibleTo?: { id: string; role: string };
  /** review state in force (app/lib/jobs/review-state.server.ts) */
  review?: ReviewFilter;
  limit?: number;
  cursor?: string | null;
}

// The cursor is the (created_at, id) of the last job on the page: stable under inserts.
function encodeCursor(j: JobView): string {
  return Buffer.from(`${Date.parse(j.createdAt)}:${j.id}`).toString("base64url");
}

export function decodeCursor(cursor: string): { at: Date; id: string } | null {
  // a cursor is base64url of "<ms>:<job id>"; anything else (other alphabets, a time beyond
  // what a Date holds, a control character) is not one of ours
  if (cursor.length > 200 || !/^[A-Za-z0-9_-]+$/.test(cursor)) return null;
  const text = Buffer.from(cursor, "base64url").toString("utf8");
  const m = /^(\d{1,15}):([\w-]{1,100})$/.exec(text);
  if (!m) return null;
  const at = new Date(Number(m[1]));
  return Number.isFinite(at.getTime()) ? { at, id: m[2]! } : null;
}

export interface JobPage {
  jobs: JobView[];
  nextCursor: string | null;
}

// Pages poll the list every second or two, often many at once. Identical list queries share
// one database read for LIST_CACHE_MS: a burst of 50 callers costs one query, and a list is
// at most that much older than the rows (writes made in this process clear it at once).
const LIST_CACHE_MS = 250;
interface ListEntry {
  at: number;
  database: Db;
  page: Promise<JobPage>;
  json?: Promise<string>;
}
const listCache = new Map<string, ListEntry>();

export function clearJobListCache(): void {
  listCache.clear();
}

function listEntry(filter: ListJobsFilter, database: Db, fresh: boolean): ListEntry {
  const scope = filter.visibleTo && (seesEveryProject(filter.visibleTo) ? "all" : filter.visibleTo.id);
  const key = JSON.stringify([filter.status, filter.projectId, filter.modelId, filter.submittedBy, scope, filter.review, filter.limit, filter.cursor]);
  const now = Date.now();
  const hit = listCache.get(key);
  if (!fresh && hit && hit.database === database && now - hit.at < LIST_CACHE_MS) return hit;
  const entry: ListEntry = { at: now, database, page: readJobPage(filter, database) };
  if (listCache.size > 200) listCache.clear();
  listCache.set(key, entry);
  entry.page.catch(() => listCache.get(key) === entry && listCache.delete(key));
  return entry;
}

/**
 * Newest first; `nextCursor` is null on the last page. Throws a 400 Response for a bad cursor.
 * `fresh` skips the shared short-lived copy (for callers that just wrote).
 */
export function listJobs(filter: ListJobsFilter = {}, database: Db = defaultDb(), opts: { fresh?: boolean } = {}): Promise<JobPage> {
  return listEntry(filter, database, opts.fresh ?? false).page;
}

/** listJobs as the JSON text of the API answer, serialized once per shared page. */
export function listJobsJson(filter: ListJobsFilter = {}, database: Db = defaultDb()): Promise<string> {
  const entry = listEntry(filter, database, false);
  entry.json ??= entry.page.then((p) => JSON.stringify(p));
  return entry.json;
}

async function readJobPage(filter: ListJobsFilter, database: Db): Promise<JobPage> {
  const limit = Math.min(Math.max(1, Math.floor(filter.limit ?? LIST_LIMIT_DEFAULT)), LIST_LIMIT_MAX);
  const source = jobListSource(filter);
  const where: SQL[] = [];
  if (filter.status) {
    const list = Array.isArray(filter.status) ? filter.status : [filter.status];
    where.push(inArray(source.status, list));
  }
  if (filter.projectId) where.push(eq(jobs.projectId, filter.projectId));
  if (filter.modelId) where.push(eq(jobs.modelId, filter.modelId));
  if (filter.submittedBy) where.push(eq(jobs.submittedBy, filter.submittedBy));
  if (source.scope) where.push(source.scope);
  if (filter.review) where.push(reviewStateCondition(filter.review, source));
  if (filter.cursor) {
    const c = decodeCursor(filter.cursor);
    if (!c) throw jsonError(400, "The cursor is not one this server handed out", [{ path: "cursor", message: "unreadable cursor" }]);
    where.push(or(lt(source.createdAt, c.at), and(eq(source.createdAt, c.at), lt(source.id, c.id)))!);
  }
  const page = await selectJobs(where.length ? and(...where) : undefined, database, limit + 1, source);
  const more = page.length > limit;
  const list = more ? page.slice(0, limit) : page;
  return { jobs: list, nextCursor: more ? encodeCursor(list[list.length - 1]!) : null };
}

/**
 * Cancel a job: a queued one at once, a running one by asking its worker (which stops the
 * task within about a second and records "cancelled"). Only the submitter or an admin may.
 * Throws 404 / 403 / 409 Responses.
 */
export async function cancelJob(id: string, user: Actor | null, database: Db = defaultDb()): Promise<JobView> {
  const job = await getJob(id, database);
  if (!job) throw jsonError(404, `Job ${id} not found`);
  if (user && !(user.canCancelAny ?? user.role === "admin") && job.submittedBy !== user.id) {
    throw jsonError(403, "Only the engineer who submitted this job, or an admin, may cancel it");
  }
  if (isTerminal(job.status)) throw jsonError(409, `Job ${id} has already ${job.status === "cancelled" ? "been cancelled" : job.status}; there is nothing to cancel`);

  const now = new Date();
  const queued = await database
    .update(jobs)
    .set({ status: "cancelled", cancelRequested: true, finishedAt: now, error: cancelMessage(user) })
    .where(and(eq(jobs.id, id), eq(jobs.status, "queued")))
    .returning({ id: jobs.id });
  if (queued.length === 0) {
    await database
      .update(jobs)
      .set({ cancelRequested: true })
      .where(and(eq(jobs.id, id), inArray(jobs.status, fromStatuses("cancel") as JobStatus[])));
  }
  clearJobListCache();
  return (await getJob(id, database))!;
}

export function cancelMessage(user: Actor | null): string {
  if (!user) return "Cancelled on request";
  return `Cancelled on request by ${user.name || `user ${user.id}`}${user.role ? ` (${user.role})` : ""}`;
}

/** The result JSON of a succeeded job; null while there is none. */
export async function getJobResult(id: string, database: Db = defaultDb()): Promise<TrussResult | null> {
  const text = await getJobResultText(id, database);
  return text === null ? null : (JSON.parse(text) as TrussResult);
}

async function storedResultKey(id: string, database: Db): Promise<string | null> {
  const [row] = await database.select({ status: jobs.status, resultKey: jobs.resultKey }).from(jobs).where(eq(jobs.id, id)).limit(1);
  if (!row || (row.status !== "succeeded" && row.status !== "cancelled") || !row.resultKey) return null;
  return row.resultKey;
}

/** The stored result as text. */
export async function getJobResultText(id: string, database: Db = defaultDb()): Promise<string | null> {
  const key = await storedResultKey(id, database);
  return key === null ? null : getText(key);
}

/** The stored result as a stream, for downloads that pass it through unchanged. */
export async function getJobResultStream(id: string, database: Db = defaultDb()) {
  const key = await storedResultKey(id, database);
  return key === null ? null : getObjectStream(key);
}

/** The convergence history of the job's latest attempt, oldest iteration first. */
export async function getJobHistory(id: string, database: Db = defaultDb()): Promise<HistoryEntry[]> {
  const [row] = await database.select({ attempts: jobs.attempts }).from(jobs).where(eq(jobs.id, id)).limit(1);
  if (!row || row.attempts === 0) return [];
  const rows = await database
    .select()
    .from(jobProgress)
    .where(and(eq(jobProgress.jobId, id), eq(jobProgress.attempt, row.attempts)))
    .orderBy(asc(jobProgress.iteration));
  return rows.map((r) => ({
    iteration: r.iteration,
    objective: r.objective ?? Number.NaN,
    maxViolation: r.maxViolation ?? Number.NaN,
    kktResidual: r.kktResidual ?? Number.NaN,
  }));
}
