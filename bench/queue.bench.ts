// Queue benchmark (`npm run bench -- queue`): throughput of 10-bar benchmark jobs through the
// whole pipeline (claim, model read from S3, solve on the pool, result write to S3, database
// update) with 1 and 2 pool threads. The job list's speed (query and GET /api/jobs under 50
// connections, with and without the membership filter) is bench/job-list.bench.ts.
// Runs against its own temp database, S3 fake and mail catcher; prints its own figures.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { startTestServices } from "../tests/support/services";

const JOBS_PER_RUN = Number(process.env.QUEUE_BENCH_JOBS ?? 40);

async function main() {
  const services = await startTestServices();
  process.env.JOB_LEASE_MS = "30000";
  try {
    const { db } = await import("~/db/client.server");
    const { migrateDb } = await import("~/db/migrate.server");
    await migrateDb(db());
    const { projects, jobs } = await import("~/db/schema");
    const { storeModel } = await import("~/lib/models.server");
    const { enqueueJob } = await import("~/lib/jobs/queue.server");
    const { createSolvePool } = await import("../workers/pool");
    const { QueueRunner } = await import("../workers/queue-runner");
    const { inArray } = await import("drizzle-orm");

    const projectId = randomUUID();
    await db().insert(projects).values({ id: projectId, code: "BENCH-1", name: "Queue benchmark yard" });
    const file = path.resolve("tests/fixtures/models/design/ten-bar.truss.json");
    const stored = await storeModel({ projectId, fileName: "ten-bar.truss.json", bytes: new Uint8Array(fs.readFileSync(file)), user: null });
    if (!stored.ok) throw new Error(`the 10-bar model was refused: ${stored.error}`);
    const modelId = stored.model.id;

    // figures from a shared machine mean little without its load beside them
    const load = () => `load average ${os.loadavg()[0]!.toFixed(1)} on ${os.availableParallelism()} cores`;
    console.log(`queue throughput: ${JOBS_PER_RUN} ten-bar jobs per run (claim, S3 read, solve, S3 write, DB update); ${load()}`);
    for (const threads of [1, 2]) {
      const pool = createSolvePool({ threads });
      const runner = new QueueRunner({ db: db(), pool, leaseMs: 30_000, timeLimitMs: 600_000, maxOldGenerationMb: 1024, idlePollMs: 20, notify: false, log: () => undefined });
      // warm-up: every thread loads the engine once before the clock starts
      const warm: string[] = [];
      for (let i = 0; i < threads; i++) warm.push((await enqueueJob({ modelId, user: null })).id);
      runner.start();
      await until(async () => (await db().select({ s: jobs.status }).from(jobs).where(inArray(jobs.id, warm))).every((r) => r.s === "succeeded"));
      await runner.stop(0);

      const ids: string[] = [];
      for (let i = 0; i < JOBS_PER_RUN; i++) ids.push((await enqueueJob({ modelId, user: null })).id);
      const timed = new QueueRunner({ db: db(), pool, leaseMs: 30_000, timeLimitMs: 600_000, maxOldGenerationMb: 1024, idlePollMs: 20, notify: false, log: () => undefined });
      const t0 = performance.now();
      timed.start();
      await until(async () => (await db().select({ s: jobs.status }).from(jobs).where(inArray(jobs.id, ids))).every((r) => r.s === "succeeded" || r.s === "failed"));
      const seconds = (performance.now() - t0) / 1000;
      await timed.stop(0);
      await pool.destroy();
      const rows = await db().select({ s: jobs.status, outcome: jobs.outcome }).from(jobs).where(inArray(jobs.id, ids));
      const ok = rows.filter((r) => r.s === "succeeded").length;
      console.log(
        `  ${threads} thread${threads > 1 ? "s" : " "}: ${JOBS_PER_RUN} jobs in ${seconds.toFixed(2)} s = ${((JOBS_PER_RUN / seconds) * 60).toFixed(0)} jobs/min ` +
          `(${ok} succeeded, outcomes: ${[...new Set(rows.map((r) => r.outcome))].join(", ")})`,
      );
    }

  } finally {
    await services.stop();
  }
}

async function until(done: () => Promise<boolean>, timeoutMs = 600_000) {
  const end = Date.now() + timeoutMs;
  while (!(await done())) {
    if (Date.now() > end) throw new Error("benchmark jobs did not finish in time");
    await new Promise((r) => setTimeout(r, 20));
  }
}

main().then(
  () => process.exit(0),
  (e) => {
    console.error(e);
    process.exit(1);
  },
);
