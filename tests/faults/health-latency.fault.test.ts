// (d) The web process never computes: while the calculation record of a 5,000-member result is
// drawn, /api/health (a query, a bucket request and an SMTP handshake) polled every 100 ms
// from outside still answers within 200 ms every time. The model is a 1,250-panel Warren truss
// (4,999 members, about 0.6 MB: its upload is checked on the web thread pool too), run as an
// analysis by the worker; its member forces are checked against the method of sections
// (tests/report/warren-fixture.ts, common practice) before the report is asked for. The S3
// fake and the mail catcher run in processes of their own, as real services would.
// The bound is the issue's, held on a machine that is not overloaded: health polled for 3 s
// before the report gives the machine's own latency, and when that alone is past the bound's
// half (other work crowds the cores, and the OS leaves any thread waiting for its turn), the
// bound becomes 200 ms plus four times that baseline's worst, said loudly. Either way a report
// drawn on the web thread (seconds to minutes of stall, the fault this guards against) fails. The figures are printed beside the bound. Timing is
// the web server's property here, not a speed target (those live in bench/web.bench.ts).
import { describe, expect, it } from "vitest";
import { startApp } from "../e2e/harness";
import { warrenFixture } from "../report/warren-fixture";
import { cancelDemoJobs, enqueue, makeProject, signIn, sleep, uploadModel, waitUntil } from "./support/app-client";
import { startFaultServices } from "./support/fault-services";

const WORST_MS = 200;
const POLL_MS = 100;

describe("the web process while a large report is drawn", () => {
  it("(d) /api/health polled every 100 ms answers within 200 ms throughout a 5,000-member report", { timeout: 240_000 }, async () => {
    // the bucket and the mail server in processes of their own: health's probes must not wait
    // on this test process while it downloads the report
    const app = await startApp({ services: await startFaultServices() });
    try {
      const admin = await signIn(app, "admin");
      await cancelDemoJobs(admin);
      const engineer = await signIn(app, "engineer");
      const projectId = await makeProject(engineer, "HEALTH-1");
      const fx = warrenFixture({ panels: 1250, loadScale: (8 / 1250) ** 2 });
      expect(fx.model.members).toHaveLength(4999);
      const modelId = await uploadModel(engineer, projectId, fx.model, "long-warren.truss.json");
      const jobId = await enqueue(engineer, modelId, "analysis");
      await waitUntil("the analysis to finish", async () => (await engineer.json<{ status: string }>(`/api/jobs/${jobId}`)).status === "succeeded", 120_000, 500);

      const result = await engineer.json<{ members: { id: string; force: Record<string, number> }[] }>(`/api/jobs/${jobId}/result`);
      const exact = new Map(fx.result.members.map((m) => [m.id, m.force]));
      for (const m of result.members.filter((_, i) => i % 97 === 0)) {
        for (const [lc, f] of Object.entries(exact.get(m.id)!)) expect(m.force[lc]! / 1000, `${m.id} ${lc} in kN`).toBeCloseTo(f / 1000, 2);
      }

      // health as a load balancer would poll it: one request every 100 ms, each timed
      const latencies: number[] = [];
      let polling = true;
      const poller = (async () => {
        while (polling) {
          const t0 = performance.now();
          const res = await fetch(`${app.baseUrl}/api/health`);
          await res.text();
          const ms = performance.now() - t0;
          if (res.status !== 200) throw new Error(`/api/health answered ${res.status}`);
          latencies.push(ms);
          await sleep(Math.max(0, POLL_MS - ms));
        }
      })();
      await sleep(3000);
      const before = latencies.length;
      const baseline = [...latencies].sort((a, b) => a - b);
      const baselineWorst = baseline[baseline.length - 1]!;
      const t0 = performance.now();
      const report = await engineer.get(`/api/jobs/${jobId}/report`);
      const pdf = new Uint8Array(await report.arrayBuffer());
      const reportMs = performance.now() - t0;
      polling = false;
      await poller;

      expect(report.status).toBe(200);
      expect(report.headers.get("x-report-cache")).toBe("miss");
      expect(new TextDecoder().decode(pdf.slice(0, 5))).toBe("%PDF-");
      const during = latencies.slice(before);
      const sorted = [...during].sort((a, b) => a - b);
      const worst = sorted[sorted.length - 1]!;
      const crowded = baselineWorst > WORST_MS / 2;
      const bound = crowded ? WORST_MS + 4 * baselineWorst : WORST_MS;
      console.log(
        `(d) report of ${result.members.length} members drawn in ${(reportMs / 1000).toFixed(1)} s (${(pdf.byteLength / 2 ** 20).toFixed(1)} MiB); ` +
          `/api/health meanwhile: ${during.length} polls, median ${sorted[Math.floor(sorted.length / 2)]!.toFixed(0)} ms, worst ${worst.toFixed(0)} ms ` +
          `(bound ${bound.toFixed(0)} ms; before the report: median ${baseline[Math.floor(baseline.length / 2)]!.toFixed(0)} ms, worst ${baselineWorst.toFixed(0)} ms)`,
      );
      if (crowded) console.warn(`!!! (d) the machine is crowded (health alone took up to ${baselineWorst.toFixed(0)} ms): the ${WORST_MS} ms bound is relaxed to ${bound.toFixed(0)} ms for this run`);
      expect(during.length, "health was polled throughout the report").toBeGreaterThanOrEqual(10);
      expect(worst).toBeLessThan(bound);
    } finally {
      await app.stop();
    }
  });
});
