// Notifications end to end: nodemailer → the SMTP mail catcher (local-services), read back
// through the catcher's HTTP API like the development inbox does. The mail parser of the
// catcher (mailparser) is the outside reader: recipients, subject and link as a client sees them.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { startTestServices, type TestServices } from "../support/services";

let svc: TestServices;
let notify: typeof import("~/lib/notify.server");
let rows: typeof import("./seed-rows");

interface Caught { to: string[]; subject: string; text: string; html?: string }
async function inbox(): Promise<Caught[]> {
  const res = await fetch(`${svc.mail.httpUrl}/messages`);
  return ((await res.json()) as { messages: Caught[] }).messages;
}

beforeAll(async () => {
  svc = await startTestServices();
  process.env.APP_URL = "http://desk.example.test:4450";
  const { db } = await import("~/db/client.server");
  const { migrateDb } = await import("~/db/migrate.server");
  await migrateDb(db());
  notify = await import("~/lib/notify.server");
  rows = await import("./seed-rows");
  await rows.insertUser("u-eng", "Ines Okafor", "ines.okafor@brightspan.example", "engineer");
  await rows.insertUser("u-chk1", "Tomasz Réveillon", "tomasz.reveillon@brightspan.example", "checker");
  await rows.insertUser("u-chk2", "Priya Vantongeren", "priya.v@brightspan.example", "checker");
  await rows.insertUser("u-chk-self", "Mara Ellingsworth", "mara.e@brightspan.example", "checker");
  await rows.insertUser("u-view", "Olu Castellane", "olu.c@brightspan.example", "viewer");
  await rows.insertJob({
    jobId: "job-ok-001",
    submittedBy: "u-eng",
    summary: { objectiveKind: "mass", objectiveInitial: 0.412, objectiveFinal: 0.287, iterations: 14, maxUtilization: 1, status: "optimal" },
  });
  await rows.insertJob({ jobId: "job-bad-002", submittedBy: "u-eng", status: "failed", error: "The structure is a mechanism: node D can move freely in y" });
  await rows.insertJob({ jobId: "job-self-003", submittedBy: "u-chk-self" });
  await rows.insertJob({ jobId: "job-infeas-004", submittedBy: "u-eng", outcome: "infeasible" });
  // a project with only one of the three checkers in it
  await rows.insertJob({ jobId: "job-members-005", submittedBy: "u-eng", members: ["u-chk2", "u-view"] });
}, 60_000);
afterAll(async () => svc?.stop());
beforeEach(() => svc.mail.clear());

describe("notifyJobFinished", () => {
  it("tells the submitter that the job finished, with its figures and a link to the job", async () => {
    await notify.notifyJobFinished("job-ok-001");
    const mails = await inbox();
    expect(mails).toHaveLength(1);
    expect(mails[0]!.to).toEqual(["ines.okafor@brightspan.example"]);
    expect(mails[0]!.subject).toBe("Job finished: Canopy truss, option C (optimal) · job job-ok-0");
    expect(mails[0]!.text).toContain("http://desk.example.test:4450/jobs/job-ok-001");
    expect(mails[0]!.text).toContain("0.4120 → 0.2870");
    expect(mails[0]!.html).toContain('href="http://desk.example.test:4450/jobs/job-ok-001"');
  });

  it("tells the submitter that the job failed and why", async () => {
    await notify.notifyJobFinished("job-bad-002");
    const [mail] = await inbox();
    expect(mail!.to).toEqual(["ines.okafor@brightspan.example"]);
    expect(mail!.subject).toBe("Job failed: Canopy truss, option C · job job-bad-");
    expect(mail!.text).toContain("node D can move freely in y");
    expect(mail!.text).toContain("http://desk.example.test:4450/jobs/job-bad-002");
  });
});

describe("notifyReviewWaiting", () => {
  it("writes to every checker, one mail each, and to nobody else", async () => {
    await notify.notifyReviewWaiting("job-ok-001");
    const mails = await inbox();
    const to = mails.flatMap((m) => m.to).sort();
    expect(to).toEqual(["mara.e@brightspan.example", "priya.v@brightspan.example", "tomasz.reveillon@brightspan.example"]);
    for (const m of mails) {
      expect(m.subject).toBe("Review waiting: Canopy truss, option C · job job-ok-0");
      expect(m.text).toContain("http://desk.example.test:4450/jobs/job-ok-001");
      expect(m.text).toContain("Ines Okafor");
    }
  });

  it("writes only to checkers who are members of the job's project", async () => {
    await notify.notifyReviewWaiting("job-members-005");
    const to = (await inbox()).flatMap((m) => m.to).sort();
    expect(to).toEqual(["priya.v@brightspan.example"]);
  });

  it("leaves out a checker who submitted the job (four-eyes rule)", async () => {
    await notify.notifyReviewWaiting("job-self-003");
    const to = (await inbox()).flatMap((m) => m.to).sort();
    expect(to).toEqual(["priya.v@brightspan.example", "tomasz.reveillon@brightspan.example"]);
  });
});

describe("runs with nothing to review", () => {
  it("tells the submitter an infeasible run ended, and that no checker was asked", async () => {
    await notify.notifyJobFinished("job-infeas-004", { reviewRequested: false });
    const mails = await inbox();
    expect(mails.map((m) => m.to)).toEqual([["ines.okafor@brightspan.example"]]);
    expect(mails[0]!.subject).toBe("Job finished: Canopy truss, option C (infeasible) · job job-infe");
    expect(mails[0]!.text).toContain("no design meets every limit");
    expect(mails[0]!.text).toContain("No checker was asked to review it");
  });

  it("writes to no checker about an infeasible job, even when asked to", async () => {
    const warned: string[] = [];
    const orig = console.warn;
    console.warn = (...a: unknown[]) => void warned.push(a.join(" "));
    try {
      await notify.notifyReviewWaiting("job-infeas-004");
    } finally {
      console.warn = orig;
    }
    expect(await inbox()).toHaveLength(0);
    expect(warned.join("\n")).toContain("job-infeas-004 is succeeded (infeasible): nothing for a checker to review");
  });
});

describe("notifyDecision", () => {
  it("tells the submitter about an approval with the checker's name and comment", async () => {
    await rows.insertReview("rev-a", "job-ok-001", "u-chk1", "approved", "Chord groups checked by hand; fine.", new Date("2026-11-30T14:30:00Z"));
    await notify.notifyDecision("rev-a");
    const [mail] = await inbox();
    expect(mail!.to).toEqual(["ines.okafor@brightspan.example"]);
    expect(mail!.subject).toBe("Approved: Canopy truss, option C · job job-ok-0");
    expect(mail!.text).toContain("Tomasz Réveillon");
    expect(mail!.text).toContain("Chord groups checked by hand; fine.");
    expect(mail!.text).toContain("http://desk.example.test:4450/jobs/job-ok-001");
  });

  it("tells the submitter about changes requested", async () => {
    await rows.insertReview("rev-b", "job-ok-001", "u-chk2", "changes-requested", "Add the snow drift case <LC3>.", new Date("2026-11-30T15:00:00Z"));
    await notify.notifyDecision("rev-b");
    const [mail] = await inbox();
    expect(mail!.subject).toBe("Changes requested: Canopy truss, option C · job job-ok-0");
    expect(mail!.text).toContain("Add the snow drift case <LC3>.");
    expect(mail!.html).toContain("Add the snow drift case &lt;LC3&gt;.");
  });
});

describe("failures stay inside", () => {
  it("does not throw for an unknown job or review, and logs what went wrong", async () => {
    const logged: string[] = [];
    const orig = console.error;
    console.error = (...a: unknown[]) => void logged.push(a.join(" "));
    try {
      await expect(notify.notifyJobFinished("no-such-job")).resolves.toBeUndefined();
      await expect(notify.notifyDecision("no-such-review")).resolves.toBeUndefined();
    } finally {
      console.error = orig;
    }
    expect(logged.join("\n")).toContain("job no-such-job does not exist");
    expect(logged.join("\n")).toContain("review no-such-review does not exist");
    expect(await inbox()).toHaveLength(0);
  });

  it("does not throw when the mail server is down", async () => {
    const { mailer } = await import("~/lib/mail.server");
    const t = mailer();
    const orig = t.sendMail.bind(t);
    (t as { sendMail: unknown }).sendMail = async () => {
      throw new Error("connect ECONNREFUSED 127.0.0.1:1");
    };
    const logged: string[] = [];
    const origErr = console.error;
    console.error = (...a: unknown[]) => void logged.push(a.join(" "));
    try {
      await expect(notify.notifyJobFinished("job-ok-001")).resolves.toBeUndefined();
    } finally {
      console.error = origErr;
      (t as { sendMail: unknown }).sendMail = orig;
    }
    expect(logged.join("\n")).toContain("ECONNREFUSED");
  });
});
