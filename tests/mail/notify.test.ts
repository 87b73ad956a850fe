// Notifications end to end: queued in the outbox in a transaction, delivered by the outbox
// sender through nodemailer → the SMTP mail catcher (local-services), read back through the
// catcher's HTTP API like the development inbox does. The mail parser of the
// catcher (mailparser) is the outside reader: recipients, subject and link as a client sees them.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { startTestServices, type TestServices } from "../support/services";

let svc: TestServices;
let notify: typeof import("~/lib/notify.server");
let rows: typeof import("./seed-rows");
let sender: import("~/lib/mail/sender.server").MailSender;
let inTx: (fn: (tx: import("~/db/client.server").DbExecutor) => Promise<void>) => Promise<void>;

/** Queue the mails of a recorded change, then let the sender deliver what is due. */
async function send(fn: (tx: import("~/db/client.server").DbExecutor) => Promise<void>): Promise<void> {
  await inTx(fn);
  await sender.deliverDue();
}

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
  const { MailSender } = await import("~/lib/mail/sender.server");
  sender = new MailSender({ db: db(), senderId: "test-sender", log: () => undefined, backoff: { baseMs: 1, capMs: 1 } });
  inTx = (fn) => fn(db());
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
    modelSummary: { units: { length: "mm", force: "N", mass: "t" } },
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
    await send((tx) => notify.queueJobFinishedMail(tx, "job-ok-001"));
    const mails = await inbox();
    expect(mails).toHaveLength(1);
    expect(mails[0]!.to).toEqual(["ines.okafor@brightspan.example"]);
    // the state sentence, mark and tone colour of the pages (job-state.ts) lead the subject and the mail
    expect(mails[0]!.subject).toBe("Job finished — optimal: Canopy truss, option C · job job-ok-0");
    expect(mails[0]!.text).toContain("State: finished — optimal");
    expect(mails[0]!.html).toContain("background:#e2f1e8;color:#2f7d5b;font-weight:600\">✓ finished — optimal</span>");
    expect(mails[0]!.text).toContain("http://desk.example.test:4450/jobs/job-ok-001");
    expect(mails[0]!.text).toContain("Objective (mass, t): 0.4120 → 0.2870"); // units on every figure
    expect(mails[0]!.html).toContain('href="http://desk.example.test:4450/jobs/job-ok-001"');
  });

  it("tells the submitter that the job failed and why", async () => {
    await send((tx) => notify.queueJobFinishedMail(tx, "job-bad-002"));
    const [mail] = await inbox();
    expect(mail!.to).toEqual(["ines.okafor@brightspan.example"]);
    expect(mail!.subject).toBe("Job failed — no result: Canopy truss, option C · job job-bad-");
    expect(mail!.text).toContain("node D can move freely in y");
    expect(mail!.text).toContain("http://desk.example.test:4450/jobs/job-bad-002");
  });
});

describe("notifyReviewWaiting", () => {
  it("writes to every checker, one mail each, and to nobody else", async () => {
    await send((tx) => notify.queueReviewWaitingMails(tx, "job-ok-001"));
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
    await send((tx) => notify.queueReviewWaitingMails(tx, "job-members-005"));
    const to = (await inbox()).flatMap((m) => m.to).sort();
    expect(to).toEqual(["priya.v@brightspan.example"]);
  });

  it("leaves out a checker who submitted the job (four-eyes rule)", async () => {
    await send((tx) => notify.queueReviewWaitingMails(tx, "job-self-003"));
    const to = (await inbox()).flatMap((m) => m.to).sort();
    expect(to).toEqual(["priya.v@brightspan.example", "tomasz.reveillon@brightspan.example"]);
  });
});

describe("runs with nothing to review", () => {
  it("tells the submitter an infeasible run ended, and that no checker was asked", async () => {
    await send((tx) => notify.queueJobFinishedMail(tx, "job-infeas-004", { reviewRequested: false }));
    const mails = await inbox();
    expect(mails.map((m) => m.to)).toEqual([["ines.okafor@brightspan.example"]]);
    expect(mails[0]!.subject).toBe("Job finished — no design meets every limit: Canopy truss, option C · job job-infe");
    expect(mails[0]!.html).toContain("color:#b3362c;font-weight:600\">✕ finished — no design meets every limit</span>");
    expect(mails[0]!.text).toContain("no design meets every limit");
    expect(mails[0]!.text).toContain("No checker was asked to review it");
  });

  it("writes to no checker about an infeasible job, even when asked to", async () => {
    const warned: string[] = [];
    const orig = console.warn;
    console.warn = (...a: unknown[]) => void warned.push(a.join(" "));
    try {
      await send((tx) => notify.queueReviewWaitingMails(tx, "job-infeas-004"));
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
    await send((tx) => notify.queueDecisionMail(tx, "rev-a"));
    const [mail] = await inbox();
    expect(mail!.to).toEqual(["ines.okafor@brightspan.example"]);
    expect(mail!.subject).toBe("Approved: Canopy truss, option C · job job-ok-0");
    expect(mail!.text).toContain("Tomasz Réveillon");
    expect(mail!.text).toContain("Chord groups checked by hand; fine.");
    expect(mail!.text).toContain("http://desk.example.test:4450/jobs/job-ok-001");
  });

  it("tells the submitter about changes requested", async () => {
    await rows.insertReview("rev-b", "job-ok-001", "u-chk2", "changes-requested", "Add the snow drift case <LC3>.", new Date("2026-11-30T15:00:00Z"));
    await send((tx) => notify.queueDecisionMail(tx, "rev-b"));
    const [mail] = await inbox();
    expect(mail!.subject).toBe("Changes requested: Canopy truss, option C · job job-ok-0");
    expect(mail!.text).toContain("Add the snow drift case <LC3>.");
    expect(mail!.html).toContain("Add the snow drift case &lt;LC3&gt;.");
  });
});

describe("the outbox", () => {
  it("refuses to queue mail about an unknown job or review, so the batch that asked is not stored", async () => {
    await expect(inTx((tx) => notify.queueJobFinishedMail(tx, "no-such-job"))).rejects.toThrow("job no-such-job does not exist");
    await expect(inTx((tx) => notify.queueDecisionMail(tx, "no-such-review"))).rejects.toThrow("review no-such-review does not exist");
    await sender.deliverDue();
    expect(await inbox()).toHaveLength(0);
  });

  it("queues one notification once, however often its event is recorded", async () => {
    await rows.insertJob({ jobId: "job-twice-007", submittedBy: "u-eng", status: "failed", error: "Member 7 has no area" });
    await inTx((tx) => notify.queueJobFinishedMail(tx, "job-twice-007"));
    await inTx((tx) => notify.queueJobFinishedMail(tx, "job-twice-007"));
    await sender.deliverDue();
    await sender.deliverDue();
    const mails = await inbox();
    expect(mails.map((m) => m.subject)).toEqual(["Job failed — no result: Canopy truss, option C · job job-twic"]);
  });

  it("keeps a mail while the mail server is down, says why, and delivers it once when it is back", async () => {
    const { mailer } = await import("~/lib/mail.server");
    const { listUndeliveredMail } = await import("~/lib/mail/outbox.server");
    const { db } = await import("~/db/client.server");
    const t = mailer();
    const orig = t.sendMail.bind(t);
    (t as { sendMail: unknown }).sendMail = async () => {
      throw Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:1"), { code: "ECONNECTION" });
    };
    try {
      await rows.insertJob({ jobId: "job-down-008", submittedBy: "u-chk-self" });
      await send((tx) => notify.queueReviewWaitingMails(tx, "job-down-008"));
      // the retry is due 1 ms after each failure: a second pass in the same millisecond as the
      // last failure would find that mail not yet due
      await new Promise((r) => setTimeout(r, 5));
      await sender.deliverDue();
    } finally {
      (t as { sendMail: unknown }).sendMail = orig;
    }
    expect(await inbox()).toHaveLength(0);
    const waiting = (await listUndeliveredMail(db())).filter((m) => m.entity?.id === "job-down-008");
    expect(waiting).toHaveLength(2);
    for (const m of waiting) {
      expect(m.state).toBe("pending");
      expect(m.attempts).toBe(2);
      expect(m.lastError).toContain("The mail server could not be reached");
    }
    await new Promise((r) => setTimeout(r, 5));
    await sender.deliverDue();
    await sender.deliverDue();
    const to = (await inbox()).flatMap((m) => m.to).sort();
    expect(to).toEqual(["priya.v@brightspan.example", "tomasz.reveillon@brightspan.example"]);
    expect((await listUndeliveredMail(db())).filter((m) => m.entity?.id === "job-down-008")).toHaveLength(0);
  });
});
