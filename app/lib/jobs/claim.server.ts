// The worker's side of the queue. Every write is one guarded statement: a claim is a single
// UPDATE … WHERE id = (SELECT … LIMIT 1) RETURNING, and every later write names the worker
// and the attempt it holds, so a worker whose lease was taken over can no longer write.
import { and, asc, eq, inArray, lt, or, sql } from "drizzle-orm";
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
    eq(jobs.status, "queued"),
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

/**
 * Settle jobs whose worker vanished and that must not run again: cancel those with a pending
 * cancel request, fail those that used every attempt. Returns the ids touched, for mail.
 */
export async function settleAbandonedJobs(database: Db, now = Date.now()): Promise<{ cancelled: string[]; failed: string[] }> {
  const nowDate = new Date(now);
  const expired = and(eq(jobs.status, "running"), lt(jobs.leaseExpiresAt, nowDate));
  const cancelled = await database
    .update(jobs)
    .set({ status: "cancelled", finishedAt: nowDate, leaseExpiresAt: null, error: "Cancelled on request (its worker had stopped)" })
    .where(and(expired, eq(jobs.cancelRequested, true)))
    .returning({ id: jobs.id });
  const failed = await database
    .update(jobs)
    .set({
      status: "failed",
      finishedAt: nowDate,
      leaseExpiresAt: null,
      error: sql`'The worker running this job stopped responding on each of ' || ${jobs.attempts} || ' attempts (last: ' || coalesce(${jobs.workerId}, 'unknown worker') || '); it was given up. A run that keeps taking its worker down usually ran out of memory: try a smaller model or fewer iterations.'`,
    })
    .where(and(expired, eq(jobs.cancelRequested, false), sql`${jobs.attempts} >= ${jobs.maxAttempts}`))
    .returning({ id: jobs.id });
  return { cancelled: cancelled.map((r) => r.id), failed: failed.map((r) => r.id) };
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

export async function completeJob(
  database: Db,
  lease: Lease,
  done: { resultKey: string; summary: JobSummary; outcome: JobSummary["status"] },
  now = Date.now(),
): Promise<boolean> {
  const rows = await database
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
  return rows.length === 1;
}

export async function failJob(database: Db, lease: Lease, message: string, now = Date.now()): Promise<boolean> {
  const rows = await database
    .update(jobs)
    .set({ status: "failed", error: message, finishedAt: new Date(now), leaseExpiresAt: null })
    .where(and(held(lease), guard("fail")))
    .returning({ id: jobs.id });
  return rows.length === 1;
}

export async function markCancelled(database: Db, lease: Lease, message: string, now = Date.now()): Promise<boolean> {
  const rows = await database
    .update(jobs)
    .set({ status: "cancelled", error: message, finishedAt: new Date(now), leaseExpiresAt: null })
    .where(and(held(lease), guard("cancel")))
    .returning({ id: jobs.id });
  return rows.length === 1;
}

/** Hand a job back on shutdown without spending one of its attempts. */
export async function requeueJob(database: Db, lease: Lease): Promise<boolean> {
  const rows = await database
    .update(jobs)
    .set({
      status: "queued",
      attempts: sql`max(${jobs.attempts} - 1, 0)`,
      workerId: null,
      leaseExpiresAt: null,
      startedAt: null,
    })
    .where(and(held(lease), guard("requeue")))
    .returning({ id: jobs.id });
  return rows.length === 1;
}
