// Runs the starts of a multi-start design (app/engine/design/multi-start.ts) in parallel solver
// threads: one thread per core (at most one per start), each taking the next start when it
// finishes one, the results combined in start order. The calling thread only hands out work,
// so it stays free to pass start 0's progress on. Used by the worker's solve task and the CLI.
//
// Threads started here end with the caller's: piscina ending a cancelled task's thread stops
// them too, and every thread is terminated once the starts are done or one fails.
import fs from "node:fs";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { Worker, resourceLimits } from "node:worker_threads";
import { combineStarts, optimizeWithStarts } from "~/engine/design/multi-start";
import type { TrussModel } from "~/engine/truss";
import type { DesignProgress, OptimizeOptions } from "~/engine/design/result";
import type { TrussResult } from "~/engine/design/result-types";
import type { StartThreadData, StartThreadMessage } from "./start-task";

/**
 * How a solver thread starts: from the bundle's start-task.mjs when this code runs from
 * build/tools (maybe from a chunk in a folder below it); else from the TypeScript source beside
 * this file, through a two-line loader that registers tsx first (node 20 does not apply a
 * loader given in a thread's execArgv to the thread's entry module).
 */
function startTaskThread(): { entry: string | URL; eval: boolean } {
  const here = fileURLToPath(import.meta.url);
  const tools = /^(.*[\\/]build[\\/]tools)[\\/]/.exec(here);
  if (tools) return { entry: pathToFileURL(path.join(tools[1], "start-task.mjs")), eval: false };
  const source = pathToFileURL(path.join(path.dirname(here), "start-task.ts")).href;
  // the ES module entry of tsx's API, read from its package's own export map
  const tsxPackage = createRequire(import.meta.url).resolve("tsx/package.json");
  const tsxExports = JSON.parse(fs.readFileSync(tsxPackage, "utf8")).exports["./esm/api"].import.default as string;
  const tsxApi = pathToFileURL(path.join(path.dirname(tsxPackage), tsxExports)).href;
  return { entry: `import(${JSON.stringify(tsxApi)}).then((m) => { m.register(); return import(${JSON.stringify(source)}); });`, eval: true };
}

/**
 * Below this many members the starts run one after the other in the calling thread: all of
 * them take well under a second there, less than starting the threads would (a solver thread
 * costs 0.1-0.2 s to start, bundled, and warms its own compiled code from cold). Measured on
 * the 109-member ground structures, six starts, whole `optimize` process, quiet 2-core
 * machine (load 1), best of 3: in this thread 0.65-1.25 s wall and 0.88-1.77 s CPU against
 * 0.77-1.36 s and 1.37-2.35 s in two threads. A start of 419 members takes about a second,
 * where threads pay off.
 */
export const THREADS_FROM_MEMBERS = 150;

/** A multi-start run: in solver threads for models worth them, else in this thread. */
export async function runStarts(
  modelText: string,
  model: TrussModel,
  options: OptimizeOptions,
  count: number,
  onProgress?: (p: DesignProgress) => void,
  stopFlag?: SharedArrayBuffer,
): Promise<TrussResult> {
  if (model.members.length < THREADS_FROM_MEMBERS) return optimizeWithStarts(model, { ...options, starts: count, onProgress });
  return runStartsInThreads(modelText, options, count, onProgress, undefined, stopFlag);
}

export async function runStartsInThreads(
  modelText: string,
  options: OptimizeOptions,
  count: number,
  onProgress?: (p: DesignProgress) => void,
  threads = Math.min(count, os.availableParallelism()),
  /** the runner's stop request (Int32 0 -> 1): every thread's solver reads it between iterations */
  stopFlag?: SharedArrayBuffer,
): Promise<TrussResult> {
  const t0 = Date.now();
  const thread = startTaskThread();
  // plain data only crosses threads: the callbacks and the signal stay here
  const { onProgress: _p, stopRequested: _s, signal, ...plain } = options;
  void _p;
  void _s;
  const data: StartThreadData = { modelText, options: plain, count, stopFlag };
  const results: { label: string; result: TrussResult }[] = [];
  const stop = stopFlag ? new Int32Array(stopFlag) : null;
  const stopped = () => stop !== null && Atomics.load(stop, 0) === 1;
  const workers: Worker[] = [];
  let next = 0;
  try {
    await new Promise<void>((resolve, reject) => {
      let done = 0;
      const fail = (e: Error) => reject(e);
      signal?.addEventListener("abort", () => fail(Object.assign(new Error("The optimization was cancelled."), { name: "AbortError" })), { once: true });
      // after a stop request no further start begins, and once the engineer's own start has
      // ended the result is made of the starts that ended (the others' threads are ended)
      const finished = () => (stopped() ? results[0] !== undefined : done === count);
      for (let t = 0; t < Math.max(1, threads); t++) {
        // the same heap cap as the thread that starts them (the worker's per-job memory limit)
        const heap = resourceLimits.maxOldGenerationSizeMb;
        const w = new Worker(thread.entry, { eval: thread.eval, workerData: data, ...(heap ? { resourceLimits: { maxOldGenerationSizeMb: heap } } : {}) });
        workers.push(w);
        const give = () => {
          if (next < count && !stopped()) w.postMessage(next++);
        };
        w.on("message", (m: StartThreadMessage) => {
          if (m.kind === "progress") onProgress?.(m.progress);
          else if (m.kind === "error") fail(new Error(`start ${m.index + 1} of ${count} failed: ${m.message}`));
          else {
            results[m.index] = { label: m.label, result: JSON.parse(m.resultJson) as TrussResult };
            done++;
            give();
            if (finished()) resolve();
          }
        });
        w.on("error", fail);
        w.on("exit", (code) => {
          if (code !== 0 && !finished()) fail(new Error(`a solver thread stopped (exit code ${code})`));
        });
        give();
      }
    });
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  return combineStarts(results.filter((r) => r !== undefined), Date.now() - t0);
}
