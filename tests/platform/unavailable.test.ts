// Requests while something they need is down or overloaded, through the real route modules:
// a 503 that names the service (storage, database) in words instead of a bare 500; mail is
// never needed by a request (it waits in the outbox), so a request that mails still answers;
// a heavy request past the web threads' time limit, or beyond their queue, gets a 503 in words
// and the threads go on serving. Downloads of results and model files are passed on as streams.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeJob, makeUser, req, sessionCookie, setup } from "../auth/helpers";
import { warrenFixture } from "../report/warren-fixture";

// before the first config(): a short limit for the route, a queue of one for the busy check
process.env.WEB_TASK_TIMEOUT_MS = "500";
process.env.WEB_TASK_QUEUE = "1";

let ctx: Awaited<ReturnType<typeof setup>>;
let cookie: string;
let engineerEmail: string;
let small: { jobId: string; modelId: string };
let large: { jobId: string; modelId: string };
const smallFx = warrenFixture({ panels: 6 });
// 2,503 members: seconds of drawing, far past a 500 ms limit (bench/report.bench.ts)
const largeFx = warrenFixture({ panels: 626, loadScale: (8 / 626) ** 2 });

async function call(modulePath: string, kind: "loader" | "action", request: Request, params: Record<string, string> = {}): Promise<Response> {
  const mod = (await import(/* @vite-ignore */ modulePath)) as Record<string, (args: unknown) => Promise<unknown>>;
  try {
    const out = await mod[kind]!({ request, params, context: {} });
    return out instanceof Response ? out : Response.json(out);
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

async function storedJob(fx: ReturnType<typeof warrenFixture>, submittedBy: string) {
  const { putObject } = await import("~/lib/storage.server");
  const { jobs, models } = await import("~/db/schema");
  const { eq } = await import("drizzle-orm");
  const job = await makeJob({ submittedBy });
  const modelText = JSON.stringify(fx.model);
  await putObject(`models/${job.modelId}.json`, modelText, "application/json");
  await putObject(`results/${job.jobId}.json`, JSON.stringify(fx.result), "application/json");
  await ctx.db.update(jobs).set({ resultKey: `results/${job.jobId}.json`, outcome: "optimal" }).where(eq(jobs.id, job.jobId));
  await ctx.db.update(models).set({ sizeBytes: modelText.length }).where(eq(models.id, job.modelId));
  return job;
}

beforeAll(async () => {
  ctx = await setup();
  engineerEmail = "tove.marsh@harrowgate-eng.test";
  const engineer = await makeUser(engineerEmail, "engineer", "Tove Marsh");
  cookie = await sessionCookie(engineerEmail);
  small = await storedJob(smallFx, engineer.id);
  large = await storedJob(largeFx, engineer.id);
  // model versions: the file route reads the version rows (made on upload; here by hand)
  const { modelVersions } = await import("~/db/schema");
  for (const j of [small, large])
    await ctx.db.insert(modelVersions).values({
      id: `${j.modelId}-v1`,
      modelId: j.modelId,
      version: 1,
      name: "deck truss",
      fileName: "deck.json",
      fileKey: `models/${j.modelId}.json`,
      sha256: "0".repeat(64),
      sizeBytes: 10,
      dimension: 2,
      nodeCount: 3,
      memberCount: 3,
      hasDesign: true,
      summary: {},
      warnings: [],
    });
}, 120_000);
afterAll(async () => ctx?.services.stop());

describe("downloads are streamed from the bucket", () => {
  it("the result and the model file come back whole, with their length", async () => {
    const result = await call("~/routes/api/jobs.$jobId.result", "loader", req(`/api/jobs/${large.jobId}/result`, { cookie }), { jobId: large.jobId });
    expect(result.status).toBe(200);
    expect(result.body).toBeInstanceOf(ReadableStream);
    const text = await result.text();
    expect(Number(result.headers.get("content-length"))).toBe(new TextEncoder().encode(text).byteLength);
    expect(JSON.parse(text).members).toHaveLength(largeFx.result.members.length);

    const file = await call("~/routes/api/models.$modelId.file", "loader", req(`/api/models/${small.modelId}/file`, { cookie }), { modelId: small.modelId });
    expect(file.status).toBe(200);
    expect(await file.json()).toEqual(smallFx.model);
  });
});

describe("heavy requests on the web threads", () => {
  it("a report past the time limit answers 503 saying so; the threads then draw the next one", { timeout: 120_000 }, async () => {
    const { gatherReportInputs } = await import("~/lib/report/render.server");
    const { renderReportOnThread } = await import("~/lib/web-pool.server");
    // warm the thread (start-up is not part of a request's limit)
    expect((await renderReportOnThread(await gatherReportInputs(small.jobId), { timeoutMs: 60_000 })).ok).toBe(true);

    const t0 = Date.now();
    const res = await call("~/routes/api/jobs.$jobId.report", "loader", req(`/api/jobs/${large.jobId}/report`, { cookie }), { jobId: large.jobId });
    const took = Date.now() - t0;
    expect(res.status).toBe(503);
    expect(res.headers.get("retry-after")).toBeTruthy();
    const body = (await res.json()) as { error: string; limit: string };
    expect(body).toEqual({ error: expect.stringContaining("Drawing the report took longer than 500 ms, the limit for one request, and was stopped"), limit: "time" });
    // stopped at the limit, not when the drawing would have ended
    expect(took).toBeLessThan(5000);

    const after = await renderReportOnThread(await gatherReportInputs(small.jobId), { timeoutMs: 60_000 });
    expect(after.ok).toBe(true);
  });

  it("beyond the queue, a heavy request is refused at once as busy, in words", { timeout: 120_000 }, async () => {
    const { gatherReportInputs } = await import("~/lib/report/render.server");
    const { renderReportOnThread } = await import("~/lib/web-pool.server");
    const { HeavyTaskStoppedError } = await import("~/lib/heavy-task");
    const inputs = await gatherReportInputs(large.jobId);
    // the same 500 ms the test above proves the large report needs more than: at 2 s the first
    // drawing sometimes finished in time on a quiet machine
    const attempt = () => renderReportOnThread(inputs, { timeoutMs: 500 }).then(() => null, (e: unknown) => e);
    // one drawing runs (WEB_THREADS=1), one more waits (WEB_TASK_QUEUE=1), the third finds no room
    const errors = await Promise.all([attempt(), attempt(), attempt()]);
    const whys = errors.map((e) => (e instanceof HeavyTaskStoppedError ? e.why : String(e)));
    expect(whys.filter((w) => w === "busy")).toHaveLength(1);
    expect(whys.filter((w) => w === "time")).toHaveLength(2);
    const busy = errors.find((e) => e instanceof HeavyTaskStoppedError && e.why === "busy") as Error;
    expect(busy.message).toBe("The server is busy: 1 large report or upload is already waiting. Drawing the report was not started; try again in a minute.");
  });
});

describe("a service that is down is named, never a bare 500", () => {
  it("with the mail server down, a request that mails still answers; the mail waits in the outbox with the reason", { timeout: 60_000 }, async () => {
    await ctx.services.mail.stop();
    const form = new URLSearchParams({ email: engineerEmail });
    const res = await call(
      "~/routes/forgot-password",
      "action",
      req("/forgot-password", { method: "POST", cookie: "x=1", headers: { "content-type": "application/x-www-form-urlencoded", "x-forwarded-for": "10.9.8.7" }, body: form }),
    );
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ sent: true, errors: {} });
    const { MailSender } = await import("~/lib/mail/sender.server");
    const { listUndeliveredMail } = await import("~/lib/mail/outbox.server");
    // the account's own address-confirmation mail may wait beside it: only the reset is this
    // request's; the sign-in library may write it just after answering, so wait for its row
    const resetMail = async () => (await listUndeliveredMail(ctx.db)).filter((m) => m.to === engineerEmail && m.kind === "password-reset");
    for (let t = 0; t < 100 && (await resetMail()).length === 0; t++) await new Promise((r) => setTimeout(r, 100));
    await new MailSender({ db: ctx.db, senderId: "unavailable-test", log: () => undefined }).deliverDue();
    const waiting = await resetMail();
    expect(waiting).toHaveLength(1);
    expect(waiting[0]).toMatchObject({ state: "pending", attempts: 1 });
    expect(waiting[0]!.lastError).toMatch(/^The mail server could not be reached/);
  });

  it("a write while the database stays locked past its busy timeout: 503 naming the database", { timeout: 60_000 }, async () => {
    const { createClient } = await import("@libsql/client");
    const other = createClient({ url: ctx.services.env.DATABASE_URL! });
    // another process's long write transaction holds the lock
    const tx = await other.transaction("write");
    await tx.execute("insert into projects (id, code, name) values ('lock-holder', 'LOCK-1', 'Lock holder')");
    try {
      const res = await call(
        "~/routes/api/projects",
        "action",
        req("/api/projects", { method: "POST", cookie, headers: { "content-type": "application/json" }, body: JSON.stringify({ code: "WH-7", name: "Weir House canopy" }) }),
      );
      expect(res.status).toBe(503);
      expect(res.headers.get("retry-after")).toBe("5");
      expect(await res.json()).toEqual({ error: "The database is not answering. Try again in a moment.", dependency: "database" });
    } finally {
      await tx.rollback();
      other.close();
    }
    // the lock is gone: the next write is stored for every connection, not only for this
    // process's (app/db/busy-recovery.ts; libsql-client-ts#352)
    const again = await call(
      "~/routes/api/projects",
      "action",
      req("/api/projects", { method: "POST", cookie, headers: { "content-type": "application/json" }, body: JSON.stringify({ code: "WH-8", name: "Weir House gantry" }) }),
    );
    expect(again.status).toBe(201);
    const reader = createClient({ url: ctx.services.env.DATABASE_URL! });
    try {
      const rows = await reader.execute("select name from projects where code = 'WH-8'");
      expect(rows.rows.map((r) => r.name)).toEqual(["Weir House gantry"]);
    } finally {
      reader.close();
    }
  });

  it("with the object store down, the model file and result answer 503 naming storage", { timeout: 60_000 }, async () => {
    await ctx.services.s3.stop();
    for (const [mod, url, params] of [
      ["~/routes/api/models.$modelId.file", `/api/models/${small.modelId}/file`, { modelId: small.modelId }],
      ["~/routes/api/jobs.$jobId.result", `/api/jobs/${small.jobId}/result`, { jobId: small.jobId }],
    ] as const) {
      const res = await call(mod, "loader", req(url, { cookie }), params);
      expect(res.status, url).toBe(503);
      const body = (await res.json()) as { error: string; dependency: string };
      expect(body).toEqual({ error: "The object store (models, results and reports) is not answering. Try again in a moment.", dependency: "storage" });
    }
  });
});
