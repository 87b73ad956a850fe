// The model page's list of versions, with the way into the editor and to an analysis.
import { Link } from "react-router";
import { formatDateTime } from "~/lib/format";

export interface VersionRow {
  version: number;
  note: string | null;
  createdAt: string;
  hasDesign: boolean;
}

export function ModelVersions({ modelId, versions, mayEdit }: { modelId: string; versions: VersionRow[]; mayEdit: boolean }) {
  const latest = versions.at(-1);
  return (
    <section className="card" aria-label="Versions">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 className="text-lg font-medium">Versions</h2>
        <div className="flex gap-2">
          {mayEdit && (
            <Link to={`/models/${modelId}/edit`} className="btn btn-primary" data-testid="edit-model">
              Edit the model
            </Link>
          )}
          {latest && (
            <Link to={`/models/${modelId}/versions/${latest.version}`} className="btn btn-secondary">
              Run an analysis of version {latest.version}
            </Link>
          )}
        </div>
      </div>
      <ol className="mt-3 divide-y divide-rule text-sm">
        {versions
          .slice()
          .reverse()
          .map((v) => (
            <li key={v.version} className="flex flex-wrap gap-x-3 py-1.5">
              <Link to={`/models/${modelId}/versions/${v.version}`} className="font-medium text-info hover:underline">
                version {v.version}
              </Link>
              <span className="text-ink-muted">{formatDateTime(v.createdAt)}</span>
              {!v.hasDesign && <span className="text-ink-muted">analysis only</span>}
              {v.note && <span className="text-ink-soft">{v.note}</span>}
            </li>
          ))}
      </ol>
    </section>
  );
}
