// The job life cycle of issue 6: queued → running → succeeded | failed | cancelled, plus the
// two ways back (lease takeover, shutdown requeue). Everything else is refused.
import { describe, expect, it } from "vitest";
import { JOB_STATUSES, type JobStatus } from "~/db/schema";
import { canApply, canTransition, fromStatuses, IllegalTransitionError, isTerminal, nextStatus, type JobEvent } from "~/lib/jobs/transitions";

const LEGAL: [JobStatus, JobEvent, JobStatus][] = [
  ["queued", "claim", "running"],
  ["queued", "cancel", "cancelled"],
  ["running", "reclaim", "running"],
  ["running", "succeed", "succeeded"],
  ["running", "fail", "failed"],
  ["running", "cancel", "cancelled"],
  ["running", "requeue", "queued"],
];
const EVENTS: JobEvent[] = ["claim", "reclaim", "succeed", "fail", "cancel", "requeue"];

describe("job transitions", () => {
  it.each(LEGAL)("%s --%s--> %s", (from, event, to) => {
    expect(nextStatus(from, event)).toBe(to);
    expect(canTransition(from, to)).toBe(true);
  });

  it("refuses every other (status, event) pair with a sentence naming both", () => {
    let refused = 0;
    for (const from of JOB_STATUSES)
      for (const event of EVENTS) {
        if (LEGAL.some(([f, e]) => f === from && e === event)) continue;
        expect(canApply(from, event)).toBe(false);
        expect(() => nextStatus(from, event)).toThrow(IllegalTransitionError);
        refused++;
      }
    // 5 statuses x 6 events, 7 of them legal
    expect(refused).toBe(23);
    expect(() => nextStatus("succeeded", "cancel")).toThrow("The job has already succeeded; it cannot be cancelled any more");
    expect(() => nextStatus("queued", "succeed")).toThrow("A queued job cannot succeed");
  });

  it("terminal states lead nowhere, and a queued job cannot skip running", () => {
    for (const t of ["succeeded", "failed", "cancelled"] as const) {
      expect(isTerminal(t)).toBe(true);
      for (const to of JOB_STATUSES) expect(canTransition(t, to)).toBe(false);
    }
    expect(canTransition("queued", "succeeded")).toBe(false);
    expect(canTransition("queued", "failed")).toBe(false);
    expect(isTerminal("running")).toBe(false);
  });

  it("gives the database guards the same rules", () => {
    expect(fromStatuses("claim")).toEqual(["queued"]);
    expect(fromStatuses("cancel")).toEqual(["queued", "running"]);
    expect(fromStatuses("succeed")).toEqual(["running"]);
  });
});
