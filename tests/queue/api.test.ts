// The model and job routes of api.md, called in-process with real API keys: status codes,
// bodies, role checks, pagination, and the audit trail of uploads, submits and cancels.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TestServices } from "../support/services";
import { gridModel, twoBarModel } from "./support/models";
import { makeAccount, makeProject, setupQueue } from "./support/setup";

let services: TestServices;
let database: Db;
let projectId: string;
let engineer: Awaited<ReturnType<typeof makeAccount>>;
let colleague: Awaited<ReturnType<typeof makeAccount>>;
let viewer: Awaited<ReturnType<typeof makeAccount>>;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue({ UPLOAD_LIMIT_BYTES: "40000" }));
  engineer = await makeAccount("engineer", "Tamsin Grue");
  colleague = await makeAccount("engineer", "Rafe Oakhanger");
  viewer = await makeAccount("viewer", "Dora Pellew");
  projectId = await makeProject();
});
afterAll(async () => services?.stop());

type Args = { request: Request; params: Record<string, string>; context: unknown };
const args = (request: Request, params: Record<string, string> = {}) => ({ request, params, context: {} }) as Args as never;
const url = (p: string) => `http://localhost:4430${p}`;
const auth = (key?: string): Record<string, string> => (key ? { authorization: `Bearer ${key}` } : {});

async function call(fn: (a: never) => Promise<Response>, request: Request, params: Record<string, string> = {}): Promise<Response> {
  try {
    return await fn(args(request, params));
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

function uploadRequest(key: string | undefined, body: { file?: string; projectId?: string; fileName?: string }) {
  const form = new FormData();
  if (body.file !== undefined) form.set("file", new Blob([body.file], { type: "application/json" }), body.fileName ?? "frame.truss.json");
  if (body.projectId !== undefined) form.set("projectId", body.projectId);
  return new Request(url("/api/models"), { method: "POST", body: form, headers: auth(key) });
}

async function upload(model = twoBarModel()) {
  const route = await import("~/routes/api/models");
  const res = await call(route.action, uploadRequest(engineer.key, { file: JSON.stringify(model), projectId }));
  expect(res.status).toBe(201);
  return (await res.json()) as { id: string; name: string; sha256: string; summary: unknown; warnings: unknown[] };
}

async function submit(key: string, body: unknown) {
  const route = await import("~/routes/api/jobs");
  return call(route.action, new Request(url("/api/jobs"), { method: "POST", body: JSON.stringify(body), headers: { ...auth(key), "content-type": "application/json" } }));
}

describe("POST /api/models", () => {
  it("answers 201 with id, name, sha256, summary and warnings; the file and metadata read back", async () => {
    const created = await upload();
    expect(created).toMatchObject({ name: "Queue probe: two-bar frame", sha256: expect.stringMatching(/^[0-9a-f]{64}$/), warnings: expect.any(Array) });
    const one = await import("~/routes/api/models.$modelId");
    const meta = await call(one.loader, new Request(url(`/api/models/${created.id}`), { headers: auth(viewer.key) }), { modelId: created.id });
    expect(meta.status).toBe(200);
    expect(await meta.json()).toMatchObject({ id: created.id, projectId, memberCount: 2 });
    const file = await import("~/routes/api/models.$modelId.file");
    const f = await call(file.loader, new Request(url(`/api/models/${created.id}/file`), { headers: auth(viewer.key) }), { modelId: created.id });
    expect(f.status).toBe(200);
    expect(JSON.parse(await f.text())).toEqual(twoBarModel());
    const missing = await call(one.loader, new Request(url("/api/models/nope"), { headers: auth(viewer.key) }), { modelId: "nope" });
    expect(missing.status).toBe(404);
  });

  it("refuses a viewer (403), an anonymous caller (401), a JSON body (415), an incomplete form (400), an invalid model (400) and an oversize file (413)", async () => {
    const route = await import("~/routes/api/models");
    const good = JSON.stringify(twoBarModel());
    expect((await call(route.action, uploadRequest(viewer.key, { file: good, projectId }))).status).toBe(403);
    expect((await call(route.action, uploadRequest(undefined, { file: good, projectId }))).status).toBe(401);
    const asJson = new Request(url("/api/models"), { method: "POST", body: good, headers: { ...auth(engineer.key), "content-type": "application/json" } });
    expect((await call(route.action, asJson)).status).toBe(415);
    const incomplete = await call(route.action, uploadRequest(engineer.key, { file: good }));
    expect(incomplete.status).toBe(400);
    expect(await incomplete.json()).toMatchObject({ details: [{ path: "projectId" }] });
    const bad = { ...twoBarModel(), members: [{ id: "AC", start: "A", end: "Z", material: "steel", area: 1000 }] };
    const invalid = await call(route.action, uploadRequest(engineer.key, { file: JSON.stringify(bad), projectId }));
    expect(invalid.status).toBe(400);
    const body = (await invalid.json()) as { error: string; details: { path: string; message: string }[] };
    expect(body.details.some((d) => d.path.startsWith("members[0]"))).toBe(true);
    const big = await call(route.action, uploadRequest(engineer.key, { file: JSON.stringify(gridModel(30, 4)), projectId }));
    expect(big.status).toBe(413);
    expect(((await big.json()) as { error: string }).error).toMatch(/upload limit of 0\.04 MB/);
  });
});

describe("jobs API", () => {
  it("queues (202), validates options (400 naming the field), refuses viewers and unknown models", async () => {
    const m = await upload();
    const ok = await submit(engineer.key, { modelId: m.id, options: { formulation: "simultaneous", maxIterations: 80 } });
    expect(ok.status).toBe(202);
    const okBody = (await ok.json()) as { id: string; status: string };
    expect(okBody).toEqual({ id: expect.any(String), status: "queued" });
    const badOption = await submit(engineer.key, { modelId: m.id, options: { maxIterations: 0 } });
    expect(badOption.status).toBe(400);
    expect(await badOption.json()).toMatchObject({ details: [{ path: "options.maxIterations" }] });
    const unknownOption = await submit(engineer.key, { modelId: m.id, options: { speed: "fast" } });
    expect(unknownOption.status).toBe(400);
    expect((await submit(engineer.key, { modelId: "no-such-model" })).status).toBe(404);
    expect((await submit(engineer.key, {})).status).toBe(400);
    expect((await submit(viewer.key, { modelId: m.id })).status).toBe(403);
    // a run answering a returned run of the same model records it, and the job JSON says so;
    // a run of another model is refused in words
    const answering = await submit(engineer.key, { modelId: m.id, answersJobId: okBody.id });
    expect(answering.status).toBe(202);
    const jobRoute = await import("~/routes/api/jobs.$jobId");
    const answeringId = ((await answering.json()) as { id: string }).id;
    const read = await call(jobRoute.loader, new Request(url(`/api/jobs/${answeringId}`), { headers: auth(viewer.key) }), { jobId: answeringId });
    expect(((await read.json()) as { answersJobId: string | null }).answersJobId).toBe(okBody.id);
    const other = await upload({ ...twoBarModel(), name: "Another frame" });
    const wrong = await submit(engineer.key, { modelId: other.id, answersJobId: answeringId });
    expect(wrong.status).toBe(400);
    expect(((await wrong.json()) as { error: string }).error).toMatch(/is not a run of model "Another frame"/);
  });

  it("lists newest first with filters and a cursor that walks every job once", async () => {
    const m = await upload(twoBarModel("Queue probe: listing"));
    const ids: string[] = [];
    for (let i = 0; i < 7; i++) ids.push(((await (await submit(engineer.key, { modelId: m.id })).json()) as { id: string }).id);
    const list = await import("~/routes/api/jobs");
    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const q: string = `/api/jobs?projectId=${projectId}&status=queued&limit=3${cursor ? `&cursor=${cursor}` : ""}`;
      const res = await call(list.loader, new Request(url(q), { headers: auth(viewer.key) }));
      expect(res.status).toBe(200);
      const page = (await res.json()) as { jobs: { id: string; modelId: string; modelName: string }[]; nextCursor: string | null };
      seen.push(...page.jobs.filter((j) => j.modelId === m.id).map((j) => j.id));
      cursor = page.nextCursor;
      pages++;
    } while (cursor && pages < 20);
    expect(seen).toEqual([...ids].reverse());
    const badStatus = await call(list.loader, new Request(url("/api/jobs?status=finished"), { headers: auth(viewer.key) }));
    expect(badStatus.status).toBe(400);
    expect(await badStatus.json()).toMatchObject({ details: [{ path: "status.0" }] });
    expect((await call(list.loader, new Request(url("/api/jobs?cursor=%%%"), { headers: auth(viewer.key) }))).status).toBe(400);
    expect((await call(list.loader, new Request(url("/api/jobs?limit=5000"), { headers: auth(viewer.key) }))).status).toBe(400);
    expect((await call(list.loader, new Request(url("/api/jobs")))).status).toBe(401);
  });

  it("reads a job with progress and reviews, answers 409 for the result until it succeeded, then the result JSON", async () => {
    const m = await upload(twoBarModel("Queue probe: reading"));
    const { id } = (await (await submit(engineer.key, { modelId: m.id })).json()) as { id: string };
    const one = await import("~/routes/api/jobs.$jobId");
    const res = await call(one.loader, new Request(url(`/api/jobs/${id}`), { headers: auth(viewer.key) }), { jobId: id });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ id, status: "queued", outcome: null, progress: null, summary: null, reviews: [] });
    const result = await import("~/routes/api/jobs.$jobId.result");
    const early = await call(result.loader, new Request(url(`/api/jobs/${id}/result`), { headers: auth(viewer.key) }), { jobId: id });
    expect(early.status).toBe(409);
    const progress = await import("~/routes/api/jobs.$jobId.progress");
    const p = await call(progress.loader, new Request(url(`/api/jobs/${id}/progress`), { headers: auth(viewer.key) }), { jobId: id });
    expect(await p.json()).toMatchObject({ id, status: "queued", history: [] });

    // let a worker run it
    const { createSolvePool } = await import("../../workers/pool");
    const { QueueRunner } = await import("../../workers/queue-runner");
    const pool = createSolvePool({ threads: 1, maxOldGenerationMb: 512 });
    const runner = new QueueRunner({ db: database, pool, leaseMs: 5000, timeLimitMs: 60_000, maxOldGenerationMb: 512, idlePollMs: 50, notify: false, log: () => undefined });
    runner.start();
    try {
      const { getJob } = await import("~/lib/jobs/queue.server");
      for (let i = 0; i < 400 && (await getJob(id, database))?.status !== "succeeded"; i++) await new Promise((r) => setTimeout(r, 50));
    } finally {
      await runner.stop(0);
      await pool.destroy();
    }
    const late = await call(result.loader, new Request(url(`/api/jobs/${id}/result`), { headers: auth(viewer.key) }), { jobId: id });
    expect(late.status).toBe(200);
    const json = (await late.json()) as { format: string; status: string; model: string };
    expect(json).toMatchObject({ format: "strutwise.result", status: "optimal", model: "Queue probe: reading" });
    const after = (await (await call(one.loader, new Request(url(`/api/jobs/${id}`), { headers: auth(viewer.key) }), { jobId: id })).json()) as {
      status: string;
      outcome: string;
      progress: { iteration: number };
      summary: { iterations: number };
    };
    expect(after).toMatchObject({ status: "succeeded", outcome: "optimal" });
    expect(after.progress.iteration).toBeGreaterThan(0);
    const hist = (await (await call(progress.loader, new Request(url(`/api/jobs/${id}/progress`), { headers: auth(viewer.key) }), { jobId: id })).json()) as { history: unknown[] };
    expect(hist.history.length).toBeGreaterThan(1);
  });

  it("cancel: only the submitter or an admin, 409 once finished; uploads, submits and cancels are in the audit trail", async () => {
    const m = await upload(twoBarModel("Queue probe: cancelling"));
    const { id } = (await (await submit(engineer.key, { modelId: m.id })).json()) as { id: string };
    const cancel = await import("~/routes/api/jobs.$jobId.cancel");
    const post = (key: string | undefined) => new Request(url(`/api/jobs/${id}/cancel`), { method: "POST", headers: auth(key) });
    expect((await call(cancel.action, post(viewer.key), { jobId: id })).status).toBe(403);
    expect((await call(cancel.action, post(colleague.key), { jobId: id })).status).toBe(403);
    const ok = await call(cancel.action, post(engineer.key), { jobId: id });
    expect(ok.status).toBe(200);
    expect(await ok.json()).toMatchObject({ id, status: "cancelled" });
    // the job says who cancelled it by name, not by account id
    const { jobs } = await import("~/db/schema");
    const [row] = await database.select().from(jobs).where(eq(jobs.id, id));
    expect(row.error).toBe("Cancelled on request by Tamsin Grue (engineer)");
    expect((await call(cancel.action, post(engineer.key), { jobId: id })).status).toBe(409);
    expect((await call(cancel.action, post(engineer.key), { jobId: "no-such-job" })).status).toBe(404);

    const { auditLog } = await import("~/db/schema");
    const trail = await database.select().from(auditLog).where(eq(auditLog.actorId, engineer.id));
    const actions = new Set(trail.map((a) => a.action));
    expect(actions).toContain("model.upload");
    expect(actions).toContain("job.submit");
    expect(trail.some((a) => a.action === "job.cancel" && a.entityId === id)).toBe(true);
  });
});
