// Model versions and analysis-only runs through the API of api.md (Additions), in-process with
// real API keys, the S3 fake, a temp database and a real worker pool: versions are numbered
// and immutable, every version's file reads back byte for byte, jobs record the version they
// ran, and an analysis run of a model without a design block succeeds with status "analysed".
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TestServices } from "../support/services";
import { twoBarModel } from "../queue/support/models";
import { makeAccount, makeProject, setupQueue, waitFor } from "../queue/support/setup";

let services: TestServices;
let database: Db;
let projectId: string;
let engineer: Awaited<ReturnType<typeof makeAccount>>;
let viewer: Awaited<ReturnType<typeof makeAccount>>;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue());
  engineer = await makeAccount("engineer", "Wynn Caradoc");
  viewer = await makeAccount("viewer", "Orla Penhallow");
  projectId = await makeProject();
});
afterAll(async () => services?.stop());

type Args = { request: Request; params: Record<string, string>; context: unknown };
const url = (p: string) => `http://localhost:4430${p}`;
const auth = (key: string) => ({ authorization: `Bearer ${key}` });
async function call(fn: (a: never) => Promise<Response>, request: Request, params: Record<string, string> = {}): Promise<Response> {
  try {
    return await fn({ request, params, context: {} } as Args as never);
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

function form(fields: Record<string, string>, file?: { field?: string; text: string; name?: string }) {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  if (file) f.set(file.field ?? "file", new Blob([file.text], { type: "application/json" }), file.name ?? "frame.truss.json");
  return f;
}

async function upload(model: unknown) {
  const route = await import("~/routes/api/models");
  const res = await call(route.action, new Request(url("/api/models"), { method: "POST", body: form({ projectId }, { text: JSON.stringify(model) }), headers: auth(engineer.key) }));
  expect(res.status).toBe(201);
  return (await res.json()) as { id: string };
}

async function addVersion(modelId: string, text: string, note: string, key = engineer.key) {
  const route = await import("~/routes/api/models.$modelId.versions");
  return call(route.action, new Request(url(`/api/models/${modelId}/versions`), { method: "POST", body: form({ note }, { text }), headers: auth(key) }), { modelId });
}

async function fileOf(modelId: string, version?: number) {
  const route = await import("~/routes/api/models.$modelId.file");
  return call(route.loader, new Request(url(`/api/models/${modelId}/file${version ? `?version=${version}` : ""}`), { headers: auth(viewer.key) }), { modelId });
}

async function submit(body: unknown) {
  const route = await import("~/routes/api/jobs");
  return call(route.action, new Request(url("/api/jobs"), { method: "POST", body: JSON.stringify(body), headers: { ...auth(engineer.key), "content-type": "application/json" } }));
}

describe("model versions", () => {
  it("numbers versions from 1, keeps each file, lists them on GET /api/models/:id, and refuses bad versions and roles", async () => {
    const v1 = twoBarModel("Harbour canopy frame");
    const { id } = await upload(v1);
    const v2 = { ...v1, loadCases: [{ id: "LC1", name: "Apex load, heavier", loads: [{ node: "C", fx: 0, fy: -45000 }] }] };
    const res = await addVersion(id, JSON.stringify(v2, null, 2), "apex load 30 -> 45 kN");
    expect(res.status).toBe(201);
    expect(await res.json()).toMatchObject({ id, version: 2, sha256: expect.stringMatching(/^[0-9a-f]{64}$/), note: "apex load 30 -> 45 kN" });

    expect(JSON.parse(await (await fileOf(id, 1)).text())).toEqual(v1);
    expect(await (await fileOf(id, 2)).text()).toBe(JSON.stringify(v2, null, 2));
    expect(JSON.parse(await (await fileOf(id)).text())).toEqual(v2);
    expect((await fileOf(id, 3)).status).toBe(404);

    const meta = await import("~/routes/api/models.$modelId");
    const m = (await (await call(meta.loader, new Request(url(`/api/models/${id}`), { headers: auth(viewer.key) }), { modelId: id })).json()) as {
      version: number;
      versions: { version: number; note: string | null; createdBy: string | null }[];
    };
    expect(m.version).toBe(2);
    expect(m.versions.map((v) => [v.version, v.note, v.createdBy])).toEqual([
      [1, null, engineer.id],
      [2, "apex load 30 -> 45 kN", engineer.id],
    ]);

    // an invalid model: 400 naming the member, nothing stored
    const broken = { ...v2, members: [{ id: "AC", start: "A", end: "Q", material: "steel", area: 1000 }, (v1.members as unknown[])[1]] };
    const bad = await addVersion(id, JSON.stringify(broken), "typo");
    expect(bad.status).toBe(400);
    expect(JSON.stringify(await bad.json())).toMatch(/members\[0\]\.end/);
    expect((await addVersion(id, JSON.stringify(v2), "viewer try", viewer.key)).status).toBe(403);
    expect((await addVersion("no-such-model", JSON.stringify(v2), "x")).status).toBe(404);
    const again = (await (await call(meta.loader, new Request(url(`/api/models/${id}`), { headers: auth(viewer.key) }), { modelId: id })).json()) as { version: number };
    expect(again.version).toBe(2);
  });

  it("keeps versions immutable in the database itself", async () => {
    const { modelVersions } = await import("~/db/schema");
    const { id } = await upload(twoBarModel("Immutable probe"));
    await expect(database.update(modelVersions).set({ note: "rewritten" }).where(eq(modelVersions.modelId, id))).rejects.toThrow();
    await expect(database.delete(modelVersions).where(eq(modelVersions.modelId, id))).rejects.toThrow();
  });
});

describe("jobs on versions, and analysis-only runs", () => {
  it("records the version a job runs; analysis of a model without a design block ends 'analysed' with forces matching statics", async () => {
    const { design: _drop, ...noDesign } = twoBarModel("Quayside shelter, analysis only");
    const { id } = await upload(noDesign);

    const refused = await submit({ modelId: id });
    expect(refused.status).toBe(400);
    expect(((await refused.json()) as { error: string }).error).toMatch(/no design block/);
    expect((await submit({ modelId: id, kind: "survey" })).status).toBe(400);
    expect((await submit({ modelId: id, kind: "analysis", version: 7 })).status).toBe(404);

    const heavier = { ...noDesign, loadCases: [{ id: "LC1", loads: [{ node: "C", fy: -60000 }] }] };
    expect((await addVersion(id, JSON.stringify(heavier), "double load")).status).toBe(201);
    const accepted = await submit({ modelId: id, kind: "analysis", version: 1 });
    expect(accepted.status).toBe(202);
    const { id: jobId } = (await accepted.json()) as { id: string };

    const { createSolvePool } = await import("../../workers/pool");
    const { QueueRunner } = await import("../../workers/queue-runner");
    const pool = createSolvePool({ threads: 1, maxOldGenerationMb: 512 });
    const runner = new QueueRunner({ db: database, pool, leaseMs: 5000, timeLimitMs: 60_000, maxOldGenerationMb: 512, idlePollMs: 50, log: () => undefined, notify: false });
    runner.start();
    try {
      const { getJob, getJobResult } = await import("~/lib/jobs/queue.server");
      const done = await waitFor("the analysis to finish", async () => {
        const j = await getJob(jobId, database);
        return j && (j.status === "succeeded" || j.status === "failed") ? j : null;
      });
      expect(done).toMatchObject({ status: "succeeded", outcome: "analysed", kind: "analysis", modelVersion: 1 });
      const result = (await getJobResult(jobId, database))! as unknown as {
        status: string;
        iterations: number;
        members: { id: string; force: { LC1: number }; utilization: number }[];
        reactions: { node: string; values: { LC1: [number, number, number] } }[];
      };
      expect(result.status).toBe("analysed");
      expect(result.iterations).toBe(0);
      // statics (the two-bar fixture): each bar carries P / (2 sin θ) = 30 kN / 1.2 = 25 kN compression;
      // version 1 ran, not the doubled load of version 2
      for (const m of result.members) {
        expect(m.force.LC1).toBeCloseTo(-25000, 6);
        expect(m.utilization).toBeCloseTo(25000 / 1000 / 235, 9);
      }
      // each support takes half the 30 kN vertically
      for (const r of result.reactions) expect(r.values.LC1[1]).toBeCloseTo(15000, 6);
      // the report is drawn from the file the job ran (version 1), not the model's latest
      const { gatherReportSources } = await import("~/lib/report/render.server");
      const { getModelVersion } = await import("~/lib/models/versions.server");
      const sources = await gatherReportSources(jobId);
      const [ran, latest] = [await getModelVersion(id, 1, database), await getModelVersion(id, 2, database)];
      expect(sources.modelKey).toBe(ran!.fileKey);
      expect(sources.modelKey).not.toBe(latest!.fileKey);
      expect(sources.meta.model.sha256).toBe(ran!.sha256);
    } finally {
      await runner.stop(0);
      await pool.destroy();
    }
  }, 60_000);
});

describe("POST /api/models/import", () => {
  it("files a model from CSV files (201), and refuses a broken one with file, row and column, storing nothing", async () => {
    const { modelToCsvFiles } = await import("~/lib/models/spreadsheet");
    const { models } = await import("~/db/schema");
    const route = await import("~/routes/api/models.import");
    const csv = modelToCsvFiles(twoBarModel("Imported canopy frame"));
    const send = (members: string) => {
      const f = form({ projectId });
      f.set("nodes", new Blob([csv.nodes], { type: "text/csv" }), "nodes.csv");
      f.set("members", new Blob([members], { type: "text/csv" }), "members.csv");
      f.set("loads", new Blob([csv.loads], { type: "text/csv" }), "loads.csv");
      f.set("settings", new Blob([csv.settings], { type: "application/json" }), "settings.json");
      return call(route.action, new Request(url("/api/models/import"), { method: "POST", body: f, headers: auth(engineer.key) }));
    };
    const before = (await database.select().from(models)).length;
    const bad = await send(csv.members.replace(",A,C,", ",A,Z,"));
    expect(bad.status).toBe(400);
    const body = (await bad.json()) as { details: { path: string }[] };
    expect(body.details[0]!.path).toBe("members.csv row 2 end");
    expect((await database.select().from(models)).length).toBe(before);
    const ok = await send(csv.members);
    expect(ok.status).toBe(201);
    const { id } = (await ok.json()) as { id: string };
    expect(JSON.parse(await (await fileOf(id, 1)).text())).toEqual(twoBarModel("Imported canopy frame"));
  });
});
