// The piscina task: one optimization run on a worker thread. Plain data in (the model file's
// text and the job options), the result JSON text and its summary out; progress goes back
// through the MessagePort the caller hands over. Cancel and the time limit are the caller's
// AbortSignal, which makes piscina end this thread, so the task itself never polls.
import type { MessagePort } from "node:worker_threads";
import { analyseModel, optimizeModel, plannedStarts, summarizeResult } from "~/engine/design";
import type { JobOptions } from "~/engine/design/options";
import type { JobSummary } from "~/engine/design/result-types";
import { parseModel } from "~/engine/truss";
import { attachLowerBound, loadHighsSolver, plasticDesignBeforeRun } from "~/engine/lp";
import { runStarts } from "./parallel-starts";

// The LP solver loads (and warms) as the thread starts, before its first job: a job then finds
// it ready instead of waiting for it. A failed load here is retried by the job that needs it.
loadHighsSolver().catch(() => undefined);

export interface SolveTaskInput {
  jobId: string;
  /** design (optimize; the default) or analysis (the model as given, no design block needed) */
  kind?: "design" | "analysis";
  modelText: string;
  options: JobOptions;
  progressPort?: MessagePort;
  /**
   * One Int32 the runner sets to 1 to stop the run and keep its best design (a cancel); the
   * solver reads it between iterations. Without it, a cancel can only end the thread.
   */
  stopFlag?: SharedArrayBuffer;
}

export interface SolveTaskOutput {
  resultJson: string;
  summary: JobSummary;
  message: string;
  hint?: string;
  elapsedMs: number;
}

/** Posted on the progress port when the task ends, after every progress message. */
export const PROGRESS_END = { end: true } as const;

/** A model the engine refuses; the message names the offending item. */
export class ModelRejectedError extends Error {
  override name = "ModelRejectedError";
}

type Progress = { iteration: number; objective?: number; f?: number; maxViolation: number; kktResidual: number };

export default async function solveTask(input: SolveTaskInput): Promise<SolveTaskOutput> {
  const started = performance.now();
  const parsed = parseModel(JSON.parse(input.modelText));
  if (!parsed.ok) {
    const first = parsed.errors[0];
    const more = parsed.errors.length > 1 ? ` (and ${parsed.errors.length - 1} more)` : "";
    throw new ModelRejectedError(`The model is not valid: ${first ? `${first.path}: ${first.message}` : "no details"}${more}`);
  }
  const port = input.progressPort;
  if (input.kind === "analysis") {
    try {
      const result = analyseModel(parsed.model);
      return { resultJson: JSON.stringify(result), summary: summarizeResult(result), message: result.message, elapsedMs: performance.now() - started };
    } finally {
      port?.postMessage(PROGRESS_END);
      port?.close();
    }
  }
  try {
    // the LP solver loads once per thread (loaded as the thread started; a job that came first waits)
    const lpSolver = await loadHighsSolver();
    // the least-mass LP at the model's geometry, solved once: a start for the solver, then the bound
    const plastic = plasticDesignBeforeRun(parsed.model, input.options, lpSolver);
    const stop = input.stopFlag ? new Int32Array(input.stopFlag) : null;
    const onProgress = port
      ? (p: Progress) =>
          port.postMessage({
            iteration: p.iteration,
            objective: p.objective ?? p.f ?? Number.NaN,
            maxViolation: p.maxViolation,
            kktResidual: p.kktResidual,
          })
      : undefined;
    const options = {
      ...input.options,
      stopRequested: stop ? () => Atomics.load(stop, 0) === 1 : undefined,
      plasticStart: plastic?.status === "optimal" ? plastic.memberAreas : undefined,
    };
    // several starting designs run in solver threads of their own (multi-start.ts)
    const starts = plannedStarts(parsed.model, input.options);
    const optimized = starts > 1
      ? await runStarts(input.modelText, parsed.model, options, starts, onProgress, input.stopFlag)
      : optimizeModel(parsed.model, { ...options, onProgress });
    // beside every result, the least-mass certificate (or the reason there is none)
    const result = attachLowerBound(parsed.model, optimized, input.options, lpSolver, plastic);
    return {
      resultJson: JSON.stringify(result),
      summary: summarizeResult(result),
      message: result.message,
      hint: result.hint,
      elapsedMs: performance.now() - started,
    };
  } finally {
    // the end mark: messages on one port arrive in order, so the caller knows that every
    // progress message before it has arrived (a port closed here is not seen closed there)
    port?.postMessage(PROGRESS_END);
    port?.close();
  }
}
