import { Link } from "react-router";
import { toJobRows } from "~/components/job/job-rows.server";
import { JobsList } from "~/components/job/JobsList";
import { formatDateTime } from "~/lib/format";
import { EmptyState } from "~/components/ui/States";
import { getUser } from "~/lib/access.server";
import { can, ROLE_LABELS } from "~/lib/auth/permissions";
import { listProjects } from "~/lib/auth/projects.server";
import { listJobs } from "~/lib/jobs/queue.server";
import type { Route } from "./+types/home";
import { RouteError } from "~/components/ui/RouteError";
import { withDependencies } from "~/lib/http.server";

export function meta(_: Route.MetaArgs) {
  return [{ title: "Strutwise — truss optimization desk" }];
}

// The desk: what waits for me (reviews for checkers), the latest runs (my own for
// engineers), and the projects. Signed out, a short word on what this is.
export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  if (!user) return { user: null };
  const reviewer = can(user.role, "review:job");
  const engineer = can(user.role, "create:job");
  const [succeeded, recent, projects] = await Promise.all([
    reviewer ? listJobs({ review: "waiting", limit: 100, visibleTo: user }) : Promise.resolve({ jobs: [], nextCursor: null }),
    listJobs({ submittedBy: engineer && user.role !== "admin" ? user.id : undefined, limit: 8, visibleTo: user }),
    listProjects({ visibleTo: user }),
  ]);
  // the review filter knows which runs wait (no decision yet, or an approval reopened; never an
  // infeasible or failed run: review-request.ts); nobody reviews their own run (four-eyes rule)
  const waiting = succeeded.jobs.filter((j) => j.submittedBy !== user.id);
  return {
    user: { name: user.name, role: user.role },
    reviewer,
    engineer,
    ownJobs: engineer && user.role !== "admin",
    waiting: await toJobRows(waiting.slice(0, 8)),
    waitingMore: waiting.length > 8,
    recent: await toJobRows(recent.jobs),
    projects: projects.slice(0, 9).map((p) => ({ id: p.id, code: p.code, name: p.name, client: p.client, createdAt: p.createdAt.toISOString() })),
    projectCount: projects.length,
  };
});

export default function Home({ loaderData }: Route.ComponentProps) {
  if (!loaderData.user) return <Welcome />;
  const { user, reviewer, engineer, ownJobs, waiting, waitingMore, recent, projects, projectCount } = loaderData;
  return (
    <div className="space-y-8">
      <header>
        <p className="font-mono text-sm text-brass-strong">optimization desk · {ROLE_LABELS[user.role]}</p>
        <h1 className="mt-1 text-2xl font-semibold sm:text-3xl">Good to see you, {user.name.split(" ")[0] || user.name}.</h1>
      </header>

      {reviewer && (
        <section className="card min-w-0" aria-label="Waiting for review">
          <div className="mb-3 flex items-baseline justify-between">
            <h2 className="font-semibold">Waiting for your review</h2>
            {waitingMore && (
              <Link to="/jobs?review=waiting" className="text-sm text-info hover:underline">
                every run waiting for review
              </Link>
            )}
          </div>
          <JobsList rows={waiting} pageSize={8} empty={<EmptyState title="Nothing waits for you">Finished runs by other engineers appear here until someone reviews them.</EmptyState>} />
        </section>
      )}

      <section className="card min-w-0" aria-label="Recent jobs">
        <div className="mb-3 flex items-baseline justify-between">
          <h2 className="font-semibold">{ownJobs ? "Your latest runs" : "Latest runs"}</h2>
          <Link to="/jobs" className="text-sm text-info hover:underline">
            all jobs
          </Link>
        </div>
        <JobsList
          rows={recent}
          pageSize={8}
          empty={
            <EmptyState title="No runs yet">
              {engineer ? "Open a project, drop a truss JSON on it and queue the first optimization." : "Runs appear here as engineers queue them."}
            </EmptyState>
          }
        />
      </section>

      <section aria-label="Projects">
        <div className="mb-3 flex items-baseline justify-between">
          <h2 className="font-semibold">Projects</h2>
          <Link to="/projects" className="text-sm text-info hover:underline">
            {projectCount > projects.length ? `all ${projectCount} projects` : engineer ? "new project" : "all projects"}
          </Link>
        </div>
        {projects.length === 0 ? (
          <EmptyState
            title="No projects yet"
            action={
              engineer ? (
                <Link to="/projects" className="btn btn-accent">
                  Open the first project
                </Link>
              ) : undefined
            }
          >
            {engineer ? "A project holds the truss models and runs of one job site." : "Projects appear here once an engineer opens one."}
          </EmptyState>
        ) : (
          <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            {projects.map((p) => (
              <li key={p.id}>
                <Link to={`/projects/${p.id}`} className="card block h-full transition-colors hover:border-brass/60" data-testid="project-card">
                  <span className="font-mono text-xs text-brass-strong">{p.code}</span>
                  <span className="mt-1 block font-medium text-ink">{p.name}</span>
                  <span className="mt-1 block text-xs text-ink-muted">
                    {p.client ? `${p.client} · ` : ""}
                    {formatDateTime(p.createdAt)}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

function Welcome() {
  return (
    <section className="max-w-3xl py-6">
      <p className="font-mono text-sm text-brass-strong">optimization desk</p>
      <h1 className="mt-2 text-3xl font-semibold tracking-tight sm:text-4xl">Less steel, same safety margin.</h1>
      <p className="mt-4 text-lg text-ink-soft">
        Upload a truss, queue a sizing or shape run, watch it converge, and hand the result to a checker before it goes into the project file.
      </p>
      <div className="mt-8 flex flex-wrap gap-3">
        <Link to="/sign-in" className="btn btn-primary">
          Sign in
        </Link>
        <Link to="/sign-up" className="btn btn-secondary">
          Create an account
        </Link>
      </div>
    </section>
  );
}

// errors render inside the shell, so the navigation stays
export function ErrorBoundary() {
  return <RouteError what="desk" />;
}
