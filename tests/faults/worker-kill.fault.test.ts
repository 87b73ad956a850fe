// (c) A queue worker killed with SIGKILL the moment it has recorded a job's result: the job's
// mails ("finished" to the submitter, "review waiting" to the project's checker) are rows of
// the outbox stored with the result, so the next worker delivers them, once each; the job is
// not run again and its result stays the one stored. The mail catcher is frozen (SIGSTOP) while
// the job ends, so no mail can slip out before the kill: what arrives later was sent after it.
// The job is the two-bar frame with its closed-form optimum (tests/queue/support/models.ts).
import { describe, expect, it } from "vitest";
import { startApp } from "../e2e/harness";
import { TWO_BAR_FULLY_STRESSED_AREA, twoBarModel } from "../queue/support/models";
import { cancelDemoJobs, enqueue, makeProject, query, signIn, sleep, uploadModel, waitUntil } from "./support/app-client";
import { startFaultServices } from "./support/fault-services";

// a claim the killed worker's sender may have taken runs out this soon
const CLAIM_MS = "3000";

describe("a worker killed right after recording a job", () => {
  it("(c) kill -9 just after the result is recorded: its mails still go out, once each, and the job is not run again", { timeout: 180_000 }, async () => {
    const services = await startFaultServices();
    const app = await startApp({ services, env: { MAIL_CLAIM_MS: CLAIM_MS } });
    try {
      const admin = await signIn(app, "admin");
      await cancelDemoJobs(admin);
      const engineer = await signIn(app, "engineer");
      const checker = app.accounts.find((a) => a.role === "checker")!;
      const projectId = await makeProject(engineer, "KILL-1", [checker.email]);
      const modelId = await uploadModel(engineer, projectId, twoBarModel("Fault drill KILL-1: two-bar frame"));

      const worker = app.processes.worker!;
      services.smtp.pause();
      let killedAt = 0;
      let jobId = "";
      const killOnRecord = (chunk: Buffer) => {
        if (!killedAt && jobId && chunk.toString().includes(`job ${jobId} succeeded`)) {
          killedAt = Date.now();
          process.kill(-worker.proc.pid!, "SIGKILL");
        }
      };
      worker.proc.stdout!.on("data", killOnRecord);
      jobId = await enqueue(engineer, modelId);
      const exit = await worker.exited;
      expect(killedAt, "the worker was killed on its 'succeeded' line").toBeGreaterThan(0);
      expect(exit.signal).toBe("SIGKILL");

      const outbox = () =>
        query<{ recipient: string; kind: string; state: string }>(app, "select recipient, kind, state from mail_outbox where entity_type = 'job' and entity_id = ? order by kind", [jobId]);
      const [job] = await query<{ status: string; attempts: number; finished_at: number; result_key: string }>(app, "select status, attempts, finished_at, result_key from jobs where id = ?", [jobId]);
      expect(job).toMatchObject({ status: "succeeded", attempts: 1 });
      const atKill = await outbox();
      expect(atKill.map((r) => [r.recipient, r.state])).toEqual([
        [engineer.email, "pending"],
        [checker.email, "pending"],
      ]);

      services.smtp.resume();
      const heir = app.startWorker("heir", { MAIL_CLAIM_MS: CLAIM_MS });
      const delivered = await waitUntil(
        "both mails of the job",
        async () => {
          const m = services.caught().filter((x) => x.text.includes(jobId));
          return m.length >= 2 ? m : null;
        },
        60_000,
        250,
      );
      const after = (Date.now() - killedAt) / 1000;
      await sleep(3000); // room for a second copy, if one were coming
      const caught = services.caught().filter((x) => x.text.includes(jobId));
      expect(caught.map((m) => [m.to.join(","), m.subject.split(/:| — /)[0]]).sort()).toEqual(
        [
          [engineer.email, "Job finished"],
          [checker.email, "Review waiting"],
        ].sort(),
      );
      expect(new Set(caught.map((m) => m.messageId)).size).toBe(2);
      expect((await outbox()).every((r) => r.state === "sent")).toBe(true);
      console.log(`(c) worker killed ${killedAt ? "on the job's 'succeeded' line" : "?"}; ${delivered.length} mails delivered by the next worker ${after.toFixed(1)} s after the kill`);

      // recorded once: the next worker did not run the job again, the row is as the first left it
      expect(heir.recentOutput()).not.toContain(`job ${jobId} started`);
      const [again] = await query<{ status: string; attempts: number; finished_at: number; result_key: string }>(app, "select status, attempts, finished_at, result_key from jobs where id = ?", [jobId]);
      expect(again).toEqual(job);
      const result = await engineer.json<{ members: { area: number }[] }>(`/api/jobs/${jobId}/result`);
      for (const m of result.members) expect(m.area).toBeCloseTo(TWO_BAR_FULLY_STRESSED_AREA, 1);
    } finally {
      services.smtp.resume();
      await app.stop();
    }
  });
});
