// The piscina pool that runs optimizations, sized and memory-limited from the config.
import path from "node:path";
import { fileURLToPath } from "node:url";
import { Piscina } from "piscina";
import { config } from "~/lib/config.server";
import { bundleNeeded, toolFile } from "../scripts/tools-bundle.mjs";

const here = path.dirname(fileURLToPath(import.meta.url));

export interface SolvePoolOptions {
  threads?: number;
  maxOldGenerationMb?: number;
  /** the task module; tests point it at a fixture */
  filename?: string;
}

export function createSolvePool(opts: SolvePoolOptions = {}): Piscina {
  const c = config();
  const threads = opts.threads ?? c.WORKER_THREADS;
  // the precompiled task when its bundle is fresh (the worker makes it so at start-up): a
  // thread then starts without compiling TypeScript
  const filename = opts.filename ?? (bundleNeeded() === null ? toolFile("solve-task") : path.join(here, "solve-task.ts"));
  // A .ts task needs the tsx loader in each thread; threads inherit the process's flags, so
  // it is added only when the process was not started with it.
  const hasTsx = process.execArgv.some((a, i, all) => a.includes("tsx") && (i === 0 || all[i - 1] === "--import" || a.startsWith("--import")));
  const execArgv = filename.endsWith(".ts") && !hasTsx ? [...process.execArgv, "--import", "tsx"] : undefined;
  const pool = new Piscina({
    filename,
    minThreads: threads,
    maxThreads: threads,
    // one task per thread: a queued job waits in the database, not in memory
    concurrentTasksPerWorker: 1,
    idleTimeout: 60_000,
    resourceLimits: { maxOldGenerationSizeMb: opts.maxOldGenerationMb ?? c.WORKER_MAX_OLD_GENERATION_MB },
    ...(execArgv ? { execArgv } : {}),
  });
  // A thread that dies outside a task (e.g. out of memory while a fresh one starts) is
  // reported here; unheard, the 'error' event would end the whole worker process.
  pool.on("error", (e: Error) => console.error(`[pool] a solver thread stopped: ${e.message}`));
  return pool;
}
