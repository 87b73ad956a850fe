// The piscina pool that runs optimizations, sized and memory-limited from the config.
import path from "node:path";
import { fileURLToPath } from "node:url";
import { Piscina } from "piscina";
import { config } from "~/lib/config.server";

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
  const filename = opts.filename ?? path.join(here, "solve-task.ts");
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
