// The worker's side of the queue. Every write is one guarded statement: a claim is a single
// UPDATE … WHERE id = (SELECT … LIMIT 1) RETURNING, and every later write names the worker
// and the attempt it holds, so a worker whose lease was taken over can no longer write.
import { and, asc, eq, inArray, isNull, lt, lte, or, sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { jobs, type JobStatus } from "~/db/schema";
import type { JobSummary } from "~/engine/design/result-types";
import type { JobRow } from "./queue.server";
import { fromStatuses, type JobEvent } from "./transitions";

const guard = (event: JobEvent) => inArray(jobs.status, fromStatuses(event) as JobStatus[]);

/** What a worker holds while it runs a job: the row as claimed, and its fencing token. */
export interface Lease {
  job: JobRow;
  workerId: string;
  attempt: number;
}

function held(lease: Lease) {
  return and(eq(jobs.id, lease.job.id), eq(jobs.workerId, lease.workerId), eq(jobs.attempts, lease.attempt), eq(jobs.status, "running"));
}

/**
 * Take the oldest claimable job: a queued one, or a running one whose lease ran out (its
 * worker died) and that has attempts left. Atomic in SQLite and in a libSQL server alike:
 * the sub-select and the update are one statement under the write lock.
 */
export async function claimNextJob(database: Db, workerId: string, leaseMs: number, now = Date.now()): Promise<Lease | null> {
  const nowDate = new Date(now);
  const claimable = or(
    and(eq(jobs.status, "queued"), or(isNull(jobs.availableAt), lte(jobs.availableAt, nowDate))),
    and(
      eq(jobs.status, "running"),
      lt(jobs.leaseExpiresAt, nowDate),
      eq(jobs.cancelRequested, false),
      lt(jobs.attempts, jobs.maxAttempts),
    ),
  );
  const next = database.select({ id: jobs.id }).from(jobs).where(claimable).orderBy(asc(jobs.createdAt), asc(jobs.id)).limit(1);
  const rows = await database
    .update(jobs)
    .set({
      status: "running",
      attempts: sql`${jobs.attempts} + 1`,
      workerId,
      leaseExpiresAt: new Date(now + leaseMs),
      startedAt: nowDate,
      error: null,
      waitingFor: null,
      availableAt: null,
      progressIteration: null,
      progressObjective: null,
      progressMaxViolation: null,
      progressKktResidual: null,
      progressAt: null,
    })
    .where(and(eq(jobs.id, sql`(${next})`), claimable))
    .returning();
  const job = rows[0];
  return job ? { job, workerId, attempt: job.attempts } : null;
}

const expiredAt = (nowDate: Date) => and(eq(jobs.status, "running"), lt(jobs.leaseExpiresAt, nowDate));

/** Cancel the jobs whose worker vanished while a cancel request was pending. Returns their ids. */
export async function cancelAbandonedJobs(database: Db, now = Date.now()): Promise<string[]> {
  const nowDate = new Date(now);
  const rows = await database
    .update(jobs)
    .set({ status: "cancelled", finishedAt: nowDate, leaseExpiresAt: null, error: "Cancelled on request (its worker had stopped)" })
    .where(and(expiredAt(nowDate), eq(jobs.cancelRequested, true)))
    .returning({ id: jobs.id });
  return rows.map((r) => r.id);
}

/** Jobs whose worker vanished on their last attempt: they must not run again. */
export async function exhaustedJobs(database: Db, now = Date.now()): Promise<{ id: string; attempts: number; workerId: string | null }[]> {
  return database
    .select({ id: jobs.id, attempts: jobs.attempts, workerId: jobs.workerId })
    .from(jobs)
    .where(and(expiredAt(new Date(now)), eq(jobs.cancelRequested, false), sql`${jobs.attempts} >= ${jobs.maxAttempts}`));
}

export function exhaustedMessage(j: { attempts: number; workerId: string | null }): string {
  return `The worker running this job stopped responding on each of ${j.attempts} attempts (last: ${j.workerId ?? "unknown worker"}); it was given up. A run that keeps taking its worker down usually ran out of memory: try a smaller model or fewer iterations.`;
}

/** The statement that fails one exhausted job (still expired and unclaimed when it runs). */
export function failExhaustedStatement(database: Db, j: { id: string; attempts: number; workerId: string | null }, now = Date.now()) {
  const nowDate = new Date(now);
  return database
    .update(jobs)
    .set({ status: "failed", finishedAt: nowDate, leaseExpiresAt: null, error: exhaustedMessage(j) })
    .where(and(eq(jobs.id, j.id), expiredAt(nowDate), eq(jobs.cancelRequested, false), eq(jobs.attempts, j.attempts), sql`${jobs.attempts} >= ${jobs.maxAttempts}`))
    .returning({ id: jobs.id });
}

/** Extend the lease; false when the worker no longer holds the job (taken over or settled). */
export async function renewLease(database: Db, lease: Lease, leaseMs: number, now = Date.now()): Promise<boolean> {
  const rows = await database
    .update(jobs)
    .set({ leaseExpiresAt: new Date(now + leaseMs) })
    .where(held(lease))
    .returning({ id: jobs.id });
  return rows.length === 1;
}

/** Whether someone asked to cancel the job, and whether this worker still holds it. */
export async function checkJob(database: Db, lease: Lease): Promise<{ held: boolean; cancelRequested: boolean }> {
  const [row] = await database
    .select({ status: jobs.status, workerId: jobs.workerId, attempts: jobs.attempts, cancelRequested: jobs.cancelRequested })
    .from(jobs)
    .where(eq(jobs.id, lease.job.id))
    .limit(1);
  if (!row) return { held: false, cancelRequested: true };
  return {
    held: row.status === "running" && row.workerId === lease.workerId && row.attempts === lease.attempt,
    cancelRequested: row.cancelRequested,
  };
}

/** The statement that records a held job's success (returns its id when it applied). */
export function completeJobStatement(database: Db, lease: Lease, done: { resultKey: string; summary: JobSummary; outcome: JobSummary["status"] }, now = Date.now()) {
  return database
    .update(jobs)
    .set({
      status: "succeeded",
      outcome: done.outcome,
      resultKey: done.resultKey,
      summary: done.summary,
      finishedAt: new Date(now),
      leaseExpiresAt: null,
      error: null,
    })
    .where(and(held(lease), guard("succeed")))
    .returning({ id: jobs.id });
}

/** The statement that records a held job's failure (returns its id when it applied). */
export function failJobStatement(database: Db, lease: Lease, message: string, now = Date.now()) {
  return database
    .update(jobs)
    .set({ status: "failed", error: message, finishedAt: new Date(now), leaseExpiresAt: null })
    .where(and(held(lease), guard("fail")))
    .returning({ id: jobs.id });
}

/**
 * An SQL condition true once the job's row shows the end this worker recorded at `now`:
 * the mails of that end are written only if the guarded write before them applied.
 */
export function recordedBy(lease: Lease, status: "succeeded" | "failed", now: number) {
  return sql`exists (select 1 from ${jobs} where ${jobs.id} = ${lease.job.id} and ${jobs.status} = ${status} and ${jobs.workerId} = ${lease.workerId} and ${jobs.attempts} = ${lease.attempt} and ${jobs.finishedAt} = ${now})`;
}

export async function markCancelled(
  database: Db,
  lease: Lease,
  message: string,
  now = Date.now(),
  /** the best design the solver handed back when asked to stop, already stored */
  kept?: { resultKey: string; summary: JobSummary },
): Promise<boolean> {
  const rows = await database
    .update(jobs)
    .set({ status: "cancelled", error: message, finishedAt: new Date(now), leaseExpiresAt: null, ...(kept ? { resultKey: kept.resultKey, summary: kept.summary, outcome: kept.summary.status === "analysed" ? null : kept.summary.status } : {}) })
    .where(and(held(lease), guard("cancel")))
    .returning({ id: jobs.id });
  return rows.length === 1;
}

/**
 * Hand a job back without spending one of its attempts: on shutdown, or (with `waiting`) when
 * a service it needs did not answer; then no worker takes it again before `until`.
 */
export async function requeueJob(database: Db, lease: Lease, waiting?: { for: "storage"; until: Date }): Promise<boolean> {
  const rows = await database
    .update(jobs)
    .set({
      status: "queued",
      attempts: sql`max(${jobs.attempts} - 1, 0)`,
      workerId: null,
      leaseExpiresAt: null,
      startedAt: null,
      waitingFor: waiting?.for ?? null,
      availableAt: waiting?.until ?? null,
    })
    .where(and(held(lease), guard("requeue")))
    .returning({ id: jobs.id });
  return rows.length === 1;
}
