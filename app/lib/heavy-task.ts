// The error of a heavy request that the web process's threads (web-pool.server.ts) would not
// finish: it ran past its time limit and was stopped, or too many were already waiting.
// http.server.ts answers it with a 503 in words; kept apart from the pool so that the error
// helper does not load the pool.
import { formatDuration } from "./format";

export type HeavyTask = "report" | "model check";

const WHAT: Record<HeavyTask, string> = {
  report: "Drawing the report",
  "model check": "Checking the uploaded model",
};

export class HeavyTaskStoppedError extends Error {
  constructor(
    readonly task: HeavyTask,
    readonly why: "time" | "busy",
    /** the time limit in ms (why "time"), or how many wait already (why "busy") */
    readonly limit: number,
  ) {
    super(
      why === "time"
        ? `${WHAT[task]} took longer than ${formatDuration(limit)}, the limit for one request, and was stopped. The server may be busy with other large reports or uploads: try again in a few minutes.`
        : `The server is busy: ${limit} large ${limit === 1 ? "report or upload is" : "reports or uploads are"} already waiting. ${WHAT[task]} was not started; try again in a minute.`,
    );
    this.name = "HeavyTaskStoppedError";
  }
}
