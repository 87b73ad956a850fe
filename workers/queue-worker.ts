// `npm run worker`: one queue worker process. It claims jobs from the shared database while
// its piscina threads are free, and delivers the mail outbox; any number of these may run,
// on one host or several.
// SIGTERM / SIGINT: stop claiming, let running jobs finish for a grace period, then hand the
// rest back to the queue. A second signal hands them back at once.
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { migrateDb } from "~/db/migrate.server";
import { config } from "~/lib/config.server";
import { ensureToolsBundle } from "../scripts/tools-bundle.mjs";
import { MailSender } from "~/lib/mail/sender.server";
import { createSolvePool } from "./pool";
import { QueueRunner, newWorkerId } from "./queue-runner";

const GRACE_MS = Number(process.env.WORKER_SHUTDOWN_GRACE_MS ?? 20_000);

async function waitForSchema(): Promise<void> {
  // the app's start script applies the migrations; a worker started alone waits for them
  for (let i = 0; ; i++) {
    try {
      await db().run(sql`select 1 from jobs limit 1`);
      return;
    } catch (e) {
      if (i === 0) console.log(`[worker] waiting for the database schema (${(e as Error).message}); run the migrations or pass --migrate`);
      await new Promise((r) => setTimeout(r, 1000));
    }
  }
}

async function main() {
  const c = config();
  if (process.argv.includes("--migrate")) await migrateDb(db());
  await waitForSchema();
  const bundled = await ensureToolsBundle().catch((e: Error) => `not bundled (${e.message}); the threads compile TypeScript`);
  if (bundled) console.log(`[worker] solver threads: ${bundled}`);
  const pool = createSolvePool();
  const workerId = newWorkerId();
  const mailSender = new MailSender({ db: db(), senderId: workerId, claimMs: c.MAIL_CLAIM_MS });
  const runner = new QueueRunner({
    db: db(),
    pool,
    workerId,
    mailSender,
    leaseMs: c.JOB_LEASE_MS,
    timeLimitMs: c.JOB_TIME_LIMIT_MS,
    maxOldGenerationMb: c.WORKER_MAX_OLD_GENERATION_MB,
  });
  runner.start();
  mailSender.start();
  console.log(`[worker ${runner.workerId}] serving the queue with ${pool.options.maxThreads} thread(s), lease ${c.JOB_LEASE_MS} ms`);

  let signals = 0;
  const shutdown = async (sig: string) => {
    signals++;
    if (signals > 1) {
      console.log(`[worker ${runner.workerId}] ${sig} again: handing running jobs back now`);
      await runner.stop(0);
      await mailSender.stop();
      return;
    }
    console.log(`[worker ${runner.workerId}] ${sig}: no new jobs; finishing the running ones`);
    await runner.stop(GRACE_MS);
    await mailSender.stop();
    await pool.destroy();
    console.log(`[worker ${runner.workerId}] stopped (${JSON.stringify(runner.stats)})`);
    process.exit(0);
  };
  // the runner settles each job's own errors; anything that still slips out is logged, and
  // the worker keeps serving (its jobs' leases protect them either way)
  process.on("unhandledRejection", (e) => console.error(`[worker ${runner.workerId}] unexpected: ${e instanceof Error ? e.message : String(e)}`));
  process.on("SIGTERM", () => void shutdown("SIGTERM"));
  process.on("SIGINT", () => void shutdown("SIGINT"));
}

main().catch((e) => {
  console.error(`[worker] could not start: ${e instanceof Error ? e.message : e}`);
  process.exit(1);
});
