import { data, Link } from "react-router";
import { CompareTable } from "~/components/compare/CompareTable";
import { CompareView } from "~/components/compare/CompareView";
import { Cautions } from "~/components/ui/Cautions";
import { RouteError } from "~/components/ui/RouteError";
import { EmptyState } from "~/components/ui/States";
import { requirePermission } from "~/lib/access.server";
import { quantityFormatter } from "~/lib/format";
import { withDependencies } from "~/lib/http.server";
import { compareRuns, parseJobIds } from "~/lib/jobs/compare.server";
import { getDisplayUnits } from "~/lib/display-units.server";
import type { Route } from "./+types/compare";

export function meta({ data }: Route.MetaArgs) {
  return [{ title: data && "comparison" in data && data.comparison ? `Compare ${data.comparison.runs.length} runs of ${data.comparison.model.name} — Strutwise` : "Compare runs — Strutwise" }];
}

// /compare?jobs=a,b,c: the runs in the address (shareable), in that order; run A is the one the
// others are measured against. Runs outside the caller's projects answer 404.
export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "read:job");
  const ids = parseJobIds(new URL(request.url).searchParams.get("jobs"));
  const [outcome, displayUnits] = await Promise.all([compareRuns(user, ids), getDisplayUnits(user.id)]);
  if (!outcome.ok) return data({ comparison: null, problem: outcome.problem, runs: outcome.runs ?? [], displayUnits }, { status: 400 });
  return { comparison: outcome.comparison, problem: null, runs: [], displayUnits };
});

export function ErrorBoundary() {
  return <RouteError what="comparison" />;
}

export default function ComparePage({ loaderData }: Route.ComponentProps) {
  const { comparison, problem, runs } = loaderData;
  if (!comparison)
    return (
      <div className="space-y-6">
        <h1 className="text-2xl font-semibold sm:text-3xl">Compare runs</h1>
        <EmptyState title={problem ?? "Nothing to compare"} action={<Link to="/jobs" className="btn btn-secondary">Pick runs in the job list</Link>}>
          <p data-testid="compare-problem">Select two or more runs of one model in the job list and choose “Compare selected”, or open a job and pick “Compare with…”.</p>
          {runs.length > 0 && (
            <ul className="mt-3 space-y-1 text-left">
              {runs.map((r) => (
                <li key={r.id}>
                  <Link to={`/jobs/${r.id}`} className="font-mono text-xs text-info hover:underline">
                    job {r.id.slice(0, 8)}
                  </Link>{" "}
                  — {r.modelName}
                </li>
              ))}
            </ul>
          )}
        </EmptyState>
      </div>
    );
  const q = comparison.units ? quantityFormatter(comparison.units, loaderData.displayUnits) : null;
  return (
    <div className="space-y-6">
      <header>
        <p className="text-sm text-ink-muted">
          <Link to={`/projects/${comparison.model.projectId}`} className="hover:underline">
            {comparison.model.projectCode}
          </Link>{" "}
          /{" "}
          <Link to={`/models/${comparison.model.id}`} className="hover:underline">
            {comparison.model.name}
          </Link>
        </p>
        <h1 className="mt-1 text-2xl font-semibold sm:text-3xl">
          Compare {comparison.runs.length} runs of {comparison.model.name}
        </h1>
        <p className="mt-2 text-sm text-ink-muted">Run A is the one the others are measured against. The address of this page names the runs, so it can be shared with anyone in the project.</p>
      </header>
      <Cautions />
      <section className="card min-w-0" aria-label="Figures">
        <h2 className="mb-3 font-semibold">Figures side by side</h2>
        <CompareTable comparison={comparison} q={q} />
      </section>
      <CompareView comparison={comparison} q={q} />
    </div>
  );
}
