// The web server while heavy requests run (issue 15): the latency of a light request, the
// engineer's job list (GET /api/jobs?limit=50), alone and then while reports of a
// 2,503-member result are drawn (each one fresh: the bucket's cached copy is removed after
// every download) and 0.6 MB models are uploaded and checked, back to back, from two more
// clients. Goal: p99 of the job list under 100 ms with the heavy requests running, printed
// beside the figure without them. The heavy work runs on the web process's thread pool
// (decision 14), so the request thread only waits on it. Needs a build (npm run build).
//   npm run bench -- web        BENCH_WEB_SECONDS=20 sets each phase's length
import { DeleteObjectCommand, ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { startApp, type RunningApp } from "../tests/e2e/harness";
import { cancelDemoJobs, enqueue, makeProject, signIn, sleep, uploadModel, waitUntil, type Session } from "../tests/faults/support/app-client";
import { warrenFixture } from "../tests/report/warren-fixture";

const PHASE_MS = Number(process.env.BENCH_WEB_SECONDS ?? 20) * 1000;
const GOAL_P99_MS = 100;
const LIGHT_PAUSE_MS = 20;

function quantile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))]!;
}

function describeLatencies(xs: number[]) {
  const s = [...xs].sort((a, b) => a - b);
  return { n: s.length, p50: quantile(s, 0.5), p99: quantile(s, 0.99), max: s[s.length - 1]! };
}

/** The light request, one after another with a short pause, for `ms`; each one timed. */
async function lightLoop(s: Session, ms: number): Promise<number[]> {
  const out: number[] = [];
  const end = performance.now() + ms;
  while (performance.now() < end) {
    const t0 = performance.now();
    const res = await s.get("/api/jobs?limit=50");
    await res.arrayBuffer();
    if (res.status !== 200) throw new Error(`the job list answered ${res.status}`);
    out.push(performance.now() - t0);
    await sleep(LIGHT_PAUSE_MS);
  }
  return out;
}

async function emptyReportCache(app: RunningApp, client: S3Client) {
  const Bucket = app.env.S3_BUCKET!;
  const listed = await client.send(new ListObjectsV2Command({ Bucket, Prefix: "reports/" }));
  for (const o of listed.Contents ?? []) await client.send(new DeleteObjectCommand({ Bucket, Key: o.Key! }));
}

async function main() {
  const app = await startApp({ env: { WORKER_THREADS: "1" } });
  try {
    const admin = await signIn(app, "admin");
    await cancelDemoJobs(admin);
    const engineer = await signIn(app, "engineer");
    const projectId = await makeProject(engineer, `WEB-${Date.now().toString(36)}`);
    const reportFx = warrenFixture({ panels: 626, loadScale: (8 / 626) ** 2 });
    const uploadFx = warrenFixture({ panels: 1250, loadScale: (8 / 1250) ** 2 });
    const uploadText = JSON.stringify(uploadFx.model);
    const modelId = await uploadModel(engineer, projectId, reportFx.model, "warren-626.truss.json");
    const jobId = await enqueue(engineer, modelId, "analysis");
    await waitUntil("the analysis to finish", async () => (await engineer.json<{ status: string }>(`/api/jobs/${jobId}`)).status === "succeeded", 300_000, 500);
    // a job list worth reading: the engineer's jobs, some finished
    for (let i = 0; i < 20; i++) await enqueue(engineer, modelId, "analysis");
    const s3 = new S3Client({
      endpoint: app.env.S3_ENDPOINT,
      region: "us-east-1",
      forcePathStyle: true,
      credentials: { accessKeyId: app.env.S3_ACCESS_KEY_ID!, secretAccessKey: app.env.S3_SECRET_ACCESS_KEY! },
    });
    await waitUntil("the queue to drain", async () => (await engineer.json<{ jobs: { status: string }[] }>(`/api/jobs?projectId=${projectId}&limit=100`)).jobs.every((j) => j.status === "succeeded"), 600_000, 1000);
    console.log(`report: ${reportFx.model.members!.length} members; upload: ${uploadFx.model.members!.length} members, ${(uploadText.length / 2 ** 20).toFixed(2)} MiB; ${PHASE_MS / 1000} s per phase`);

    await lightLoop(engineer, 2000); // warm: connections, route modules
    const alone = describeLatencies(await lightLoop(engineer, PHASE_MS));

    let heavyRunning = true;
    const heavy = { reports: [] as number[], uploads: [] as number[], refused: 0 };
    const reportClient = (async () => {
      while (heavyRunning) {
        const t0 = performance.now();
        const res = await engineer.get(`/api/jobs/${jobId}/report`);
        await res.arrayBuffer();
        if (res.status === 200) heavy.reports.push(performance.now() - t0);
        else if (res.status === 503) heavy.refused++;
        else throw new Error(`the report answered ${res.status}`);
        await emptyReportCache(app, s3);
      }
    })();
    const uploadClient = (async () => {
      while (heavyRunning) {
        const form = new FormData();
        form.set("projectId", projectId);
        form.set("file", new Blob([uploadText], { type: "application/json" }), "warren-1250.truss.json");
        const t0 = performance.now();
        const res = await engineer.post("/api/models", form);
        await res.arrayBuffer();
        if (res.status === 201) heavy.uploads.push(performance.now() - t0);
        else if (res.status === 503) heavy.refused++;
        else throw new Error(`the upload answered ${res.status}`);
      }
    })();
    await sleep(500); // both heavy requests under way
    const loaded = describeLatencies(await lightLoop(engineer, PHASE_MS));
    heavyRunning = false;
    await Promise.all([reportClient, uploadClient]);

    const row = (label: string, x: ReturnType<typeof describeLatencies>) =>
      `${label.padEnd(34)} ${String(x.n).padStart(6)} ${x.p50.toFixed(1).padStart(8)} ${x.p99.toFixed(1).padStart(8)} ${x.max.toFixed(1).padStart(8)}`;
    console.log(`\nGET /api/jobs?limit=50 (ms)             n      p50      p99      max`);
    console.log(row("alone", alone));
    console.log(row("with reports and uploads running", loaded));
    const mean = (xs: number[]) => (xs.length ? xs.reduce((a, b) => a + b, 0) / xs.length / 1000 : NaN);
    console.log(
      `heavy requests meanwhile: ${heavy.reports.length} reports (mean ${mean(heavy.reports).toFixed(1)} s), ${heavy.uploads.length} uploads (mean ${mean(heavy.uploads).toFixed(1)} s), ${heavy.refused} refused as busy`,
    );
    if (heavy.reports.length + heavy.uploads.length === 0) console.log("NOTE: no heavy request finished within the phase; they were running throughout");
    console.log(loaded.p99 < GOAL_P99_MS ? `OK: p99 ${loaded.p99.toFixed(1)} ms under the ${GOAL_P99_MS} ms goal` : `SLOW: p99 ${loaded.p99.toFixed(1)} ms over the ${GOAL_P99_MS} ms goal`);
    if (loaded.p99 >= GOAL_P99_MS) process.exitCode = 1;
  } finally {
    await app.stop();
  }
}

await main();
