// The editor's model, fetched as the version's own file (GET /api/models/:id/file?version=N)
// rather than carried inside the page: the page stays small, the browser parses the file once
// as JSON (not a string escaped inside the page's data, escaped again inside a script), and a
// version never changes, so reopening it is answered from the browser's cache. The page asks
// for the file from its <head> (preloadModelFile), so it downloads while the scripts load.
// Design note: docs/decisions/0021-editor-model-as-its-own-file.md.
import { useEffect, useState } from "react";
import { preload } from "react-dom";

export type ModelFileState = { status: "loading" } | { status: "loaded"; model: Record<string, unknown> } | { status: "failed"; message: string };

/** The address of one version's file: the editor's one source of it. */
export const modelFileUrl = (modelId: string, version: number) => `/api/models/${encodeURIComponent(modelId)}/file?version=${version}`;

/** Puts a preload of the file in the page's head (server render) or the document (client). */
export function preloadModelFile(url: string): void {
  // "anonymous" gives the same request mode and (same-origin) cookies as a plain fetch(), so
  // the fetch below is answered by the preload instead of asking again
  preload(url, { as: "fetch", crossOrigin: "anonymous" });
}

export function useModelFile(url: string): ModelFileState {
  const [state, setState] = useState<ModelFileState>({ status: "loading" });
  useEffect(() => {
    let live = true;
    setState({ status: "loading" });
    fetch(url, { credentials: "same-origin", headers: { Accept: "application/json" } })
      .then(async (res) => {
        if (!res.ok) {
          const body = (await res.json().catch(() => null)) as { error?: string } | null;
          throw new Error(`the server answered ${res.status}${body?.error ? `: ${body.error}` : ""}`);
        }
        const model = (await res.json()) as unknown;
        if (!model || typeof model !== "object" || Array.isArray(model)) throw new Error("the file is not a model object");
        if (live) setState({ status: "loaded", model: model as Record<string, unknown> });
      })
      .catch((e: unknown) => {
        if (live) setState({ status: "failed", message: e instanceof Error ? e.message : String(e) });
      });
    return () => {
      live = false;
    };
  }, [url]);
  return state;
}
