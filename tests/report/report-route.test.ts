// GET /api/jobs/:id/report end to end in-process: a real session, the database rows, the
// result and model file in the S3 fake; the PDF read back with poppler. The cache in the
// bucket is keyed by the job and its latest review, so a decision yields a new report.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeJob, makeUser, req, sessionCookie, setup } from "../auth/helpers";
import { pageTexts } from "./pdf-text";
import { warrenFixture } from "./warren-fixture";

let ctx: Awaited<ReturnType<typeof setup>>;
let route: typeof import("~/routes/api/jobs.$jobId.report");
let render: typeof import("~/lib/report/render.server");
let viewerCookie: string;
let jobId: string;
let engineerId: string;
let checkerId: string;
const fx = warrenFixture({ panels: 6 });

async function get(id: string, cookie?: string): Promise<Response> {
  try {
    return (await route.loader({ request: req(`/api/jobs/${id}/report`, { cookie }), params: { jobId: id }, context: {} } as never)) as Response;
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

beforeAll(async () => {
  ctx = await setup();
  const { putObject } = await import("~/lib/storage.server");
  const { jobs, models } = await import("~/db/schema");
  const { eq } = await import("drizzle-orm");
  route = await import("~/routes/api/jobs.$jobId.report");
  render = await import("~/lib/report/render.server");
  const engineer = await makeUser("ines.okafor@brightspan.example", "engineer", "Ines Okafor");
  const checker = await makeUser("priya.v@brightspan.example", "checker", "Priya Vantongeren");
  await makeUser("olu.c@brightspan.example", "viewer", "Olu Castellane");
  engineerId = engineer.id;
  checkerId = checker.id;
  viewerCookie = await sessionCookie("olu.c@brightspan.example");
  const job = await makeJob({ submittedBy: engineer.id, code: "FLD-24" });
  jobId = job.jobId;
  await putObject(`models/${job.modelId}.json`, JSON.stringify(fx.model), "application/json");
  await putObject(`results/${jobId}.json`, JSON.stringify(fx.result), "application/json");
  await ctx.db.update(jobs).set({ resultKey: `results/${jobId}.json`, outcome: "optimal" }).where(eq(jobs.id, jobId));
  await ctx.db.update(models).set({ name: "Warren roof truss, 6 panels", sha256: "ab".repeat(32) }).where(eq(models.id, job.modelId));
}, 120_000);
afterAll(async () => ctx?.services.stop());

describe("GET /api/jobs/:id/report", () => {
  it("refuses an anonymous caller", async () => {
    expect((await get(jobId)).status).toBe(401);
  });

  it("serves the PDF with a file name naming project, model and job, marked NOT REVIEWED", async () => {
    const res = await get(jobId, viewerCookie);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("content-disposition")).toBe(`attachment; filename="FLD-24-Warren-roof-truss-6-panels-job-${jobId}.pdf"`);
    expect(res.headers.get("x-report-cache")).toBe("miss");
    const pages = await pageTexts(new Uint8Array(await res.arrayBuffer()));
    expect(pages[0]).toContain(jobId);
    expect(pages[0]).toContain("ab".repeat(32));
    expect(pages[0]).toContain("Ines Okafor <ines.okafor@brightspan.example>");
    for (const p of pages) expect(p).toContain("NOT REVIEWED");
  });

  it("answers a repeat download from the bucket cache", async () => {
    const res = await get(jobId, viewerCookie);
    expect(res.headers.get("x-report-cache")).toBe("hit");
    const { getObject } = await import("~/lib/storage.server");
    expect(await getObject(render.reportCacheKey(jobId, null))).not.toBeNull();
  });

  it("regenerates after a decision, now with the approval on every page", async () => {
    const { reviews } = await import("~/db/schema");
    await ctx.db.insert(reviews).values({
      id: "rev-route-1",
      jobId,
      reviewerId: checkerId,
      decision: "approved",
      comment: "Section forces agree with my hand check.",
      createdAt: new Date("2026-11-30T15:10:00Z"),
    });
    const res = await get(jobId, viewerCookie);
    expect(res.headers.get("x-report-cache")).toBe("miss");
    const pages = await pageTexts(new Uint8Array(await res.arrayBuffer()));
    for (const p of pages) {
      expect(p).toContain("APPROVED by Priya Vantongeren on 2026-11-30 15:10:00 UTC");
      expect(p).not.toContain("NOT REVIEWED");
    }
    expect(pages[0]).toContain("Section forces agree with my hand check.");
    const { getObject } = await import("~/lib/storage.server");
    expect(await getObject(render.reportCacheKey(jobId, "rev-route-1"))).not.toBeNull();
  });

  it("answers 409 for a job that did not succeed and 404 for an unknown job", async () => {
    const failed = await makeJob({ submittedBy: engineerId, status: "failed" });
    const r409 = await get(failed.jobId, viewerCookie);
    expect(r409.status).toBe(409);
    expect(((await r409.json()) as { error: string }).error).toContain(`Job ${failed.jobId} is failed`);
    const r404 = await get("no-such-job", viewerCookie);
    expect(r404.status).toBe(404);
    expect(((await r404.json()) as { error: string }).error).toBe("Job no-such-job not found");
  });

  it("says plainly when the stored result is missing, without a stack trace", async () => {
    const { jobs } = await import("~/db/schema");
    const { eq } = await import("drizzle-orm");
    const lost = await makeJob({ submittedBy: engineerId });
    await ctx.db.update(jobs).set({ resultKey: `results/${lost.jobId}.json` }).where(eq(jobs.id, lost.jobId));
    const res = await get(lost.jobId, viewerCookie);
    expect(res.status).toBe(500);
    const body = (await res.json()) as { error: string };
    expect(body.error).toBe(`The stored result of job ${lost.jobId} is missing from the bucket (results/${lost.jobId}.json)`);
    expect(JSON.stringify(body)).not.toMatch(/at .*\.ts:\d+/);
  });
});
