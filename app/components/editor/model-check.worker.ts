// The editor's live validation off the page's main thread: the engine's own parser (the checks
// an upload gets) on the model the tables describe. A 3,000-member model takes a noticeable
// fraction of a second to check; here that never holds up typing or the preview's drawing.
import { parseModel } from "~/engine/truss";

// the page's type library describes a window; this file runs as a dedicated worker
const scope = self as unknown as { onmessage: ((e: MessageEvent<{ id: number; model: unknown }>) => void) | null; postMessage(message: unknown): void };

scope.onmessage = (e) => {
  scope.postMessage({ id: e.data.id, result: parseModel(e.data.model) });
};
