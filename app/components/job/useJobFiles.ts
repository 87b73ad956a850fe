// The big parts of a job page — the model's geometry and the full result — come straight
// from the API routes (/api/models/:id/file, /api/jobs/:id/result) after the page has
// hydrated: native JSON parsing of a megabyte is far quicker than carrying it through the
// page's loader data, and the page shows exactly what a script downloading them sees.
import { useEffect, useState } from "react";
import type { TrussResult } from "~/engine/design/result-types";
import { topologyOf } from "~/components/viewer/model-topology";
import type { ModelLike } from "~/components/viewer/truss-view";

export interface JobFiles {
  topology: ModelLike | null;
  result: TrussResult | null;
  loading: boolean;
  error: string | null;
}

async function getJson(url: string, what: string): Promise<unknown> {
  const res = await fetch(url, { headers: { Accept: "application/json" } });
  if (!res.ok) {
    const body = (await res.json().catch(() => null)) as { error?: string } | null;
    throw new Error(`${what} could not be loaded (${res.status}${body?.error ? `: ${body.error}` : ""})`);
  }
  return res.json();
}

/** `modelVersion`: the version the job ran (older jobs have none and read the model's latest file). */
export function useJobFiles(jobId: string, modelId: string, modelVersion: number | null | undefined, withResult: boolean): JobFiles {
  const [state, setState] = useState<JobFiles>({ topology: null, result: null, loading: true, error: null });
  useEffect(() => {
    let live = true;
    setState((s) => ({ ...s, loading: true, error: null }));
    Promise.all([
      // the geometry the job ran, not the model's latest version (a later edit may move nodes)
      getJson(`/api/models/${modelId}/file${modelVersion ? `?version=${modelVersion}` : ""}`, "The model file"),
      withResult ? getJson(`/api/jobs/${jobId}/result`, "The result") : Promise.resolve(null),
    ])
      .then(([file, result]) => {
        if (!live) return;
        const topology = topologyOf(file);
        setState({ topology, result: result as TrussResult | null, loading: false, error: topology ? null : "The model file has no readable geometry" });
      })
      .catch((e: unknown) => live && setState({ topology: null, result: null, loading: false, error: e instanceof Error ? e.message : String(e) }));
    return () => {
      live = false;
    };
  }, [jobId, modelId, modelVersion, withResult]);
  return state;
}
