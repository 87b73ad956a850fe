// The review rules of product.md: checkers only, never one's own job (four-eyes), only a
// succeeded job, a comment when returning it, and decisions that are never edited.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeJob, makeUser, req, sessionCookie, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
const ids: Record<string, string> = {};
const cookies: Record<string, string> = {};

beforeAll(async () => {
  ctx = await setup();
  for (const [who, role] of [["engineer", "engineer"], ["checker", "checker"], ["checker2", "checker"], ["viewer", "viewer"], ["admin", "admin"]] as const) {
    const u = await makeUser(`${who}@harrowgate-structures.example`, role);
    ids[who] = u.id;
    cookies[who] = await sessionCookie(u.email);
  }
});
afterAll(async () => ctx?.services.stop());

async function post(jobId: string, who: string, body: unknown) {
  const { action } = await import("~/routes/api/jobs.$jobId.reviews");
  const request = req(`/api/jobs/${jobId}/reviews`, { method: "POST", cookie: cookies[who], body: JSON.stringify(body), headers: { "content-type": "application/json" } });
  try {
    return (await action({ request, params: { jobId }, context: {} } as never)) as Response;
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

describe("four-eyes review", () => {
  it("a checker approves an engineer's succeeded job: 201, recorded with who and when", async () => {
    const { jobId } = await makeJob({ submittedBy: ids.engineer! });
    const res = await post(jobId, "checker", { decision: "approved", comment: "Checked member forces by hand for load case 1" });
    expect(res.status).toBe(201);
    const review = await res.json();
    expect(review).toMatchObject({ jobId, reviewerId: ids.checker, decision: "approved", current: true, supersededBy: null });
    expect(Date.parse(review.createdAt)).toBeGreaterThan(Date.now() - 60_000);
  });

  it("nobody reviews a job they submitted: 403 naming the four-eyes rule", async () => {
    // a checker who submitted a job (an admin can submit and also holds review:job)
    const { jobId } = await makeJob({ submittedBy: ids.admin! });
    const res = await post(jobId, "admin", { decision: "approved", comment: "" });
    expect(res.status).toBe(403);
    expect((await res.json()).error).toMatch(/four-eyes rule/i);
  });

  it("engineers and viewers may not review: 403 naming the permission", async () => {
    const { jobId } = await makeJob({ submittedBy: ids.admin! });
    for (const who of ["engineer", "viewer"]) {
      const res = await post(jobId, who, { decision: "approved", comment: "" });
      expect(res.status).toBe(403);
      expect((await res.json()).error).toMatch(new RegExp(`needs permission review:job; your role is ${who}`));
    }
  });

  it("anonymous callers get 401", async () => {
    const { jobId } = await makeJob({ submittedBy: ids.engineer! });
    cookies.nobody = "";
    const res = await post(jobId, "nobody", { decision: "approved" });
    expect(res.status).toBe(401);
  });

  it.each(["queued", "running", "failed", "cancelled"] as const)("a %s job cannot be reviewed: 409", async (status) => {
    const { jobId } = await makeJob({ submittedBy: ids.engineer!, status });
    const res = await post(jobId, "checker", { decision: "approved", comment: "" });
    expect(res.status).toBe(409);
    expect((await res.json()).error).toContain(status);
  });

  it("an infeasible run has no design to approve: 409, but it can be returned with comments", async () => {
    const { jobId } = await makeJob({ submittedBy: ids.engineer!, outcome: "infeasible" });
    const res = await post(jobId, "checker", { decision: "approved", comment: "" });
    expect(res.status).toBe(409);
    expect((await res.json()).error).toMatch(/ended infeasible: it has no design to approve/);
    const back = await post(jobId, "checker", { decision: "changes-requested", comment: "Widen the area bounds of the tie" });
    expect(back.status).toBe(201);
  });

  it("returning a job needs a comment: 400 on the comment field", async () => {
    const { jobId } = await makeJob({ submittedBy: ids.engineer! });
    const res = await post(jobId, "checker", { decision: "changes-requested", comment: "   " });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.details).toEqual([expect.objectContaining({ path: "comment" })]);
  });

  it("an unknown job is 404, an unknown decision 400", async () => {
    expect((await post("no-such-job", "checker", { decision: "approved" })).status).toBe(404);
    const { jobId } = await makeJob({ submittedBy: ids.engineer! });
    expect((await post(jobId, "checker", { decision: "looks fine" })).status).toBe(400);
  });
});

describe("decisions are never edited", () => {
  it("a later decision supersedes the earlier one and both stay visible", async () => {
    const { listReviews } = await import("~/lib/auth/reviews.server");
    const { jobId } = await makeJob({ submittedBy: ids.engineer! });
    expect((await post(jobId, "checker", { decision: "changes-requested", comment: "Bottom chord deflection limit looks too loose" })).status).toBe(201);
    expect((await post(jobId, "checker2", { decision: "approved", comment: "Limit confirmed with the client" })).status).toBe(201);
    const all = await listReviews(jobId);
    expect(all.map((r) => [r.decision, r.current])).toEqual([
      ["changes-requested", false],
      ["approved", true],
    ]);
    expect(all[0]!.supersededBy).toBe(all[1]!.id);
    expect(all[0]!.comment).toBe("Bottom chord deflection limit looks too loose");
  });

  it("the database itself refuses to update or delete a decision", async () => {
    const { reviews } = await import("~/db/schema");
    const { eq } = await import("drizzle-orm");
    const { jobId } = await makeJob({ submittedBy: ids.engineer! });
    const created = await (await post(jobId, "checker", { decision: "approved", comment: "ok" })).json();
    await expect(ctx.db.update(reviews).set({ decision: "changes-requested" }).where(eq(reviews.id, created.id))).rejects.toThrow();
    await expect(ctx.db.delete(reviews).where(eq(reviews.id, created.id))).rejects.toThrow();
    const row = await ctx.db.query.reviews.findFirst({ where: eq(reviews.id, created.id) });
    expect(row?.decision).toBe("approved");
  });

  it("a re-run of the same model is a new job that needs its own review", async () => {
    const { currentReview } = await import("~/lib/auth/reviews.server");
    const { jobs } = await import("~/db/schema");
    const first = await makeJob({ submittedBy: ids.engineer! });
    await post(first.jobId, "checker", { decision: "approved", comment: "" });
    const rerunId = crypto.randomUUID();
    await ctx.db.insert(jobs).values({ id: rerunId, projectId: first.projectId, modelId: first.modelId, submittedBy: ids.engineer!, status: "succeeded", options: {} });
    expect((await currentReview(first.jobId))?.decision).toBe("approved");
    expect(await currentReview(rerunId)).toBeNull();
  });

  it("each decision is in the audit trail", async () => {
    const { listAudit } = await import("~/lib/auth/audit.server");
    const rows = await listAudit({ action: "review." });
    expect(rows.length).toBeGreaterThanOrEqual(4);
    expect(rows.every((r) => r.actorId && r.entityType === "job")).toBe(true);
  });
});

describe("an approved run is closed (issue 16)", () => {
  it("refuses a later decision, until an admin reopens it with a reason that reaches the audit trail", async () => {
    const { reopenReview, listReviews } = await import("~/lib/auth/reviews.server");
    const { listAudit } = await import("~/lib/auth/audit.server");
    const { jobId } = await makeJob({ submittedBy: ids.engineer! });
    expect((await post(jobId, "checker", { decision: "approved", comment: "Checked" })).status).toBe(201);
    const flipped = await post(jobId, "checker2", { decision: "changes-requested", comment: "Second thoughts" });
    expect(flipped.status).toBe(409);
    expect((await flipped.json()).error).toMatch(/approved run is closed/);

    const admin = { id: ids.admin!, role: "admin", email: "admin@harrowgate-structures.example", name: "admin" } as never;
    const checker = { id: ids.checker!, role: "checker", email: "checker@harrowgate-structures.example", name: "checker" } as never;
    await expect(reopenReview({ jobId, admin: checker, reason: "The client changed the snow load" })).rejects.toMatchObject({ status: 403 });
    await expect(reopenReview({ jobId, admin, reason: "short" })).rejects.toMatchObject({ status: 400 });
    const reopened = await reopenReview({ jobId, admin, reason: "The client changed the snow load" });
    expect(reopened.decision).toBe("reopened");
    expect((await listAudit({ action: "review.reopen" })).some((r) => r.entityId === jobId)).toBe(true);

    expect((await post(jobId, "checker2", { decision: "changes-requested", comment: "Re-check with the new snow load" })).status).toBe(201);
    expect((await listReviews(jobId)).map((r) => r.decision)).toEqual(["approved", "reopened", "changes-requested"]);
  });
});
