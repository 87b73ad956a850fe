// "Clean layout" for layout studies: one step from a dense candidate grid to a buildable truss,
// stored as the next version of the model (POST /api/jobs/:jobId/clean-layout). The server
// checks the result is stable and says why when it is not; nothing is stored then.
import { Link, useFetcher } from "react-router";

interface Created {
  modelId: string;
  version: number;
  summary: string;
}
interface Refused {
  error: string;
  details?: { path: string; message: string }[];
}

export function CleanLayoutPanel({ jobId, hasLpDesign, memberCount }: { jobId: string; hasLpDesign: boolean; memberCount: number }) {
  const fetcher = useFetcher<Created | Refused>();
  const busy = fetcher.state !== "idle";
  const data = fetcher.data;
  return (
    <section className="card" aria-label="Clean layout" data-testid="clean-layout">
      <h2 className="mb-1 font-semibold">Clean layout</h2>
      <p className="mb-3 text-sm text-ink-muted">
        Keep only the members that carry load, drop the nodes that then carry nothing, join straight runs through free nodes, and save the result as the next
        version of this model ({memberCount} members now). The new version is checked for stability before it is saved.
      </p>
      <fetcher.Form method="post" action={`/api/jobs/${jobId}/clean-layout`} className="flex flex-wrap items-end gap-4">
        <label className="text-sm">
          <span className="field-label">keep members from</span>
          <select name="source" defaultValue={hasLpDesign ? "lp" : "optimum"} className="field-input">
            {hasLpDesign && <option value="lp">the least-mass LP design</option>}
            <option value="optimum">this optimum</option>
          </select>
        </label>
        <label className="text-sm">
          <span className="field-label">with an area above (% of the largest)</span>
          <input name="threshold" type="number" min="0.001" max="99" step="any" defaultValue="1" className="field-input w-28" required />
        </label>
        <button type="submit" className="btn btn-secondary" disabled={busy}>
          {busy ? "Cleaning…" : "Save the clean layout"}
        </button>
      </fetcher.Form>
      {data && "modelId" in data && (
        <p className="mt-3 text-sm text-ok" role="status" data-testid="clean-layout-saved">
          Saved as version {data.version}. {data.summary}{" "}
          <Link to={`/models/${data.modelId}`} className="text-info hover:underline">
            Open the model
          </Link>
        </p>
      )}
      {data && "error" in data && (
        <p className="mt-3 text-sm text-bad" role="alert" data-testid="clean-layout-refused">
          {data.error}
        </p>
      )}
    </section>
  );
}
