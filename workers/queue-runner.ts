// The queue worker's loop: claim jobs while pool threads are free, run each one on the pool,
// keep its lease alive, watch for cancel requests, store the result, record the outcome.
// The process entry (queue-worker.ts) adds signals; tests and the benchmark use this directly.
import { and, eq } from "drizzle-orm";
import { randomBytes } from "node:crypto";
import os from "node:os";
import { MessageChannel } from "node:worker_threads";
import type { Piscina } from "piscina";
import type { Db } from "~/db/client.server";
import { models, modelVersions } from "~/db/schema";
import { summarizeResult } from "~/engine/design";
import type { JobOptions } from "~/engine/design/options";
import type { JobSummary, TrussResult } from "~/engine/design/result-types";
import { checkJob, claimNextJob, markCancelled, renewLease, requeueJob, type Lease } from "~/lib/jobs/claim.server";
import { DependencyUnavailableError } from "~/lib/dependencies";
import { recordFailure, recordSuccess, settleAbandoned } from "~/lib/jobs/outcome.server";
import { backoffDelay } from "~/lib/mail/backoff";
import { describeTaskError, solverFailureMessage, timeLimitMessage } from "~/lib/jobs/failure-messages";
import { jobResultKey } from "~/lib/jobs/keys";
import { ProgressRecorder, type ProgressPoint } from "~/lib/jobs/progress.server";
import { designWorthReview } from "~/lib/review-request";
import { getText, putObject } from "~/lib/storage.server";
import type { PROGRESS_END, SolveTaskInput, SolveTaskOutput } from "./solve-task";

type StopReason = "cancel" | "time" | "lost" | "shutdown";

export interface RunnerOptions {
  db: Db;
  pool: Piscina;
  workerId?: string;
  /** jobs at once; the pool's thread count by default */
  concurrency?: number;
  leaseMs: number;
  timeLimitMs: number;
  /** for the memory-limit message */
  maxOldGenerationMb: number;
  /** how often a running job checks for a cancel request */
  cancelPollMs?: number;
  /** how long an idle worker waits before looking for work again */
  idlePollMs?: number;
  /** e-mail the submitter / checkers (off in the benchmark): mails are queued in the outbox */
  notify?: boolean;
  /** the outbox sender of this process, told to look when a job's mails were queued */
  mailSender?: { kick(): void };
  /** how long a job waits in the queue after storage did not answer (with jitter) */
  storageWaitMs?: number;
  log?: (line: string) => void;
}

export interface RunnerStats {
  claimed: number;
  succeeded: number;
  failed: number;
  cancelled: number;
  requeued: number;
  lost: number;
  /** handed back because storage did not answer (no attempt spent) */
  waitedForStorage: number;
}

interface Active {
  lease: Lease;
  stop(reason: StopReason): void;
  done: Promise<void>;
  /** false once the solve is over and the job only stores and records its result */
  onThread: boolean;
}

export function newWorkerId(): string {
  return `${os.hostname()}:${process.pid}:${randomBytes(3).toString("hex")}`;
}

export class QueueRunner {
  readonly workerId: string;
  readonly stats: RunnerStats = { claimed: 0, succeeded: 0, failed: 0, cancelled: 0, requeued: 0, lost: 0, waitedForStorage: 0 };
  private readonly active = new Map<string, Active>();
  private stopping = false;
  private wake: (() => void) | null = null;
  private loopDone: Promise<void> | null = null;
  private lastSettle = 0;
  private readonly log: (line: string) => void;

  constructor(private readonly o: RunnerOptions) {
    this.workerId = o.workerId ?? newWorkerId();
    this.log = o.log ?? ((line) => console.log(`[worker ${this.workerId}] ${line}`));
  }

  get concurrency(): number {
    return this.o.concurrency ?? this.o.pool.options.maxThreads;
  }

  get runningJobs(): string[] {
    return [...this.active.keys()];
  }

  /**
   * Room for another job: a thread free, and not too many finished jobs still storing their
   * results. A job whose result waits for the object store to come back holds no thread, so
   * the queue goes on being served meanwhile (and its jobs say they wait for storage).
   */
  private get hasRoom(): boolean {
    const onThreads = [...this.active.values()].filter((a) => a.onThread).length;
    return onThreads < this.concurrency && this.active.size < this.concurrency * 3;
  }

  start(): void {
    this.loopDone ??= this.loop();
  }

  /**
   * Stop claiming; give running jobs `graceMs` to finish, then stop them and hand them back
   * to the queue (without spending an attempt).
   */
  async stop(graceMs = 0): Promise<void> {
    this.stopping = true;
    this.wake?.();
    await this.loopDone;
    const all = () => Promise.all([...this.active.values()].map((a) => a.done));
    if (this.active.size > 0 && graceMs > 0) {
      this.log(`stopping: waiting up to ${Math.round(graceMs / 1000)} s for ${this.active.size} running job(s)`);
      await Promise.race([all(), sleep(graceMs)]);
    }
    for (const a of this.active.values()) a.stop("shutdown");
    await all();
  }

  private async loop(): Promise<void> {
    while (!this.stopping) {
      try {
        await this.settle();
        while (!this.stopping && this.hasRoom) {
          const lease = await claimNextJob(this.o.db, this.workerId, this.o.leaseMs);
          if (!lease) break;
          this.launch(lease);
        }
      } catch (e) {
        // a busy or unreachable database: wait and try again, never exit
        this.log(`queue access failed, retrying: ${(e as Error).message}`);
      }
      if (this.stopping) break;
      await new Promise<void>((resolve) => {
        const t = setTimeout(resolve, this.hasRoom ? (this.o.idlePollMs ?? 500) : 5_000);
        this.wake = () => {
          clearTimeout(t);
          resolve();
        };
      });
      this.wake = null;
    }
  }

  private async settle(): Promise<void> {
    const now = Date.now();
    if (now - this.lastSettle < Math.min(5000, this.o.leaseMs / 2)) return;
    this.lastSettle = now;
    const { cancelled, failed } = await settleAbandoned(this.o.db, this.mailChoice, now);
    for (const id of failed) this.log(`job ${id} failed: its workers stopped responding on every attempt`);
    if (failed.length > 0) this.o.mailSender?.kick();
    for (const id of cancelled) this.log(`job ${id} cancelled after its worker stopped`);
  }

  private launch(lease: Lease): void {
    this.stats.claimed++;
    const controller = new AbortController();
    // a cancel first asks the solver to stop and keep its best design (stopFlag), and ends the
    // thread only if the solver has not returned within CANCEL_GRACE_MS
    const stopFlag = new SharedArrayBuffer(4);
    let reason: StopReason | null = null;
    const active: Active = {
      lease,
      stop: (r) => {
        reason ??= r;
        if (r === "cancel") {
          Atomics.store(new Int32Array(stopFlag), 0, 1);
          setTimeout(() => controller.abort(), CANCEL_GRACE_MS).unref();
        } else controller.abort();
      },
      done: Promise.resolve(),
      onThread: true,
    };
    // the loop sees the free thread when it next looks (within 5 s): waking it at once would
    // put a claim in the way of the result being recorded
    const offThread = () => {
      active.onThread = false;
    };
    active.done = this.run(lease, controller.signal, () => reason, active.stop, offThread, stopFlag)
      .catch((e) => this.log(`job ${lease.job.id}: unexpected error: ${(e as Error).stack ?? e}`))
      .finally(() => {
        this.active.delete(lease.job.id);
        this.wake?.();
      });
    this.active.set(lease.job.id, active);
  }

  private async run(
    lease: Lease,
    signal: AbortSignal,
    reason: () => StopReason | null,
    stop: (r: StopReason) => void,
    offThread: () => void,
    stopFlag?: SharedArrayBuffer,
  ): Promise<void> {
    const { db } = this.o;
    const job = lease.job;
    const recorder = new ProgressRecorder(db, lease);
    const timers: NodeJS.Timeout[] = [];
    const started = Date.now();
    this.log(`job ${job.id} started (attempt ${lease.attempt} of ${job.maxAttempts})`);

    // lease and cancel checks run for the whole job, storage writes included
    let checking = false;
    timers.push(
      setInterval(() => {
        if (checking) return;
        checking = true;
        checkJob(db, lease)
          .then((s) => {
            if (!s.held) stop("lost");
            else if (s.cancelRequested) stop("cancel");
          })
          .catch(() => undefined)
          .finally(() => (checking = false));
      }, this.o.cancelPollMs ?? 250),
      setInterval(() => {
        renewLease(db, lease, this.o.leaseMs)
          .then((ok) => ok || stop("lost"))
          .catch((e) => this.log(`job ${job.id}: lease renewal failed: ${(e as Error).message}`));
      }, Math.max(250, Math.floor(this.o.leaseMs / 3))),
      setTimeout(() => stop("time"), this.o.timeLimitMs),
    );

    try {
      await recorder.reset();
      const resultKey = jobResultKey(job.id);
      // at-least-once: an earlier attempt may have stored the result and died before
      // recording it; then that result is taken as it is, not computed and stored again
      // (only a job claimed before can have one: attempts count every claim)
      const earlier = lease.attempt > 1 ? await getText(resultKey) : null;
      let summary: JobSummary;
      let message: string;
      let resultText: string;
      if (earlier !== null) {
        const result = JSON.parse(earlier) as TrussResult;
        summary = summarizeResult(result);
        message = solverFailureMessage(result.message, result.hint);
        resultText = earlier;
        this.log(`job ${job.id}: result of an earlier attempt found in storage, recording it`);
      } else {
        const out = await this.solve(lease, recorder, signal, stopFlag);
        offThread();
        // a computed result is worth waiting for: storage gets minutes, not seconds, to come
        // back while the lease is renewed (the job is handed back only after that)
        await retrying(() => putObject(resultKey, out.resultJson, "application/json"), 30, () => signal.aborted);
        summary = out.summary;
        message = solverFailureMessage(out.message, out.hint);
        resultText = out.resultJson;
      }
      await recorder.close();
      if (reason() === "cancel" && earlier === null) {
        // stopped on request: the best design so far is stored and kept with the cancelled job
        if (await retrying(() => markCancelled(db, lease, "Cancelled on request while running; the best design found so far is kept", Date.now(), { resultKey, summary })))
          this.stats.cancelled++;
        this.log(`job ${job.id} cancelled after ${Date.now() - started} ms, best design kept`);
        return;
      }
      if (summary.status === "failed") {
        // the solver broke down: no design to review, so the job fails with the solver's words
        if (await retrying(() => recordFailure(db, lease, message, this.mailChoice))) {
          this.stats.failed++;
          this.log(`job ${job.id} failed: ${message}`);
          this.o.mailSender?.kick();
        }
        return;
      }
      const reviewRequested = this.reviewRequested(job.id, resultText);
      if (await retrying(() => recordSuccess(db, lease, { resultKey, summary, outcome: summary.status }, { ...this.mailChoice, reviewRequested }))) {
        this.stats.succeeded++;
        this.log(`job ${job.id} succeeded (${summary.status}, ${summary.iterations} iterations, ${Date.now() - started} ms)`);
        this.o.mailSender?.kick();
      } else {
        this.stats.lost++;
        this.log(`job ${job.id}: finished, but another worker holds it now; its record is left to that worker`);
      }
    } catch (e) {
      await recorder.close();
      const why = reason();
      if (why === "cancel") {
        if (await retrying(() => markCancelled(db, lease, "Cancelled on request while running"))) this.stats.cancelled++;
        this.log(`job ${job.id} cancelled after ${Date.now() - started} ms`);
      } else if (why === "lost") {
        this.stats.lost++;
        this.log(`job ${job.id}: lease lost to another worker; stopped here`);
      } else if (why === "shutdown") {
        if (await retrying(() => requeueJob(db, lease))) this.stats.requeued++;
        this.log(`job ${job.id} handed back to the queue (worker stopping)`);
      } else if (e instanceof DependencyUnavailableError && e.dependency === "storage") {
        // not the job's fault: back to the queue without spending an attempt; its page says
        // it waits for storage, and it runs again once storage answers
        const until = new Date(Date.now() + backoffDelay(2, { baseMs: this.o.storageWaitMs ?? 2000, capMs: 60_000 }));
        if (await retrying(() => requeueJob(db, lease, { for: "storage", until }))) this.stats.waitedForStorage++;
        this.log(`job ${job.id} waits for storage: ${e.reason}`);
      } else {
        const message = why === "time" ? timeLimitMessage(this.o.timeLimitMs) : describeTaskError(e, this.o.maxOldGenerationMb);
        if (await retrying(() => recordFailure(db, lease, message, this.mailChoice))) {
          this.stats.failed++;
          this.log(`job ${job.id} failed: ${message}`);
          this.o.mailSender?.kick();
        }
      }
    } finally {
      for (const t of timers) clearTimeout(t);
    }
  }

  private async solve(lease: Lease, recorder: ProgressRecorder, signal: AbortSignal, stopFlag?: SharedArrayBuffer): Promise<SolveTaskOutput> {
    const job = lease.job;
    // the version the job was queued on (jobs older than versions: the model's latest file)
    const [model] =
      job.modelVersion === null
        ? await this.o.db.select({ fileKey: models.fileKey }).from(models).where(eq(models.id, job.modelId)).limit(1)
        : await this.o.db
            .select({ fileKey: modelVersions.fileKey })
            .from(modelVersions)
            .where(and(eq(modelVersions.modelId, job.modelId), eq(modelVersions.version, job.modelVersion)))
            .limit(1);
    if (!model) throw new Error(`The model ${job.modelId}${job.modelVersion === null ? "" : ` version ${job.modelVersion}`} of this job no longer exists`);
    const modelText = await retrying(() => getText(model.fileKey), 3);
    if (modelText === null) throw new Error(`The file of model ${job.modelId} is missing from storage (${model.fileKey})`);
    signal.throwIfAborted();

    const { port1, port2 } = new MessageChannel();
    // progress and the result travel on different ports: the result is recorded only once the
    // task's end mark has come through the progress port, so no progress is lost
    let drained!: () => void;
    const ended = new Promise<void>((resolve) => (drained = resolve));
    port1.on("message", (p: ProgressPoint | typeof PROGRESS_END) => {
      if ("end" in p) drained();
      else recorder.push(p);
    });
    const input: SolveTaskInput = { jobId: job.id, kind: job.kind, modelText, options: (job.options as JobOptions) ?? {}, progressPort: port2, stopFlag };
    try {
      const out = (await this.o.pool.run(input, { transferList: [port2] as never, signal })) as SolveTaskOutput;
      let timer: NodeJS.Timeout | undefined;
      await Promise.race([ended, new Promise<void>((r) => (timer = setTimeout(r, 2000)))]);
      clearTimeout(timer);
      return out;
    } finally {
      port1.close();
    }
  }

  private get mailChoice() {
    return { notify: this.o.notify !== false };
  }

  /**
   * Whether the checkers are asked to review a succeeded run (its stored result text): an
   * optimum, or a not-converged run whose best design meets every limit (review-request.ts).
   */
  private reviewRequested(jobId: string, resultText: string): boolean {
    try {
      return designWorthReview(JSON.parse(resultText) as TrussResult);
    } catch (e) {
      this.log(`job ${jobId}: result not readable, no review requested: ${(e as Error).message}`);
      return false;
    }
  }
}

/** How long a cancelled solve may take to hand back its best design before its thread is ended. */
const CANCEL_GRACE_MS = 5000;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/**
 * A storage or database call retried with backoff and jitter (a busy database or a brief
 * network fault must not turn a finished solve into a failed job); `tries` of them, the
 * delays growing to 5 s, or until `giveUp` says so. The last error propagates.
 */
async function retrying<T>(fn: () => Promise<T>, tries = 6, giveUp: () => boolean = () => false): Promise<T> {
  for (let i = 1; ; i++) {
    try {
      return await fn();
    } catch (e) {
      if (i >= tries || giveUp()) throw e;
      await sleep(backoffDelay(i, { baseMs: 200, capMs: 5000 }));
    }
  }
}
