// Solver progress to the database at a throttled rate: every iteration is kept for the
// convergence plot, but they are written in batches at most `maxPerSecond` times a second,
// together with the latest figures on the job row that the pages poll.
import { and, eq } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { jobProgress, jobs } from "~/db/schema";
import type { Lease } from "./claim.server";

export interface ProgressPoint {
  iteration: number;
  objective: number;
  maxViolation: number;
  kktResidual: number;
}

const finiteOrNull = (v: number) => (Number.isFinite(v) ? v : null);

export class ProgressRecorder {
  private pending: ProgressPoint[] = [];
  private lastWrite = 0;
  private chain: Promise<void> = Promise.resolve();
  private timer: NodeJS.Timeout | null = null;
  private closed = false;
  /** database writes made, for tests and the benchmark */
  writes = 0;

  constructor(
    private readonly database: Db,
    private readonly lease: Lease,
    private readonly maxPerSecond = 4,
  ) {}

  /** Drop what an earlier run of the same attempt number left (a requeue reuses it). */
  async reset(): Promise<void> {
    await this.database.delete(jobProgress).where(and(eq(jobProgress.jobId, this.lease.job.id), eq(jobProgress.attempt, this.lease.attempt)));
  }

  push(p: ProgressPoint): void {
    if (this.closed) return;
    this.pending.push(p);
    const gap = 1000 / this.maxPerSecond;
    const wait = this.lastWrite + gap - Date.now();
    if (wait <= 0) this.flush();
    else this.timer ??= setTimeout(() => this.flush(), wait);
  }

  private flush(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    if (this.pending.length === 0) return;
    const batch = this.pending;
    this.pending = [];
    this.lastWrite = Date.now();
    this.chain = this.chain.then(() => this.write(batch)).catch((e) => console.error(`[queue] progress of job ${this.lease.job.id} not saved: ${(e as Error).message}`));
  }

  private async write(batch: ProgressPoint[]): Promise<void> {
    const at = new Date();
    const last = batch[batch.length - 1]!;
    this.writes++;
    const rows = batch.map((p) => ({
      jobId: this.lease.job.id,
      attempt: this.lease.attempt,
      iteration: p.iteration,
      objective: finiteOrNull(p.objective),
      maxViolation: finiteOrNull(p.maxViolation),
      kktResidual: finiteOrNull(p.kktResidual),
      at,
    }));
    // chunks keep each statement well under SQLite's bound-variable limit
    const inserts = [];
    for (let i = 0; i < rows.length; i += 500) {
      inserts.push(this.database.insert(jobProgress).values(rows.slice(i, i + 500)).onConflictDoNothing());
    }
    await this.database.batch([
      ...inserts,
      this.database
        .update(jobs)
        .set({
          progressIteration: last.iteration,
          progressObjective: finiteOrNull(last.objective),
          progressMaxViolation: finiteOrNull(last.maxViolation),
          progressKktResidual: finiteOrNull(last.kktResidual),
          progressAt: at,
        })
        .where(and(eq(jobs.id, this.lease.job.id), eq(jobs.workerId, this.lease.workerId), eq(jobs.attempts, this.lease.attempt))),
    ] as unknown as Parameters<Db["batch"]>[0]);
  }

  /** Write what is pending and wait for every write to land. */
  async close(): Promise<void> {
    this.flush();
    this.closed = true;
    await this.chain;
  }
}
