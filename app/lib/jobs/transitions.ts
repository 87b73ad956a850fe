// The job life cycle as data: which status may follow which, and why. Pure, so the rules are
// tested on their own and every database update guards itself with `fromStatuses(event)`.
import type { JobStatus } from "~/db/schema";

export type JobEvent =
  | "claim" // a worker takes a queued job
  | "reclaim" // a worker takes a running job whose lease ran out (its worker died)
  | "succeed"
  | "fail"
  | "cancel" // a queued job at once; a running one once its worker has stopped the task
  | "requeue"; // a worker shutting down hands a running job back

const RULES: Record<JobEvent, { from: readonly JobStatus[]; to: JobStatus }> = {
  claim: { from: ["queued"], to: "running" },
  reclaim: { from: ["running"], to: "running" },
  succeed: { from: ["running"], to: "succeeded" },
  fail: { from: ["running"], to: "failed" },
  cancel: { from: ["queued", "running"], to: "cancelled" },
  requeue: { from: ["running"], to: "queued" },
};

export const TERMINAL_STATUSES: readonly JobStatus[] = ["succeeded", "failed", "cancelled"];

export function isTerminal(status: JobStatus): boolean {
  return TERMINAL_STATUSES.includes(status);
}

export class IllegalTransitionError extends Error {
  constructor(
    readonly from: JobStatus,
    readonly event: JobEvent,
  ) {
    super(
      isTerminal(from)
        ? `The job has already ${from === "cancelled" ? "been cancelled" : from}; it cannot ${EVENT_WORDS[event]} any more`
        : `A ${from} job cannot ${EVENT_WORDS[event]}`,
    );
    this.name = "IllegalTransitionError";
  }
}

const EVENT_WORDS: Record<JobEvent, string> = {
  claim: "be started",
  reclaim: "be taken over by another worker",
  succeed: "succeed",
  fail: "fail",
  cancel: "be cancelled",
  requeue: "go back to the queue",
};

/** The statuses an event may start from (the WHERE guard of the matching UPDATE). */
export function fromStatuses(event: JobEvent): readonly JobStatus[] {
  return RULES[event].from;
}

export function canApply(from: JobStatus, event: JobEvent): boolean {
  return RULES[event].from.includes(from);
}

/** The status after `event`, or an IllegalTransitionError naming both. */
export function nextStatus(from: JobStatus, event: JobEvent): JobStatus {
  if (!canApply(from, event)) throw new IllegalTransitionError(from, event);
  return RULES[event].to;
}

/** Whether any event leads from one status to the other. */
export function canTransition(from: JobStatus, to: JobStatus): boolean {
  return Object.values(RULES).some((r) => r.to === to && r.from.includes(from));
}
