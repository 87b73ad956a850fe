// Queue benchmark (`npm run bench -- queue`):
// 1. throughput of 10-bar benchmark jobs through the whole pipeline (claim, model read from
//    S3, solve on the pool, result write to S3, database update) with 1 and 2 pool threads;
// 2. latency of GET /api/jobs over 1,000 stored jobs under 50 concurrent connections
//    (autocannon on loopback, the real route handler behind node:http, API-key auth included).
// Runs against its own temp database, S3 fake and mail catcher; prints its own figures.
import fs from "node:fs";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { startTestServices } from "../tests/support/services";

// autocannon ships no type declarations; this is the part of its API used here
interface LoadResult {
  requests: { average: number };
  latency: { p50: number; p99: number; max: number };
  non2xx: number;
  errors: number;
}
type LoadTest = (opts: { url: string; connections: number; duration: number; headers: Record<string, string>; workers?: number }) => Promise<LoadResult>;

const JOBS_PER_RUN = Number(process.env.QUEUE_BENCH_JOBS ?? 40);
const LIST_SECONDS = Number(process.env.QUEUE_BENCH_SECONDS ?? 8);

async function main() {
  const services = await startTestServices();
  process.env.JOB_LEASE_MS = "30000";
  try {
    const { db } = await import("~/db/client.server");
    const { migrateDb } = await import("~/db/migrate.server");
    await migrateDb(db());
    const { projects, projectMembers, jobs, user } = await import("~/db/schema");
    const { storeModel } = await import("~/lib/models.server");
    const { enqueueJob } = await import("~/lib/jobs/queue.server");
    const { createSolvePool } = await import("../workers/pool");
    const { QueueRunner } = await import("../workers/queue-runner");
    const { eq, inArray } = await import("drizzle-orm");
    const autocannon = ((await import("autocannon" as string)) as { default: LoadTest }).default;

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

    // --- list latency over 1,000 jobs -------------------------------------------------------
    const existing = (await db().select({ id: jobs.id }).from(jobs)).length;
    const filler = [];
    for (let i = existing; i < 1000; i++) {
      filler.push({ id: randomUUID(), projectId, modelId, status: "succeeded" as const, options: {}, createdAt: new Date(Date.now() - i * 1000) });
    }
    for (let i = 0; i < filler.length; i += 200) await db().insert(jobs).values(filler.slice(i, i + 200));
    const viewerId = randomUUID();
    await db().insert(user).values({ id: viewerId, name: "Bench viewer", email: "bench.viewer@queue-bench.test", emailVerified: true, role: "viewer", createdAt: new Date(), updatedAt: new Date() });
    // the viewer reads as a project member (the membership filter: an EXISTS per listed job);
    // an admin sees every project without that filter, which is the query as it was before
    // membership: the reference printed beside it
    await db().insert(projectMembers).values({ projectId, userId: viewerId });
    const adminId = randomUUID();
    await db().insert(user).values({ id: adminId, name: "Bench admin", email: "bench.admin@queue-bench.test", emailVerified: true, role: "admin", createdAt: new Date(), updatedAt: new Date() });
    const { createApiKey } = await import("~/lib/auth/api-keys.server");
    const { key: memberKey } = await createApiKey({ userId: viewerId, name: "bench" });
    const { key: adminKey } = await createApiKey({ userId: adminId, name: "bench" });
    const total = (await db().select({ id: jobs.id }).from(jobs).where(eq(jobs.projectId, projectId))).length;

    const route = await import("~/routes/api/jobs");
    const server = http.createServer(async (req, res) => {
      try {
        const request = new Request(`http://127.0.0.1${req.url}`, { headers: req.headers as Record<string, string> });
        let response: Response;
        try {
          response = await route.loader({ request, params: {}, context: {} } as never);
        } catch (e) {
          if (!(e instanceof Response)) throw e;
          response = e;
        }
        res.writeHead(response.status, Object.fromEntries(response.headers));
        res.end(Buffer.from(await response.arrayBuffer()));
      } catch (e) {
        res.writeHead(500).end(String(e));
      }
    });
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
    const port = (server.address() as { port: number }).port;
    console.log(`GET /api/jobs over ${total} jobs, 50 connections, ${LIST_SECONDS} s each (goal: p99 < 50 ms); ${load()}`);
    for (const [who, key] of [["member (membership filter)", memberKey], ["admin (no filter: the reference)", adminKey]] as const)
    for (const q of ["", "?limit=200", `?projectId=${projectId}&status=succeeded`]) {
      // a short unmeasured run first, so the figures are of warm (JIT-compiled) code
      await autocannon({ url: `http://127.0.0.1:${port}/api/jobs${q}`, connections: 10, duration: 1, headers: { authorization: `Bearer ${key}` } });
      const r = await autocannon({
        url: `http://127.0.0.1:${port}/api/jobs${q}`,
        connections: 50,
        duration: LIST_SECONDS,
        headers: { authorization: `Bearer ${key}` },
        // the load generator on its own thread, so it does not share the server's event loop
        workers: 1,
      });
      const errors = r.non2xx + r.errors;
      console.log(
        `  ${who} /api/jobs${q.replace(projectId, "<project>") || " (first page, 50)"}: ${r.requests.average.toFixed(0)} req/s, ` +
          `p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms, max ${r.latency.max} ms, ${errors} errors ${r.latency.p99 < 50 ? "(goal met)" : "(GOAL MISSED)"}`,
      );
    }
    await new Promise((r) => server.close(r));
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
