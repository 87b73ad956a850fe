// The engine's parser on the editor's model, run in a worker (model-check.worker.ts) so a big
// model's check never blocks typing or the preview's first frame. Only the newest model is
// checked: while one check runs, later edits replace each other and the last one goes next.
// Null until the first answer (and on the server, which does not check: the stored version
// passed the gate when it was saved). Without workers it checks on the main thread, after a
// frame, loading the parser only then.
import { useEffect, useRef, useState } from "react";
import type { ParseResult } from "~/engine/truss";

type Checker = { post(id: number, model: unknown): void; stop(): void };

function startChecker(onResult: (id: number, result: ParseResult) => void): Checker {
  try {
    const w = new Worker(new URL("./model-check.worker.ts", import.meta.url), { type: "module" });
    w.onmessage = (e: MessageEvent<{ id: number; result: ParseResult }>) => onResult(e.data.id, e.data.result);
    return { post: (id, model) => w.postMessage({ id, model }), stop: () => w.terminate() };
  } catch {
    let timer: ReturnType<typeof setTimeout> | undefined;
    return {
      post: (id, model) => {
        clearTimeout(timer);
        // the parser (and zod) load only here, not with the page
        timer = setTimeout(() => void import("~/engine/truss").then(({ parseModel }) => onResult(id, parseModel(model))), 16);
      },
      stop: () => clearTimeout(timer),
    };
  }
}

/** The newest answer (null before the first) and whether it is about `model` as it is now. A null model is not checked: the worker starts with the first model given. */
export function useModelCheck(model: unknown): { result: ParseResult | null; current: boolean } {
  const [answer, setAnswer] = useState<{ result: ParseResult; model: unknown } | null>(null);
  const state = useRef<{ checker: Checker | null; busy: boolean; next: { id: number; model: unknown } | null; latest: number; latestModel: unknown }>({ checker: null, busy: false, next: null, latest: 0, latestModel: undefined });

  useEffect(() => {
    const s = state.current;
    return () => {
      s.checker?.stop();
      s.checker = null;
      s.busy = false;
      s.next = null;
    };
  }, []);

  useEffect(() => {
    const s = state.current;
    if (model === null) return;
    s.checker ??= startChecker((id, r) => {
      s.busy = false;
      if (id === s.latest) setAnswer({ result: r, model: s.latestModel });
      if (s.next) {
        s.busy = true;
        s.checker?.post(s.next.id, s.next.model);
        s.next = null;
      }
    });
    const id = ++s.latest;
    s.latestModel = model;
    if (s.busy) s.next = { id, model };
    else {
      s.busy = true;
      s.checker.post(id, model);
    }
  }, [model]);

  return { result: answer?.result ?? null, current: answer !== null && answer.model === model };
}
