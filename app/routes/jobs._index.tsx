import { Form, Link, useNavigation, useSearchParams } from "react-router";
import { toJobRows } from "~/components/job/job-rows.server";
import { JobsList } from "~/components/job/JobsList";
import { RouteError } from "~/components/ui/RouteError";
import { EmptyState } from "~/components/ui/States";
import { JOB_STATUSES, type JobStatus } from "~/db/schema";
import { assertProjectVisible, requirePermission } from "~/lib/access.server";
import { listProjects } from "~/lib/auth/projects.server";
import { REVIEW_FILTERS, type ReviewFilter } from "~/lib/job-state";
import { listJobs } from "~/lib/jobs/queue.server";
import type { Route } from "./+types/jobs._index";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Jobs — Strutwise" }];
}

const PAGE = 25;

// Filters and the page cursor live in the address (server-side), so a filtered view can be
// bookmarked and shared; sorting within the page happens in the browser.
export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "read:job");
  const sp = new URL(request.url).searchParams;
  const status = sp.get("status") ?? "";
  const projectId = sp.get("projectId") ?? "";
  const cursor = sp.get("cursor") ?? "";
  const review = sp.get("review") ?? "";
  const reviewFilter = Object.hasOwn(REVIEW_FILTERS, review) ? (review as ReviewFilter) : undefined;
  const statusFilter = status === "active" ? (["queued", "running"] as JobStatus[]) : (JOB_STATUSES as readonly string[]).includes(status) ? (status as JobStatus) : undefined;
  if (projectId) await assertProjectVisible(user, projectId);
  const [page, projects] = await Promise.all([
    listJobs({ status: statusFilter, review: reviewFilter, projectId: projectId || undefined, cursor: cursor || undefined, limit: PAGE, visibleTo: user }),
    listProjects({ visibleTo: user }),
  ]);
  const api = new URLSearchParams();
  // the live poll leaves the status filter out: a running row must still be found once it
  // has finished; queued and running jobs are among the newest, so a long page finds them
  if (projectId) api.set("projectId", projectId);
  api.set("limit", "200");
  return {
    rows: await toJobRows(page.jobs),
    nextCursor: page.nextCursor,
    filters: { status, projectId, cursor, review },
    projects: projects.map((p) => ({ id: p.id, code: p.code, name: p.name })),
    pollUrl: `/api/jobs?${api}`,
  };
});

export function ErrorBoundary() {
  return <RouteError what="job list" />;
}

export default function JobsIndex({ loaderData }: Route.ComponentProps) {
  const { rows, nextCursor, filters, projects, pollUrl } = loaderData;
  const [sp] = useSearchParams();
  const nav = useNavigation();
  const next = new URLSearchParams(sp);
  if (nextCursor) next.set("cursor", nextCursor);
  const first = new URLSearchParams(sp);
  first.delete("cursor");
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold sm:text-3xl">Jobs</h1>
          <p className="mt-1 text-sm text-ink-muted">Every optimization run, newest first. Running jobs update by themselves.</p>
        </div>
      </header>
      <Form method="get" className="card flex flex-wrap items-end gap-3" aria-label="Filter jobs">
        <label className="block w-full sm:w-auto">
          <span className="field-label">Status</span>
          <select name="status" defaultValue={filters.status} className="field-input sm:w-auto">
            <option value="">any</option>
            <option value="active">queued or running</option>
            {JOB_STATUSES.map((s) => (
              <option key={s} value={s}>
                {s}
              </option>
            ))}
          </select>
        </label>
        <label className="block w-full sm:w-auto">
          <span className="field-label">Review</span>
          <select name="review" defaultValue={filters.review} className="field-input sm:w-auto" data-testid="review-filter">
            <option value="">any</option>
            {Object.entries(REVIEW_FILTERS).map(([k, words]) => (
              <option key={k} value={k}>
                {words}
              </option>
            ))}
          </select>
        </label>
        <label className="block w-full min-w-0 sm:w-auto sm:max-w-xs sm:flex-1">
          <span className="field-label">Project</span>
          <select name="projectId" defaultValue={filters.projectId} className="field-input">
            <option value="">all projects</option>
            {projects.map((p) => (
              <option key={p.id} value={p.id}>
                {p.code} · {p.name}
              </option>
            ))}
          </select>
        </label>
        <button type="submit" className="btn btn-primary">
          {nav.state === "loading" ? "Filtering…" : "Apply"}
        </button>
        {(filters.status || filters.projectId || filters.review) && (
          <Link to="/jobs" className="btn btn-secondary">
            Clear
          </Link>
        )}
      </Form>
      <section className="card min-w-0" aria-label="Job list">
        <JobsList
          rows={rows}
          pollUrl={pollUrl}
          pageSize={PAGE}
          selectable
          empty={
            <EmptyState title={filters.status || filters.projectId || filters.review ? "No jobs match these filters" : "No jobs yet"}>
              {filters.status || filters.projectId || filters.review ? "Clear the filters to see every job." : "Upload a model on a project page and queue its first run."}
            </EmptyState>
          }
        />
        {(filters.cursor || nextCursor) && (
          <nav className="mt-3 flex justify-between text-sm" aria-label="Job pages">
            {filters.cursor ? (
              <Link to={`/jobs?${first}`} className="btn btn-secondary px-3 py-1">
                Newest
              </Link>
            ) : (
              <span />
            )}
            {nextCursor && (
              <Link to={`/jobs?${next}`} className="btn btn-secondary px-3 py-1">
                Older jobs
              </Link>
            )}
          </nav>
        )}
      </section>
    </div>
  );
}
