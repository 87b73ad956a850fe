// The web process's worker threads, for the requests that need seconds of CPU: drawing a
// calculation record of thousands of members, checking a large uploaded model. On the request
// thread either would stall every other request. One piscina thread (WEB_THREADS) takes them
// in turn; the web thread only gathers rows (a report thread reads the stored texts from the
// bucket itself) and sends the answer. A task that has
// not finished WEB_TASK_TIMEOUT_MS after it was asked for (waiting included) is stopped (its
// thread ended, a fresh one started); past WEB_TASK_QUEUE waiting tasks, new ones are refused.
// Either way the request gets a 503 in words (HeavyTaskStoppedError), never a hung socket.
// Decision: docs/decisions/0014-heavy-requests-on-a-thread.md.
import path from "node:path";
import { Piscina } from "piscina";
import { config } from "~/lib/config.server";
import { HeavyTaskStoppedError, type HeavyTask } from "~/lib/heavy-task";
import type { GateResult } from "~/lib/models/model-gate";
import type { ReportInputs, ReportSources } from "~/lib/report/report-inputs";
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
    const c = config();
    const p = new Piscina({
      filename,
      minThreads: 1,
      maxThreads: c.WEB_THREADS,
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

export interface TaskLimits {
  /** from the moment the task is asked for; WEB_TASK_TIMEOUT_MS by default */
  timeoutMs?: number;
}

// tasks asked for and not yet settled, running or waiting (counted here: piscina's own
// maxQueue lets its balancer hand a busy thread more tasks than the limit)
let inFlight = 0;

async function runTask<T>(task: HeavyTask, name: string, input: unknown, limits: TaskLimits): Promise<T> {
  const c = config();
  if (inFlight >= c.WEB_THREADS + c.WEB_TASK_QUEUE) throw new HeavyTaskStoppedError(task, "busy", inFlight - c.WEB_THREADS);
  inFlight++;
  try {
    const p = await webPool();
    const timeoutMs = limits.timeoutMs ?? c.WEB_TASK_TIMEOUT_MS;
    const signal = AbortSignal.timeout(timeoutMs);
    try {
      return (await p.run(input, { name, signal })) as T;
    } catch (e) {
      if (!signal.aborted) throw e;
      console.error(`[web pool] ${task} stopped after ${timeoutMs} ms`);
      throw new HeavyTaskStoppedError(task, "time", timeoutMs);
    }
  } finally {
    inFlight--;
  }
}

/** Draw a report on a pool thread. */
export function renderReportOnThread(input: ReportInputs, limits: TaskLimits = {}): Promise<ReportTaskOutput> {
  return runTask("report", "renderReport", input, limits);
}

/** Read the stored texts and draw the report, both on a pool thread. */
export function renderStoredReportOnThread(input: ReportSources, limits: TaskLimits = {}): Promise<ReportTaskOutput> {
  return runTask("report", "renderStoredReport", input, limits);
}

/** Run the upload gate of a model file on a pool thread. */
export function checkModelOnThread(input: { fileName: string; bytes: Uint8Array; limitBytes: number }, limits: TaskLimits = {}): Promise<GateResult> {
  return runTask("model check", "checkModel", input, limits);
}
