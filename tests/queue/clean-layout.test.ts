// Clean layout as a service: a finished ground-structure job becomes the next version of its
// model with only the members the least-mass LP uses; a threshold that leaves a mechanism is
// refused in words and stores nothing.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { TestServices } from "../support/services";
import { groundStructure } from "../engine/design/ground-structure";
import { makeAccount, makeProject, setupQueue, uploadModel, waitFor } from "./support/setup";

let services: TestServices;
let engineer: Awaited<ReturnType<typeof makeAccount>>;
let jobId: string;
let modelId: string;

beforeAll(async () => {
  ({ services } = await setupQueue());
  engineer = await makeAccount("engineer", "Odile Brackwater");
  const projectId = await makeProject();
  // a cantilever layout study: 109 candidate members, stress limits only
  const model = groundStructure({ nx: 6, ny: 4, reach: 2, objective: "mass", deflection: 1e6 });
  modelId = (await uploadModel(projectId, model, engineer.id)).id;
  const { enqueueJob, getJob } = await import("~/lib/jobs/queue.server");
  const { createSolvePool } = await import("../../workers/pool");
  const { QueueRunner } = await import("../../workers/queue-runner");
  jobId = (await enqueueJob({ modelId, options: {}, user: engineer.sessionUser })).id;
  const pool = createSolvePool({ threads: 1, maxOldGenerationMb: 512 });
  const { db } = await import("~/db/client.server");
  const runner = new QueueRunner({ db: db(), pool, leaseMs: 5000, timeLimitMs: 120_000, maxOldGenerationMb: 512, idlePollMs: 50, log: () => undefined });
  runner.start();
  try {
    await waitFor("the layout job", async () => ((await getJob(jobId))?.status === "succeeded" ? true : null), 120_000);
  } finally {
    await runner.stop(0);
    await pool.destroy();
  }
}, 180_000);
afterAll(async () => services?.stop());

describe("clean layout", () => {
  it("stores the LP layout as the next model version, stable and much smaller", async () => {
    const { storeCleanLayout } = await import("~/lib/clean-layout.server");
    const { listModelVersions, getModelVersionFile } = await import("~/lib/models/versions.server");
    const out = await storeCleanLayout({ jobId, source: "lp", thresholdPercent: 1, user: engineer });
    if (!out.ok) throw new Error(out.error);
    expect(out.version).toBe(2);
    const versions = await listModelVersions(modelId);
    expect(versions.map((v) => v.version)).toEqual(expect.arrayContaining([1, 2]));
    const v2 = versions.find((v) => v.version === 2)!;
    expect(v2.memberCount).toBeLessThan(30);
    expect(v2.note).toMatch(/^Clean layout from job /);
    const file = await getModelVersionFile(modelId, 2);
    expect(JSON.parse(file!.text).name).toMatch(/\(clean layout\)$/);
  });

  it("refuses a threshold that leaves a mechanism, and stores nothing", async () => {
    const { storeCleanLayout } = await import("~/lib/clean-layout.server");
    const { listModelVersions } = await import("~/lib/models/versions.server");
    const before = (await listModelVersions(modelId)).length;
    const out = await storeCleanLayout({ jobId, source: "lp", thresholdPercent: 90, user: engineer });
    expect(out.ok).toBe(false);
    if (!out.ok) {
      expect(out.status).toBe(409);
      expect(out.error).toMatch(/Lower the threshold to keep more members\.$/);
    }
    expect((await listModelVersions(modelId)).length).toBe(before);
  });

  it("checks the form: source and a percentage strictly between 0 and 100", async () => {
    const { cleanLayoutFormSchema } = await import("~/lib/clean-layout.server");
    expect(cleanLayoutFormSchema.safeParse({ source: "lp", threshold: "1" }).success).toBe(true);
    expect(cleanLayoutFormSchema.safeParse({ source: "grid", threshold: "1" }).success).toBe(false);
    expect(cleanLayoutFormSchema.safeParse({ source: "lp", threshold: "0" }).success).toBe(false);
    expect(cleanLayoutFormSchema.safeParse({ source: "lp", threshold: "100" }).success).toBe(false);
  });
});
