// Worker processes against one queue, as `npm run worker` starts them: two workers share 200
// jobs (each completes exactly once, none lost); a worker killed with SIGKILL mid-job has its
// job taken over after the lease runs out (and failed with the reason once attempts are used
// up); SIGTERM lets a running job finish, or hands it back to the queue after the grace time.
import { spawn, type ChildProcess } from "node:child_process";
import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import { eq, inArray } from "drizzle-orm";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TestServices } from "../support/services";
import { gridModel, twoBarModel } from "./support/models";
import { makeProject, setupQueue, uploadModel, waitFor } from "./support/setup";

let services: TestServices;
let database: Db;
let projectId: string;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue());
  projectId = await makeProject();
});
afterAll(async () => services?.stop());

interface Worker {
  proc: ChildProcess;
  lines: string[];
  exited: Promise<number | null>;
}
const started: Worker[] = [];

function startWorker(env: Record<string, string> = {}): Worker {
  const proc = spawn(process.execPath, ["--import", "tsx", "workers/queue-worker.ts"], {
    env: { ...process.env, ...services.env, WORKER_THREADS: "1", JOB_LEASE_MS: "1500", WORKER_MAX_OLD_GENERATION_MB: "512", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  const lines: string[] = [];
  let buf = "";
  const take = (chunk: Buffer) => {
    buf += chunk.toString();
    const parts = buf.split("\n");
    buf = parts.pop()!;
    lines.push(...parts);
  };
  proc.stdout!.on("data", take);
  proc.stderr!.on("data", take);
  const exited = new Promise<number | null>((resolve) => proc.on("exit", (code) => resolve(code)));
  const w = { proc, lines, exited };
  started.push(w);
  return w;
}

afterEach(async () => {
  for (const w of started.splice(0)) {
    if (w.proc.exitCode === null && w.proc.signalCode === null) {
      w.proc.kill("SIGKILL");
      await w.exited;
    }
  }
});

async function enqueueMany(modelId: string, n: number) {
  const { enqueueJob } = await import("~/lib/jobs/queue.server");
  const ids: string[] = [];
  for (let i = 0; i < n; i++) ids.push((await enqueueJob({ modelId, user: null }, database)).id);
  return ids;
}

async function rows(ids: string[]) {
  const { jobs } = await import("~/db/schema");
  return database.select().from(jobs).where(inArray(jobs.id, ids));
}

const startedIds = (w: Worker) => w.lines.map((l) => / job (\S+) started/.exec(l)?.[1]).filter((x): x is string => !!x);

describe("queue worker processes", () => {
  it("two workers run 200 queued jobs: every one completes exactly once, none is lost", { timeout: 240_000 }, async () => {
    const model = await uploadModel(projectId, twoBarModel());
    const ids = await enqueueMany(model.id, 200);
    const a = startWorker();
    const b = startWorker();
    await waitFor(
      "all 200 jobs to finish",
      async () => {
        const r = await rows(ids);
        return r.every((j) => j.status === "succeeded" || j.status === "failed");
      },
      200_000,
      500,
    );
    const done = await rows(ids);
    expect(done.filter((j) => j.status === "succeeded")).toHaveLength(200);
    expect(done.every((j) => j.attempts === 1 && j.outcome === "optimal")).toBe(true);
    // each job was started once, by one of the two
    const runs = [...startedIds(a), ...startedIds(b)].filter((id) => ids.includes(id));
    expect(runs).toHaveLength(200);
    expect(new Set(runs).size).toBe(200);
    expect(startedIds(a).length).toBeGreaterThan(0);
    expect(startedIds(b).length).toBeGreaterThan(0);
    // one result object per job
    const { s3 } = await import("~/lib/storage.server");
    let keys = 0;
    let token: string | undefined;
    do {
      const page = await s3().send(new ListObjectsV2Command({ Bucket: services.env.S3_BUCKET, Prefix: "results/", ContinuationToken: token }));
      keys += (page.Contents ?? []).filter((o) => ids.some((id) => o.Key === `results/${id}.result.json`)).length;
      token = page.NextContinuationToken;
    } while (token);
    expect(keys).toBe(200);
    console.log(`200 jobs: worker A ran ${startedIds(a).length}, worker B ran ${startedIds(b).length}`);
  });

  it("a worker killed with SIGKILL mid-job: the job is taken over and completes; one out of attempts fails with the reason", { timeout: 120_000 }, async () => {
    const { jobs } = await import("~/db/schema");
    const model = await uploadModel(projectId, gridModel(8, 2));
    const [retried, lastChance] = await enqueueMany(model.id, 2);
    await database.update(jobs).set({ maxAttempts: 1 }).where(eq(jobs.id, lastChance!));
    const victim = startWorker({ WORKER_THREADS: "2" });
    await waitFor(
      "both jobs to be running with progress",
      async () => (await rows([retried!, lastChance!])).every((j) => j.status === "running" && j.progressIteration !== null),
      60_000,
    );
    victim.proc.kill("SIGKILL");
    await victim.exited;
    const heir = startWorker({ WORKER_THREADS: "2" });
    const [r1, r2] = await waitFor(
      "the jobs to be settled",
      async () => {
        const r = await rows([retried!, lastChance!]);
        const byId = (id: string) => r.find((j) => j.id === id)!;
        const pair = [byId(retried!), byId(lastChance!)] as const;
        return pair.every((j) => j.status === "succeeded" || j.status === "failed") ? pair : null;
      },
      90_000,
      200,
    );
    expect(r1).toMatchObject({ status: "succeeded", attempts: 2 });
    // recorded by the second worker
    expect(heir.lines.some((l) => l.includes(`[worker ${r1!.workerId}]`))).toBe(true);
    expect(startedIds(heir)).toContain(retried);
    expect(r2).toMatchObject({ status: "failed", attempts: 1 });
    expect(r2!.error).toMatch(/stopped responding on each of 1 attempts/);
    expect(startedIds(heir)).not.toContain(lastChance);
  });

  it("SIGTERM: a running job is finished before the worker exits; past the grace time it goes back to the queue", { timeout: 120_000 }, async () => {
    const quickModel = await uploadModel(projectId, gridModel(4, 1, "Queue probe: short grid"));
    const [finishes] = await enqueueMany(quickModel.id, 1);
    const w1 = startWorker();
    await waitFor("the job to run", async () => (await rows([finishes!]))[0]!.status === "running", 60_000);
    w1.proc.kill("SIGTERM");
    expect(await w1.exited).toBe(0);
    expect((await rows([finishes!]))[0]!.status).toBe("succeeded");

    const slowModel = await uploadModel(projectId, gridModel(20, 3));
    const [handedBack] = await enqueueMany(slowModel.id, 1);
    const w2 = startWorker({ WORKER_SHUTDOWN_GRACE_MS: "300" });
    await waitFor("the long job to run", async () => (await rows([handedBack!]))[0]!.progressIteration !== null, 60_000);
    w2.proc.kill("SIGTERM");
    expect(await w2.exited).toBe(0);
    expect((await rows([handedBack!]))[0]).toMatchObject({ status: "queued", attempts: 0, workerId: null });
  });
});
