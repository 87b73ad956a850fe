// Retry delays for transient failures: exponential growth with "equal jitter" (half the delay
// fixed, half random), so many retriers that failed together do not come back together.
// Common practice for retries against a shared service.
export interface Backoff {
  baseMs: number;
  capMs: number;
}

/** The wait before try number `attempt + 1`, after `attempt` failures (attempt ≥ 1). */
export function backoffDelay(attempt: number, b: Backoff, random: () => number = Math.random): number {
  const full = Math.min(b.capMs, b.baseMs * 2 ** Math.min(Math.max(attempt - 1, 0), 30));
  return Math.round(full / 2 + random() * (full / 2));
}

export const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));
