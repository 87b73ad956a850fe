// The review thread across runs (issue 16, item 6): a run queued "with changes" records the run
// a checker returned, only when that run is of the same model; the returned run finds its
// answers through the same column; "waiting for review" includes an approval an admin reopened.
// And a reader's display unit choice: stored per person, unknown choices refused, nothing stored.
// Checks against the rules of product.md (four-eyes review, one decision in force).
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TestServices } from "../support/services";
import { twoBarModel, type ModelJson } from "./support/models";
import { makeAccount, makeProject, setupQueue, uploadModel } from "./support/setup";

let services: TestServices;
let database: Db;
let projectId: string;
let engineer: Awaited<ReturnType<typeof makeAccount>>;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue());
  engineer = await makeAccount("engineer", "Ines Porthcawl");
  projectId = await makeProject();
}, 60_000);
afterAll(async () => services?.stop());

describe("review thread", () => {
  it("links a new run to the returned run of the same model, both ways, and refuses another model's run", async () => {
    const { enqueueJob, getJob } = await import("~/lib/jobs/queue.server");
    const { jobs } = await import("~/db/schema");
    const a = await uploadModel(projectId, twoBarModel("thread frame A") as unknown as ModelJson, engineer.id);
    const b = await uploadModel(projectId, twoBarModel("thread frame B") as unknown as ModelJson, engineer.id);
    const returned = await enqueueJob({ modelId: a.id, user: engineer }, database);
    const answer = await enqueueJob({ modelId: a.id, user: engineer, answers: returned.id }, database);
    expect((await getJob(answer.id, database))!.answersJobId).toBe(returned.id);
    const answeredBy = await database.select({ id: jobs.id }).from(jobs).where(eq(jobs.answersJobId, returned.id));
    expect(answeredBy.map((r) => r.id)).toEqual([answer.id]);

    const before = (await database.select({ id: jobs.id }).from(jobs)).length;
    const refused = await enqueueJob({ modelId: b.id, user: engineer, answers: returned.id }, database).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(Response);
    expect((refused as Response).status).toBe(400);
    expect(((await (refused as Response).json()) as { error: string }).error).toMatch(/not a run of model "thread frame B"/);
    expect((await database.select({ id: jobs.id }).from(jobs)).length).toBe(before); // nothing half-stored
  });

  it("counts a run whose approval was reopened as waiting for review again", async () => {
    const { enqueueJob, listJobs } = await import("~/lib/jobs/queue.server");
    const { jobs, reviews } = await import("~/db/schema");
    const checker = await makeAccount("checker", "Tomasz Hallorann");
    const m = await uploadModel(projectId, twoBarModel("reopened frame") as unknown as ModelJson, engineer.id);
    const j = await enqueueJob({ modelId: m.id, user: engineer }, database);
    await database.update(jobs).set({ status: "succeeded", outcome: "optimal", finishedAt: new Date() }).where(eq(jobs.id, j.id));
    const waiting = async () => (await listJobs({ review: "waiting", limit: 200 }, database, { fresh: true })).jobs.map((x) => x.id);
    expect(await waiting()).toContain(j.id);
    await database.insert(reviews).values({ id: `${j.id}-1`, jobId: j.id, reviewerId: checker.id, decision: "approved", comment: "ok", createdAt: new Date(Date.now() - 1000) });
    expect(await waiting()).not.toContain(j.id);
    await database.insert(reviews).values({ id: `${j.id}-2`, jobId: j.id, reviewerId: checker.id, decision: "reopened", comment: "load changed", createdAt: new Date() });
    expect(await waiting()).toContain(j.id);
  });
});

describe("display units", () => {
  it("stores one choice per person and refuses an unknown one, naming the choices", async () => {
    const { getDisplayUnits, setDisplayUnits } = await import("~/lib/display-units.server");
    expect(await getDisplayUnits(engineer.id, database)).toBe("model");
    expect(await setDisplayUnits(engineer.id, "kN-m", database)).toEqual({ ok: true });
    expect(await getDisplayUnits(engineer.id, database)).toBe("kN-m");
    const bad = await setDisplayUnits(engineer.id, "furlongs", database);
    expect(bad.ok).toBe(false);
    expect(!bad.ok && bad.error).toMatch(/kN, m, kg/);
    expect(await getDisplayUnits(engineer.id, database)).toBe("kN-m");
  });

  it("converts on display only: 12,500 N over 1,250 mm² reads 12.50 kN and 0.001250 m² (SI prefixes, exact)", async () => {
    const { quantityFormatter } = await import("~/lib/format");
    const q = quantityFormatter({ length: "mm", force: "N", mass: "kg" }, "kN-m");
    expect(q.text(12500, "force")).toBe("12.50 kN");
    expect(q.unit("area")).toBe("m²");
    expect(q.number(1250, "area")).toBe("0.001250");
  });
});
