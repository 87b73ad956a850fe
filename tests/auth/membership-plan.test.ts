// The membership filters use indexes (issue 14: "no route slower than before by more than 10%;
// membership filters use indexes"). SQLite's EXPLAIN QUERY PLAN of the SQL the app runs for
// a non-admin's lists (jobs, projects, models) and for the "review waiting" recipients: each
// look-up in project_members is a SEARCH on its primary key or its (user, project) index,
// never a SCAN. A member's job list walks their own rows of member_jobs on an index (by user,
// or by user and status), newest first without a sort, each row joined to its job by the
// job's key: it reads the jobs it lists and no others. A member's list of one project, and
// the project and model lists, run the very plan of the unfiltered list (an admin's, which is
// the query as it was before membership) plus the membership look-up: no new scan or sort.
// The timings before and after sit in the job-list benchmark (npm run bench -- job-list).
// Plan words (SCAN, SEARCH, USING INDEX, USE TEMP B-TREE): the SQLite documentation's
// "EXPLAIN QUERY PLAN" page (from memory).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeJob, makeUser, setup } from "./helpers";
import { jobListPlan, plansOf } from "./query-plan";

let ctx: Awaited<ReturnType<typeof setup>>;
let member: { id: string; role: string };
let projectId = "";
let jobId = "";

beforeAll(async () => {
  ctx = await setup();
  const engineer = await makeUser("noor.vale@thistlemoor.example", "engineer");
  const viewer = await makeUser("ivo.penn@thistlemoor.example", "viewer");
  member = { id: viewer.id, role: "viewer" };
  for (let i = 0; i < 3; i++) ({ projectId, jobId } = await makeJob({ submittedBy: engineer.id, members: [viewer.id] }));
  await makeJob({ submittedBy: engineer.id, members: [] }); // a project the viewer is outside of
});
afterAll(async () => ctx?.services.stop());

const MEMBERSHIP_BY_INDEX = /^SEARCH project_members USING (COVERING INDEX|PRIMARY KEY|INDEX) /;
// the member's own rows: on the primary key (user, created_at, job) or the (user, status, …)
// index, which also holds the outcome that "review waiting" judges a run by
const MEMBER_ROWS_BY_INDEX = /^SEARCH member_jobs USING (COVERING INDEX|PRIMARY KEY|INDEX) \S+ \(user_id=\?( AND status=\?)?\)$/;
const JOB_BY_KEY = /^SEARCH jobs USING INDEX (sqlite_autoindex_jobs_1 \(id=\?\)|jobs_created_id_idx \(created_at=\? AND id=\?\))$/;

/** Plan lines that read project_members other than by an index. */
function membershipNotByIndex(plan: string[]): string[] {
  return plan.map((l) => l.trim()).filter((l) => /\bproject_members\b/.test(l) && !MEMBERSHIP_BY_INDEX.test(l));
}

/** The plan without the membership look-up (its subquery and what it reads). */
function withoutMembership(plan: string[]): string[] {
  return plan.map((l) => l.trim()).filter((l) => !/\bproject_members\b/.test(l) && !/^CORRELATED (SCALAR )?SUBQUERY/.test(l));
}

describe("membership filters use indexes", () => {
  it("the job list, in each shape the API and pages ask for", async () => {
    const { listJobs } = await import("~/lib/jobs/queue.server");
    const first = await listJobs({ limit: 1, visibleTo: member }, ctx.db, { fresh: true });
    expect(first.jobs.length).toBe(1);
    const shapes = [{ limit: 50 }, { limit: 200 }, { status: "succeeded" as const }, { cursor: first.nextCursor }, { submittedBy: member.id }, { review: "waiting" as const }];
    for (const shape of shapes) {
      const plan = (await jobListPlan(ctx.db, { ...shape, visibleTo: member })).map((l) => l.trim());
      const text = `${JSON.stringify(shape)}\n${plan.join("\n")}`;
      // first the member's own rows on an index, then each one's job by its key (a review
      // state's subquery on reviews may come between: it is judged from the member's row)
      expect(plan[0], text).toMatch(MEMBER_ROWS_BY_INDEX);
      expect(plan.find((l) => /^(SEARCH|SCAN) jobs\b/.test(l)), text).toMatch(JOB_BY_KEY);
      expect(plan.filter((l) => /^SCAN (jobs|member_jobs|project_members)\b/.test(l)), text).toEqual([]);
      // project_members is not read at all: member_jobs already holds only the member's jobs
      expect(plan.filter((l) => /\bproject_members\b/.test(l)), text).toEqual([]);
      // newest first straight off the index: no sort of the member's jobs
      expect(plan.join("\n"), text).not.toMatch(/USE TEMP B-TREE FOR ORDER BY/);
    }
    // a list of one project: jobs' own index for the project, one membership probe per row
    for (const shape of [{ projectId, status: ["succeeded" as const, "failed" as const] }, { projectId }]) {
      const plan = await jobListPlan(ctx.db, { ...shape, visibleTo: member });
      const text = `${JSON.stringify(shape)}\n${plan.join("\n")}`;
      expect(plan.some((l) => MEMBERSHIP_BY_INDEX.test(l.trim())), text).toBe(true);
      expect(membershipNotByIndex(plan), text).toEqual([]);
      expect(withoutMembership(plan), text).toEqual(await jobListPlan(ctx.db, { ...shape, visibleTo: { id: "any", role: "admin" } }));
      expect(plan.filter((l) => /^SCAN jobs$/.test(l.trim())), text).toEqual([]);
    }
  });

  it("the project list, the model list and the review-waiting recipients", async () => {
    const { listProjects } = await import("~/lib/auth/projects.server");
    const { listModels } = await import("~/lib/models.server");
    const { reviewWaitingMails } = await import("~/lib/notify.server");
    const admin = { id: "any", role: "admin" };
    for (const [name, run] of [
      ["projects", (who: typeof member) => (d: typeof ctx.db) => listProjects({ visibleTo: who }, d)],
      ["models", (who: typeof member) => (d: typeof ctx.db) => listModels({ visibleTo: who }, d)],
    ] as const) {
      const [filtered] = await plansOf(ctx.db, run(member));
      const [unfiltered] = await plansOf(ctx.db, run(admin));
      const text = `${name}: ${filtered!.sql}\n${filtered!.plan.join("\n")}`;
      expect(filtered!.sql, text).toContain("project_members");
      expect(filtered!.plan.some((l) => MEMBERSHIP_BY_INDEX.test(l.trim())), text).toBe(true);
      expect(membershipNotByIndex(filtered!.plan), text).toEqual([]);
      expect(withoutMembership(filtered!.plan), text).toEqual(unfiltered!.plan.map((l) => l.trim()));
    }
    // only checkers who are members of the job's project hear of it
    const mails = (await plansOf(ctx.db, (d) => reviewWaitingMails(d, jobId).catch(() => null))).filter((q) => q.sql.includes("project_members"));
    expect(mails.length).toBe(1);
    expect(mails[0]!.plan.some((l) => MEMBERSHIP_BY_INDEX.test(l.trim())), mails[0]!.plan.join("\n")).toBe(true);
    expect(membershipNotByIndex(mails[0]!.plan), mails[0]!.plan.join("\n")).toEqual([]);
  });

  it("the filter itself is the membership: the lists hold the viewer's projects only", async () => {
    const { listJobs } = await import("~/lib/jobs/queue.server");
    const all = await listJobs({ limit: 200 }, ctx.db, { fresh: true });
    const mine = await listJobs({ limit: 200, visibleTo: member }, ctx.db, { fresh: true });
    expect(all.jobs.length).toBe(4);
    expect(mine.jobs.length).toBe(3);
  });
});
