// The web process's worker threads, for the requests that need seconds of CPU: drawing a
// calculation record of thousands of members, checking a large uploaded model. On the request
// thread either would stall every other request. One piscina thread (WEB_THREADS) takes them
// in turn; the web thread only gathers rows and texts and sends the answer.
// Decision: docs/decisions/0014-heavy-requests-on-a-thread.md.
import path from "node:path";
import { Piscina } from "piscina";
import type { GateResult } from "~/lib/models/model-gate";
import type { ReportInputs } from "~/lib/report/report-inputs";
import { ensureToolsBundle, toolFile } from "../../scripts/tools-bundle.mjs";
import type { ReportTaskOutput } from "../../workers/web-task";

let pool: Promise<Piscina> | undefined;

/**
 * The task module: the precompiled bundle, made fresh first when a source changed (as the
 * queue worker does at start-up; `npm run build` makes it too); the TypeScript source only
 * when bundling fails.
 */
async function taskFile(root: string): Promise<string> {
  try {
    await ensureToolsBundle(root);
    return toolFile("web-task", root);
  } catch (e) {
    console.error(`[web pool] no tools bundle (${e instanceof Error ? e.message : String(e)}); the thread compiles TypeScript`);
    return path.join(root, "workers/web-task.ts");
  }
}

function webPool(): Promise<Piscina> {
  pool ??= (async () => {
    // the server runs from the repository root (npm start, react-router-serve, the tests); the
    // built server bundle has no source-relative paths to go by
    const root = process.cwd();
    const filename = await taskFile(root);
    const threads = Math.max(1, Number(process.env.WEB_THREADS ?? 1) || 1);
    const p = new Piscina({
      filename,
      minThreads: 1,
      maxThreads: threads,
      concurrentTasksPerWorker: 1,
      idleTimeout: 120_000,
      // a .ts task needs the TypeScript loader in its thread
      ...(filename.endsWith(".ts") ? { execArgv: [...process.execArgv, "--import", "tsx"] } : {}),
    });
    p.on("error", (e: Error) => console.error(`[web pool] a thread stopped: ${e.message}`));
    return p;
  })();
  return pool;
}

/** Draw a report on a pool thread. */
export function renderReportOnThread(input: ReportInputs): Promise<ReportTaskOutput> {
  return webPool().then((p) => p.run(input, { name: "renderReport" }) as Promise<ReportTaskOutput>);
}

/** Run the upload gate of a model file on a pool thread. */
export function checkModelOnThread(input: { fileName: string; bytes: Uint8Array; limitBytes: number }): Promise<GateResult> {
  return webPool().then((p) => p.run(input, { name: "checkModel" }) as Promise<GateResult>);
}
