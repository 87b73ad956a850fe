// Outages of the services the app leans on, against the built app and a queue worker, the
// stand-ins run as processes that the test kills (every connection drops) and brings back on
// the same port after 40 s. The two drills run side by side, each with an app of its own:
//   (a) the object store gone for 40 s while 30 jobs run: none fails or is left stuck, none
//       spends an attempt, their pages and the API say "waiting for storage" meanwhile, and
//       every job's "finished" mail goes out once the store is back;
//   (b) the mail server gone for 40 s while jobs finish: the admin mail page shows each mail
//       waiting with the reason, and every one is delivered afterwards, none twice.
// Each job is the symmetric two-bar frame, whose fully stressed optimum A = 25 kN / 235 MPa =
// 106.38 mm² is known in closed form (statics; tests/queue/support/models.ts): the results
// after the outage are checked against it.
import { describe, expect, it } from "vitest";
import { startApp, type RunningApp } from "../e2e/harness";
import { TWO_BAR_FULLY_STRESSED_AREA, twoBarModel } from "../queue/support/models";
import { cancelDemoJobs, enqueue, listJobs, makeProject, query, signIn, sleep, uploadModel, waitUntil, type Session } from "./support/app-client";
import { startFaultServices, type FaultServices } from "./support/fault-services";

const OUTAGE_MS = 40_000;

interface Drill {
  app: RunningApp;
  services: FaultServices;
  engineer: Session;
  admin: Session;
}

async function drill(code: string, members: (app: RunningApp) => string[] = () => []): Promise<Drill & { projectId: string; modelId: string }> {
  const services = await startFaultServices();
  const app = await startApp({ services });
  try {
    const admin = await signIn(app, "admin");
    await cancelDemoJobs(admin);
    const engineer = await signIn(app, "engineer");
    const projectId = await makeProject(engineer, code, members(app));
    const modelId = await uploadModel(engineer, projectId, twoBarModel(`Fault drill ${code}: two-bar frame`));
    return { app, services, engineer, admin, projectId, modelId };
  } catch (e) {
    await app.stop();
    throw e;
  }
}

/** Each job's result meets the closed-form optimum (both bars at 106.38 mm²). */
async function expectClosedForm(engineer: Session, ids: string[]) {
  for (const id of ids) {
    const result = await engineer.json<{ members: { id: string; area: number }[] }>(`/api/jobs/${id}/result`);
    for (const m of result.members) expect(m.area, `job ${id} member ${m.id}`).toBeCloseTo(TWO_BAR_FULLY_STRESSED_AREA, 1);
  }
}

const finishedMails = (services: FaultServices, ids: string[]) =>
  services.caught().filter((m) => m.subject.startsWith("Job finished") && ids.some((id) => m.text.includes(id)));

describe.concurrent("service outages while jobs run", () => {
  it("(a) the object store stopped for 40 s while 30 jobs run: all succeed, none stuck, each says it waits for storage meanwhile, every finish mail goes out", { timeout: 240_000 }, async () => {
    const t0 = Date.now();
    const d = await drill("OUT-S3");
    console.log(`(a) app up and drill ready in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
    try {
      const ids: string[] = [];
      for (let i = 0; i < 30; i++) ids.push(await enqueue(d.engineer, d.modelId));
      await waitUntil("the first jobs to finish", async () => (await listJobs(d.engineer, d.projectId)).filter((j) => j.status === "succeeded").length >= 3, 60_000, 50);

      await d.services.storage.kill();
      const down = Date.now();
      // back on the same port 40 s later, whatever the checks below are doing then
      let restored = false;
      const back = sleep(OUTAGE_MS)
        .then(() => d.services.storage.start())
        .then(() => {
          restored = true;
          return Date.now();
        });
      const before = (await listJobs(d.engineer, d.projectId)).filter((j) => j.status === "succeeded").length;
      let sawWaiting: { apiState: string; page: string } | null = null;
      let failedDuring = 0;
      while (!restored) {
        const list = await listJobs(d.engineer, d.projectId);
        failedDuring = Math.max(failedDuring, list.filter((j) => j.status === "failed").length);
        const waiting = list.find((j) => j.waitingFor === "storage");
        if (waiting && !sawWaiting) {
          const one = await d.engineer.json<{ state: string; waitingFor: string }>(`/api/jobs/${waiting.id}`);
          const page = await (await d.engineer.get(`/jobs/${waiting.id}`)).text();
          sawWaiting = { apiState: one.state, page };
        }
        await Promise.race([sleep(1000), back]);
      }
      const up = await back;
      console.log(`(a) object store down ${((up - down) / 1000).toFixed(1)} s; ${before} of 30 jobs had finished before`);

      expect(failedDuring, "no job failed during the outage").toBe(0);
      expect(sawWaiting, "a job said it waits for storage").not.toBeNull();
      expect(sawWaiting!.apiState).toMatch(/^waiting for storage — the file store is not answering/);
      expect(sawWaiting!.page).toContain("waiting for storage");

      const done = await waitUntil(
        "all 30 jobs to finish after the outage",
        async () => {
          const list = (await listJobs(d.engineer, d.projectId)).filter((j) => ids.includes(j.id));
          return list.every((j) => j.status !== "queued" && j.status !== "running") ? list : null;
        },
        120_000,
        500,
      );
      expect(done).toHaveLength(30);
      expect(done.filter((j) => j.status === "succeeded" && j.outcome === "optimal")).toHaveLength(30);
      // waiting for the store spent no attempt
      expect(done.map((j) => j.attempts)).toEqual(Array(30).fill(1));
      await expectClosedForm(d.engineer, ids);

      const mails = await waitUntil("a finish mail for every job", async () => {
        const m = finishedMails(d.services, ids);
        return m.length >= 30 ? m : null;
      }, 60_000, 500);
      expect(mails).toHaveLength(30);
      for (const id of ids) expect(mails.filter((m) => m.text.includes(id)), `finish mail of job ${id}`).toHaveLength(1);
      const afterOutage = mails.filter((m) => Date.parse(m.receivedAt) >= up).length;
      expect(afterOutage, "the jobs held up by the outage were mailed after it").toBeGreaterThanOrEqual(30 - before - 1);
      console.log(`(a) 30 of 30 succeeded on their first attempt, the last ${((Date.now() - up) / 1000).toFixed(1)} s after the store came back; ${afterOutage} finish mails delivered after it`);
    } finally {
      await d.app.stop();
    }
  });

  it("(b) the mail server stopped for 40 s: every mail waits with the reason, then is delivered, none twice", { timeout: 240_000 }, async () => {
    const t0 = Date.now();
    const d = await drill("OUT-MAIL", (app) => [app.accounts.find((a) => a.role === "checker")!.email]);
    console.log(`(b) app up and drill ready in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
    try {
      await d.services.smtp.kill();
      const down = Date.now();
      const ids: string[] = [];
      for (let i = 0; i < 8; i++) ids.push(await enqueue(d.engineer, d.modelId));
      await waitUntil(
        "the 8 jobs to succeed with the mail server down",
        async () => (await listJobs(d.engineer, d.projectId)).filter((j) => ids.includes(j.id) && j.status === "succeeded").length === 8,
        90_000,
        250,
      );
      // a finish mail to the engineer and a review request to the checker, per job
      const outboxOf = () =>
        query<{ state: string; attempts: number; last_error: string | null; kind: string }>(
          d.app,
          `select state, attempts, last_error, kind from mail_outbox where entity_type = 'job' and entity_id in (${ids.map(() => "?").join(",")})`,
          ids,
        );
      const tried = await waitUntil("every mail to be tried once", async () => {
        const rows = await outboxOf();
        return rows.length === 16 && rows.every((r) => r.attempts >= 1) ? rows : null;
      }, 60_000, 500);
      expect(tried.every((r) => r.state === "pending" && /^The mail server could not be reached/.test(r.last_error ?? ""))).toBe(true);
      const adminPage = await (await d.admin.get("/admin/mail")).text();
      expect(adminPage).toContain("The mail server could not be reached");
      expect(adminPage).toContain("pending, retried");

      await sleep(Math.max(0, OUTAGE_MS - (Date.now() - down)));
      await d.services.smtp.start();
      const up = Date.now();
      await waitUntil("every mail delivered", async () => (await outboxOf()).every((r) => r.state === "sent"), 60_000, 500);
      const deliveredAfter = (Date.now() - up) / 1000;
      await sleep(3000); // room for a second copy, if one were coming
      const caught = d.services.caught().filter((m) => ids.some((id) => m.text.includes(id)));
      expect(caught).toHaveLength(16);
      expect(new Set(caught.map((m) => m.messageId)).size).toBe(16);
      for (const id of ids) {
        const about = caught.filter((m) => m.text.includes(id));
        expect(about.filter((m) => m.subject.startsWith("Job finished")), `finish mail of ${id}`).toHaveLength(1);
        expect(about.filter((m) => m.subject.startsWith("Review waiting:")), `review mail of ${id}`).toHaveLength(1);
      }
      const rows = await outboxOf();
      console.log(`(b) mail server down ${((up - down) / 1000).toFixed(1)} s; 16 mails delivered ${deliveredAfter.toFixed(1)} s after it came back, after up to ${Math.max(...rows.map((r) => r.attempts))} tries each`);
      expect((await (await d.admin.get("/admin/mail")).text())).toContain("Every queued mail has been delivered.");
      await expectClosedForm(d.engineer, ids.slice(0, 3));
    } finally {
      await d.app.stop();
    }
  });
});
