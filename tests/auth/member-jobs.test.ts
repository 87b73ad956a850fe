// A member's job list reads member_jobs, the database's own copy of project_members × jobs
// (app/db/tables/member-jobs.ts, kept by triggers). Two things must hold for that to change
// nothing but the speed:
// 1. the copy is exactly the join it stands for, after every kind of write: a job added,
//    its status or outcome changed, it moved or deleted; a member added, moved or removed;
// 2. a member's list, in every shape the pages and the API ask for (status, several
//    statuses, submitter, review state, cursor paging), is the unfiltered list with the
//    other projects' jobs taken out, in the same order (newest first, ties by id).
// The reference for 2 is computed here from the admin's list and the membership rows, not
// from the list code under test.
import { randomUUID } from "node:crypto";
import { and, desc, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeJob, makeUser, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
let viewer: { id: string; role: string };
let engineer: { id: string; role: string };
const admin = { id: "any", role: "admin" };
const projectsOfViewer: string[] = [];
const otherProjects: string[] = [];

/** member_jobs as it is, and the join it must equal; both in one order. */
async function copyAndJoin() {
  const copy = await ctx.db.all<Record<string, unknown>>(sql`select user_id, job_id, project_id, status, outcome, created_at from member_jobs order by user_id, job_id`);
  const join = await ctx.db.all<Record<string, unknown>>(
    sql`select m.user_id, j.id as job_id, j.project_id, j.status, j.outcome, j.created_at from project_members m join jobs j on j.project_id = m.project_id order by m.user_id, j.id`,
  );
  return { copy, join };
}

beforeAll(async () => {
  ctx = await setup();
  const { jobs } = await import("~/db/schema");
  const e = await makeUser("mira.holt@fenwick-yard.example", "engineer");
  const v = await makeUser("olan.reed@fenwick-yard.example", "viewer");
  engineer = { id: e.id, role: "engineer" };
  viewer = { id: v.id, role: "viewer" };
  // six projects, the viewer a member of three; a few jobs each, several of them created in
  // the same millisecond so that the order and the cursor fall back on the job id
  const at = Date.now() - 100_000;
  const statuses = ["succeeded", "failed", "queued", "running", "cancelled"] as const;
  for (let p = 0; p < 6; p++) {
    const mine = p % 2 === 0;
    const { projectId, modelId } = await makeJob({ submittedBy: engineer.id, members: mine ? [viewer.id] : [], code: `FY-${p}` });
    (mine ? projectsOfViewer : otherProjects).push(projectId);
    for (let i = 0; i < 7; i++) {
      await ctx.db.insert(jobs).values({
        id: randomUUID(),
        projectId,
        modelId,
        submittedBy: i % 3 === 0 ? viewer.id : engineer.id,
        status: statuses[(i + p) % statuses.length]!,
        // succeeded runs: optima a checker signs, and now and then an infeasible one (no review)
        outcome: statuses[(i + p) % statuses.length] === "succeeded" ? (i % 4 === 3 ? "infeasible" : "optimal") : null,
        options: {},
        createdAt: new Date(at + Math.floor((p * 7 + i) / 4) * 1000),
      });
    }
  }
});
afterAll(async () => ctx?.services.stop());

/** A checker's decision on the newest optimal run of each of the viewer's projects that has two
 * or more (approved and changes requested in turn); the other runs keep waiting. */
async function decideSome() {
  const { jobs, reviews } = await import("~/db/schema");
  let decided = 0;
  for (const projectId of projectsOfViewer) {
    const runs = await ctx.db.select().from(jobs).where(and(eq(jobs.projectId, projectId), eq(jobs.outcome, "optimal"))).orderBy(desc(jobs.createdAt));
    if (runs.length < 2) continue;
    await ctx.db.insert(reviews).values({ id: randomUUID(), jobId: runs[0]!.id, reviewerId: engineer.id, decision: decided++ % 2 === 0 ? "approved" : "changes-requested", comment: "checked" });
  }
  expect(decided).toBeGreaterThanOrEqual(2);
}

describe("member_jobs, the member's own job rows", () => {
  it("holds exactly project_members × jobs after every kind of write", async () => {
    const { jobs, projectMembers } = await import("~/db/schema");
    expect((await copyAndJoin()).copy.length).toBeGreaterThan(0);
    const check = async (after: string) => {
      const { copy, join } = await copyAndJoin();
      expect(copy, after).toEqual(join);
    };
    await check("the set-up's inserts");
    const [job] = await ctx.db.select().from(jobs).where(eq(jobs.projectId, projectsOfViewer[0]!)).limit(1);
    await ctx.db.update(jobs).set({ status: "running", startedAt: new Date() }).where(eq(jobs.id, job!.id));
    await check("a status change");
    await ctx.db.update(jobs).set({ status: "succeeded", outcome: "not-converged", finishedAt: new Date() }).where(eq(jobs.id, job!.id));
    await check("a run finished (status and outcome)");
    await ctx.db.update(jobs).set({ outcome: "optimal" }).where(eq(jobs.id, job!.id));
    await check("an outcome changed alone");
    await ctx.db.update(jobs).set({ progressIteration: 3 }).where(eq(jobs.id, job!.id));
    await check("a progress write (no listed column)");
    await ctx.db.update(jobs).set({ createdAt: new Date(job!.createdAt.getTime() + 1) }).where(eq(jobs.id, job!.id));
    await check("a changed creation time");
    await ctx.db.insert(projectMembers).values({ projectId: otherProjects[0]!, userId: viewer.id });
    await check("a member added");
    await ctx.db.insert(projectMembers).values({ projectId: otherProjects[0]!, userId: viewer.id }).onConflictDoNothing();
    await check("the same member added again (nothing to add)");
    await ctx.db.update(projectMembers).set({ projectId: otherProjects[1]! }).where(and(eq(projectMembers.projectId, otherProjects[0]!), eq(projectMembers.userId, viewer.id)));
    await check("a membership moved to another project");
    await ctx.db.delete(projectMembers).where(and(eq(projectMembers.projectId, otherProjects[1]!), eq(projectMembers.userId, viewer.id)));
    await check("a member removed");
    const [gone] = await ctx.db.select().from(jobs).where(eq(jobs.projectId, otherProjects[2]!)).limit(1);
    await ctx.db.delete(jobs).where(eq(jobs.id, gone!.id));
    await check("a job deleted");
  });

  it("gives a member the unfiltered list without the other projects' jobs, in every shape", async () => {
    const { listJobs } = await import("~/lib/jobs/queue.server");
    const { projectMembers } = await import("~/db/schema");
    await decideSome();
    const mine = new Set((await ctx.db.select().from(projectMembers).where(eq(projectMembers.userId, viewer.id))).map((m) => m.projectId));
    expect(mine.size).toBe(3);
    const shapes = [
      {},
      { status: "succeeded" as const },
      { status: ["queued" as const, "running" as const] },
      { submittedBy: viewer.id },
      { review: "waiting" as const },
      { review: "no-review" as const },
      { review: "approved" as const },
      { review: "changes-requested" as const },
    ];
    for (const shape of shapes) {
      const all = (await listJobs({ ...shape, limit: 200, visibleTo: admin }, ctx.db, { fresh: true })).jobs;
      const expected = all.filter((j) => mine.has(j.projectId)).map((j) => j.id);
      const whole = (await listJobs({ ...shape, limit: 200, visibleTo: viewer }, ctx.db, { fresh: true })).jobs.map((j) => j.id);
      expect(whole, JSON.stringify(shape)).toEqual(expected);
      expect(expected.length, `${JSON.stringify(shape)} has jobs of the member's to list`).toBeGreaterThan(0);
      // page by page, three at a time, through the cursor
      const paged: string[] = [];
      let cursor: string | null | undefined;
      do {
        const page = await listJobs({ ...shape, limit: 3, cursor, visibleTo: viewer }, ctx.db, { fresh: true });
        paged.push(...page.jobs.map((j) => j.id));
        cursor = page.nextCursor;
      } while (cursor);
      expect(paged, `${JSON.stringify(shape)} paged`).toEqual(expected);
    }
    // ties on the creation time are there to be broken by id
    const times = (await listJobs({ limit: 200, visibleTo: viewer }, ctx.db, { fresh: true })).jobs.map((j) => j.createdAt);
    expect(new Set(times).size).toBeLessThan(times.length);
    // a project outside the member's: nothing, as before
    expect((await listJobs({ projectId: otherProjects[2]!, visibleTo: viewer }, ctx.db, { fresh: true })).jobs).toEqual([]);
  });
});
