// ProgressRecorder: every iteration reaches job_progress, but in few writes (at most about
// four a second), and the job row carries the latest figures.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TestServices } from "../support/services";
import { twoBarModel } from "./support/models";
import { makeProject, setupQueue, uploadModel } from "./support/setup";

let services: TestServices;
let database: Db;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue());
});
afterAll(async () => services?.stop());

describe("progress recorder", () => {
  it("keeps all 600 iterations of a run of a few seconds in at most about 4 writes a second, latest on the row", async () => {
    const { enqueueJob, getJobHistory, getJob } = await import("~/lib/jobs/queue.server");
    const { claimNextJob } = await import("~/lib/jobs/claim.server");
    const { ProgressRecorder } = await import("~/lib/jobs/progress.server");
    const model = await uploadModel(await makeProject(), twoBarModel());
    const queued = await enqueueJob({ modelId: model.id, user: null }, database);
    const lease = (await claimNextJob(database, "progress-test", 10_000))!;
    expect(lease.job.id).toBe(queued.id);
    const rec = new ProgressRecorder(database, lease, 4);
    const t0 = Date.now();
    for (let i = 0; i < 600; i++) {
      rec.push({ iteration: i, objective: 100 / (i + 1), maxViolation: i === 0 ? Number.NaN : 1 / (i + 1), kktResidual: 10 ** (-i / 100) });
      await new Promise((r) => setTimeout(r, 2.5));
    }
    await rec.close();
    const seconds = (Date.now() - t0) / 1000;
    // 4 per second over the run, plus the first and the closing write
    expect(rec.writes).toBeLessThanOrEqual(Math.ceil(seconds * 4) + 2);
    const history = await getJobHistory(queued.id, database);
    expect(history.map((h) => h.iteration)).toEqual(Array.from({ length: 600 }, (_, i) => i));
    expect(Number.isNaN(history[0]!.maxViolation)).toBe(true); // a non-finite figure is stored as unknown
    const view = (await getJob(queued.id, database))!;
    expect(view.progress).toMatchObject({ iteration: 599, objective: 100 / 600 });
    const { jobProgress } = await import("~/db/schema");
    const rows = await database.select().from(jobProgress).where(eq(jobProgress.jobId, queued.id));
    expect(rows.every((r) => r.attempt === 1)).toBe(true);
  });
});
