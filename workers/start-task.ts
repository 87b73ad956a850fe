// One solver thread of a multi-start run (parallel-starts.ts): it receives start numbers, runs
// each from the model text (parsed here, so no structured object crosses threads) and posts
// back the start's result. Progress is posted for start 0 (the engineer's own start) only.
import { parentPort, workerData } from "node:worker_threads";
import { runStart, startingDesignsOnce } from "~/engine/design/multi-start";
import type { OptimizeOptions } from "~/engine/design/result";
import { parseModel } from "~/engine/truss";

export interface StartThreadData {
  modelText: string;
  options: OptimizeOptions;
  count: number;
  /** the runner's stop request, shared with every start's thread */
  stopFlag?: SharedArrayBuffer;
}

export type StartThreadMessage =
  | { kind: "progress"; progress: { iteration: number; objective: number; maxViolation: number; kktResidual: number } }
  | { kind: "done"; index: number; label: string; resultJson: string }
  | { kind: "error"; index: number; message: string };

const data = workerData as StartThreadData;
const parsed = parseModel(JSON.parse(data.modelText));
const port = parentPort!;
const stop = data.stopFlag ? new Int32Array(data.stopFlag) : null;
// every start this thread runs belongs to the same run: its starting designs are made once
const designs = startingDesignsOnce();

port.on("message", (index: number) => {
  try {
    if (!parsed.ok) throw new Error("The model is not valid.");
    const options: OptimizeOptions = {
      ...data.options,
      stopRequested: stop ? () => Atomics.load(stop, 0) === 1 : undefined,
      onProgress: index === 0 ? (progress) => port.postMessage({ kind: "progress", progress } satisfies StartThreadMessage) : undefined,
    };
    const { label, result } = runStart(parsed.model, options, index, data.count, undefined, designs);
    port.postMessage({ kind: "done", index, label, resultJson: JSON.stringify(result) } satisfies StartThreadMessage);
  } catch (e) {
    port.postMessage({ kind: "error", index, message: e instanceof Error ? e.message : String(e) } satisfies StartThreadMessage);
  }
});
