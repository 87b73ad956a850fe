// The web process's report threads: drawing a calculation record of thousands of members
// takes seconds of CPU, which on the request thread would stall every other request. One
// piscina thread (REPORT_THREADS) takes them in turn; the web thread only gathers the rows
// and texts and streams the bytes back. Decision: docs/decisions/0008-reports-on-a-thread.md.
import fs from "node:fs";
import path from "node:path";
import { Piscina } from "piscina";
import { bundleNeeded, toolFile } from "../../../scripts/tools-bundle.mjs";
import type { ReportInputs } from "./report-inputs";
import type { ReportTaskOutput } from "../../../workers/report-task";

let pool: Piscina | undefined;

/** The task module: the precompiled bundle when it is fresh, else the TypeScript source. */
function taskFile(root: string): string {
  const bundled = toolFile("report-task", root);
  return fs.existsSync(bundled) && bundleNeeded(root) === null ? bundled : path.join(root, "workers/report-task.ts");
}

function reportPool(): Piscina {
  if (pool) return pool;
  // the server runs from the repository root (npm start, react-router-serve, the tests); the
  // built server bundle has no source-relative paths to go by
  const root = process.cwd();
  const filename = taskFile(root);
  const threads = Math.max(1, Number(process.env.REPORT_THREADS ?? 1) || 1);
  const hasTsx = process.execArgv.some((a) => a.includes("tsx"));
  pool = new Piscina({
    filename,
    minThreads: 0,
    maxThreads: threads,
    concurrentTasksPerWorker: 1,
    idleTimeout: 120_000,
    // a .ts task needs the TypeScript loader in its thread
    ...(filename.endsWith(".ts") && !hasTsx ? { execArgv: [...process.execArgv, "--import", "tsx"] } : {}),
  });
  pool.on("error", (e: Error) => console.error(`[report pool] a report thread stopped: ${e.message}`));
  return pool;
}

/** Draw the report on a report thread. */
export function renderOnThread(input: ReportInputs): Promise<ReportTaskOutput> {
  return reportPool().run(input) as Promise<ReportTaskOutput>;
}
