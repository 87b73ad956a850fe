// Why a run ended badly, in words for the engineer (shown on the job page and in the mail).
const minutes = (ms: number) => (ms >= 120_000 ? `${Math.round(ms / 60_000)} min` : `${Math.round(ms / 100) / 10} s`);

export function timeLimitMessage(limitMs: number): string {
  return `Stopped at the time limit of ${minutes(limitMs)} per job (JOB_TIME_LIMIT_MS). Try fewer iterations, a looser tolerance or a smaller model.`;
}

export function memoryLimitMessage(limitMb: number): string {
  return `Stopped: the run needed more than the worker memory limit of ${limitMb} MB (WORKER_MAX_OLD_GENERATION_MB). Try the nested formulation or a smaller model.`;
}

export function solverFailureMessage(message: string | undefined, hint: string | undefined): string {
  const m = message?.trim() || "The solver stopped without a usable design";
  return hint?.trim() ? `${m}. ${hint.trim()}`.replace(/\.\. /, ". ") : m;
}

/** A failed task's error as a sentence: the memory limit by its code, else the error's own message. */
export function describeTaskError(e: unknown, maxOldGenerationMb: number): string {
  const err = e as { code?: string; message?: string; name?: string } | null;
  if (err?.code === "ERR_WORKER_OUT_OF_MEMORY" || /out of memory/i.test(err?.message ?? "")) return memoryLimitMessage(maxOldGenerationMb);
  const msg = (err?.message ?? String(e)).trim();
  // a worker thread that died without a message (native crash) still gets a sentence
  return msg || "The optimization stopped unexpectedly without an error message";
}
