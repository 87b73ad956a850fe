// Which finished runs ask the checkers for a review, end to end: the real worker loop, pool
// and solver on the two-bar frame of support/models.ts, mails read back from the mail catcher.
// The frame is statically determinate, so each bar carries N = 25 kN whatever its area and the
// stress limit holds exactly when A >= N / σ_allow = 106.38 mm² (statics, common practice):
// that closed form, not the solver's word, says which designs are feasible below.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TrussResult } from "~/engine/design/result-types";
import { listMailAbout } from "~/lib/mail/outbox.server";
import { designWorthReview } from "~/lib/review-request";
import type { TestServices } from "../support/services";
import { TWO_BAR_FULLY_STRESSED_AREA, twoBarModel, type ModelJson } from "./support/models";
import { makeAccount, makeProject, setupQueue, uploadModel, waitFor } from "./support/setup";

let services: TestServices;
let database: Db;
let projectId: string;
let engineer: Awaited<ReturnType<typeof makeAccount>>;
let checker: Awaited<ReturnType<typeof makeAccount>>;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue({ APP_URL: "http://desk.example.test:4510" }));
  engineer = await makeAccount("engineer", "Ines Porthcawl");
  checker = await makeAccount("checker", "Tomasz Hallorann");
  projectId = await makeProject();
}, 60_000);
afterAll(async () => services?.stop());

/** The two-bar frame with starting areas and design-block changes. */
function frame(name: string, opts: { startArea?: number; maxArea?: number; maxIterations?: number }): ModelJson {
  const m = twoBarModel(name) as { members: { area: number }[]; design: Record<string, unknown> };
  if (opts.startArea) for (const b of m.members) b.area = opts.startArea;
  if (opts.maxArea) m.design.areaBounds = { min: 10, max: opts.maxArea };
  if (opts.maxIterations) m.design.solver = { maxIterations: opts.maxIterations, tolerance: 1e-12 };
  return m as unknown as ModelJson;
}

/** Runs one job through the worker loop with mail on; returns its stored result and the mails it caused. */
async function runWithMail(model: ModelJson) {
  const { enqueueJob, getJob, getJobResult } = await import("~/lib/jobs/queue.server");
  const { createSolvePool } = await import("../../workers/pool");
  const { QueueRunner } = await import("../../workers/queue-runner");
  const { MailSender } = await import("~/lib/mail/sender.server");
  const stored = await uploadModel(projectId, model, engineer.id);
  services.mail.clear();
  // one start: the probes below stop a run early, and another start (the fully stressed one of
  // this statically determinate frame is its optimum) would finish within the cap
  const queued = await enqueueJob({ modelId: stored.id, options: { starts: 1 }, user: engineer }, database);
  const pool = createSolvePool({ threads: 1, maxOldGenerationMb: 512 });
  const mailSender = new MailSender({ db: database, senderId: "review-mail-test", pollMs: 100, log: () => undefined });
  const r = new QueueRunner({ db: database, pool, leaseMs: 5000, timeLimitMs: 60_000, maxOldGenerationMb: 512, idlePollMs: 50, mailSender, log: () => undefined });
  r.start();
  mailSender.start();
  try {
    const done = await waitFor("the job to succeed", async () => {
      const j = (await getJob(queued.id, database))!;
      return j.status === "succeeded" ? j : null;
    });
    // the job's mails were queued with its result; the sender's pass delivers all of them
    await r.stop(0);
    await waitFor("the job's mails", async () => (await listMailAbout(database, { type: "job", id: queued.id })).every((m) => m.state === "sent"));
    const result = (await getJobResult(queued.id, database)) as TrussResult;
    return { job: done, result, mails: services.mail.messages() };
  } finally {
    await r.stop(0);
    await mailSender.stop();
    await pool.destroy();
  }
}

const feasibleByStatics = (r: TrussResult) => r.members.every((m) => m.area >= TWO_BAR_FULLY_STRESSED_AREA * (1 - 1e-6));
const reviewMails = <M extends { subject: string }>(mails: M[]) => mails.filter((m) => m.subject.startsWith("Review waiting"));

describe("review requests from the queue", () => {
  it("asks the checkers to review an optimum, and tells the submitter", async () => {
    const { job, result, mails } = await runWithMail(frame("Review probe: optimum", {}));
    expect(job.outcome).toBe("optimal");
    expect(feasibleByStatics(result)).toBe(true);
    const review = reviewMails(mails);
    expect(review.map((m) => m.to)).toEqual([[checker.email]]);
    expect(review[0]!.text).toContain(`http://desk.example.test:4510/jobs/${job.id}`);
    const finished = mails.find((m) => m.to.includes(engineer.email))!;
    expect(finished.text).toContain("A checker still has to review it");
  });

  it("sends no review mail for an infeasible run, only the finished mail to the submitter", async () => {
    // A_max = 50 mm² < 106.38 mm²: no area within the bounds meets the stress limit (statics)
    const { job, result, mails } = await runWithMail(frame("Review probe: bounds too tight", { maxArea: 50 }));
    expect(job.outcome).toBe("infeasible");
    expect(feasibleByStatics(result)).toBe(false);
    expect(reviewMails(mails)).toEqual([]);
    expect(mails.map((m) => m.to)).toEqual([[engineer.email]]);
    expect(mails[0]!.subject).toMatch(/^Job finished — no design meets every limit: Review probe: bounds too tight/);
    expect(mails[0]!.text).toContain("No checker was asked to review it");
    expect(mails[0]!.text).not.toContain("A checker still has to review it");
  });

  it("asks for review of a run stopped early only when its design meets every limit", async () => {
    // from 1000 mm² (σ = 25 MPa, feasible) two iterations leave the areas above 106.38 mm²;
    // from 20 mm² (σ = 1250 MPa) one iteration leaves them below: stopped early both times
    for (const [name, opts] of [
      ["Review probe: early stop, feasible", { startArea: 1000, maxIterations: 2 }],
      ["Review probe: early stop, overstressed", { startArea: 20, maxIterations: 1 }],
    ] as const) {
      const { job, result, mails } = await runWithMail(frame(name, opts));
      expect(job.outcome, name).toBe("not-converged");
      const feasible = feasibleByStatics(result);
      expect(result.verification?.allLimitsMet, `${name}: the re-analysis agrees with statics`).toBe(feasible);
      expect(reviewMails(mails).length, name).toBe(feasible ? 1 : 0);
      expect(mails.some((m) => m.to.includes(engineer.email)), `${name}: submitter told`).toBe(true);
    }
  });
});

describe("the review decision", () => {
  it("asks for review only of a design a checker can sign off", () => {
    expect(designWorthReview({ status: "optimal", verification: { allLimitsMet: true } })).toBe(true);
    expect(designWorthReview({ status: "optimal" })).toBe(true);
    expect(designWorthReview({ status: "optimal", verification: { allLimitsMet: false } })).toBe(false);
    expect(designWorthReview({ status: "not-converged", verification: { allLimitsMet: true } })).toBe(true);
    expect(designWorthReview({ status: "not-converged", verification: { allLimitsMet: false } })).toBe(false);
    expect(designWorthReview({ status: "not-converged" })).toBe(false); // unknown: not asked
    expect(designWorthReview({ status: "infeasible", verification: { allLimitsMet: true } })).toBe(false);
    expect(designWorthReview({ status: "failed" })).toBe(false);
  });
});
