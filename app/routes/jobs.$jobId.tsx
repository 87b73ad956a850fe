import { eq } from "drizzle-orm";
import { useEffect, useMemo, useState } from "react";
import { data, Form, Link } from "react-router";
import { ConvergencePlot } from "~/components/charts/ConvergencePlot";
import { CriterionCostsPanel } from "~/components/job/CriterionCostsPanel";
import { DeflectionSummaryPanel } from "~/components/job/DeflectionSummaryPanel";
import { LowerBoundGauge } from "~/components/job/LowerBoundGauge";
import { CleanLayoutPanel } from "~/components/job/CleanLayoutPanel";
import { LiveProgress, normalizeHistory } from "~/components/job/LiveProgress";
import { OutcomePanel } from "~/components/job/OutcomePanel";
import { MemberTable, NodeTable, type Topology } from "~/components/job/result-tables";
import { ReopenForm, ReviewForm, ReviewHistory, type ReviewActionData } from "~/components/job/ReviewPanel";
import { OUTCOMES_WITHOUT_REVIEW } from "~/lib/review-request";
import { latestDecision, reportLinkLabel } from "~/components/job/review-words";
import { useJobFiles } from "~/components/job/useJobFiles";
import { Cautions } from "~/components/ui/Cautions";
import { formatDateTime, formatDuration, formatNumber, formatPercent, formatResidual, quantityFormatter } from "~/lib/format";
import { RouteError } from "~/components/ui/RouteError";
import { JobStateBadge, ReviewBadge } from "~/components/ui/StatusBadge";
import { countOf, formulationWords, viewerTitle } from "~/components/job/result-words";
import { ErrorNote, LoadingNote, Stat } from "~/components/ui/States";
import { CatalogueDesignPanel } from "~/components/job/CatalogueDesignPanel";
import { ReactionsPanel } from "~/components/job/ReactionsPanel";
import { ResultCasePicker, ResultCaseProvider } from "~/components/job/ResultCase";
import { ResultTrussViewer } from "~/components/job/ResultTrussViewer";
import { db } from "~/db/client.server";
import { jobs, models, projects, user as users } from "~/db/schema";
import { audit } from "~/lib/auth/audit.server";
import { assertPermission, requireJob } from "~/lib/access.server";
import { can } from "~/lib/auth/permissions";
import { createReview, listReviews, reopenReview } from "~/lib/auth/reviews.server";
import type { TrussResult } from "~/engine/design/result-types";
import { notFound, withDependencies } from "~/lib/http.server";
import { cancelJob, getJob, getJobHistory, getJobResult } from "~/lib/jobs/queue.server";
import { comparableRuns } from "~/lib/jobs/compare.server";
import { getDisplayUnits } from "~/lib/display-units.server";
import { getModelFile } from "~/lib/models.server";
import type { Route } from "./+types/jobs.$jobId";
import { plainText } from "~/lib/text-hygiene";
import { jobState } from "~/lib/job-state";
import { maxOf } from "~/engine/util/extent";

export function meta({ data }: Route.MetaArgs) {
  return [{ title: data ? `${plainText(data.facts.modelName)} · job ${data.job.id.slice(0, 8)} — Strutwise` : "Job — Strutwise" }];
}

/** The solver tolerance the run uses: the job's option, the model's, else the engine's default (problem.ts). */
function toleranceOf(text: string, options: { tolerance?: number } | null): number {
  if (options?.tolerance) return options.tolerance;
  try {
    return (JSON.parse(text) as { design?: { solver?: { tolerance?: number } } }).design?.solver?.tolerance ?? 1e-6;
  } catch {
    return 1e-6;
  }
}

function unitsOf(text: string): { length: string; force: string; mass: string } | null {
  try {
    return (JSON.parse(text) as { units?: { length: string; force: string; mass: string } }).units ?? null;
  } catch {
    return null;
  }
}

const HEAD_LIST_CAP = 100;
/** Layout studies: from this many candidate members the page offers a clean layout. */
const CLEAN_LAYOUT_FROM = 20;
const byWeight = (a: { multiplier: number }, b: { multiplier: number }) => Math.abs(b.multiplier) - Math.abs(a.multiplier);

/**
 * The result without its per-member, per-node and per-iteration lists: what the page renders
 * on the server (outcome, figures, governing limits). The lists load in the browser.
 */
function headOf(r: TrussResult) {
  const { members, nodes, history, ...rest } = r;
  return {
    ...rest,
    shadowPrices: r.shadowPrices ? [...r.shadowPrices].sort((a, b) => byWeight(a, b)).slice(0, HEAD_LIST_CAP) : undefined,
    activeConstraints: [...r.activeConstraints].sort(byWeight).slice(0, HEAD_LIST_CAP),
    activeCount: r.activeConstraints.length,
    maxUtilization: r.verification?.maxUtilization ?? members.reduce((m, x) => Math.max(m, x.utilization), 0),
    memberCount: members.length,
  };
}

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  const { user } = await requireJob(request, params.jobId, "read:job");
  const job = await getJob(params.jobId);
  if (!job) notFound(`Job ${params.jobId}`);

  const [facts] = await db()
    .select({ modelName: models.name, modelId: models.id, sha256: models.sha256, projectId: projects.id, projectCode: projects.code, projectName: projects.name, submitterName: users.name })
    .from(models)
    .innerJoin(projects, eq(projects.id, models.projectId))
    .leftJoin(users, eq(users.id, job.submittedBy ?? ""))
    .where(eq(models.id, job.modelId))
    .limit(1);
  if (!facts) notFound(`The model of job ${job.id}`);

  const live = job.status === "queued" || job.status === "running";
  const [file, result, history, reviews, comparable] = await Promise.all([
    live ? getModelFile(job.modelId).catch(() => null) : Promise.resolve(null),
    job.hasResult ? getJobResult(job.id) : Promise.resolve(null),
    live ? getJobHistory(job.id) : Promise.resolve([]),
    listReviews(job.id),
    job.hasResult ? comparableRuns(job.modelId, job.id) : Promise.resolve([]),
  ]);
  // the review thread across runs: the returned run this one answers, and the runs answering it
  const displayUnits = await getDisplayUnits(user.id);
  const answeredBy = await db().select({ id: jobs.id, createdAt: jobs.createdAt }).from(jobs).where(eq(jobs.answersJobId, job.id)).orderBy(jobs.createdAt);
  const text = file?.text ?? "";
  const own = job.submittedBy === user.id;
  return {
    job: {
      id: job.id,
      status: job.status,
      outcome: job.outcome,
      error: job.error,
      options: job.options as Record<string, unknown>,
      createdAt: job.createdAt,
      startedAt: job.startedAt,
      finishedAt: job.finishedAt,
      progress: job.progress,
      hasResult: job.hasResult,
      kind: job.kind,
      modelVersion: job.modelVersion,
      waitingFor: job.waitingFor,
      answersJobId: job.answersJobId,
    },
    answeredBy: answeredBy.map((a) => a.id),
    displayUnits,
    facts: { ...facts, submitterName: facts.submitterName ?? "unknown" },
    tolerance: toleranceOf(text, job.options),
    modelUnits: unitsOf(text),
    head: result ? headOf(result) : null,
    history: normalizeHistory(history),
    reviews: reviews.map((r) => ({ id: r.id, decision: r.decision, comment: r.comment, reviewerName: r.reviewerName || r.reviewerEmail, createdAt: r.createdAt })),
    comparable,
    may: {
      cancel: can(user.role, "cancel:job:any") || (own && can(user.role, "cancel:job:own")),
      review: can(user.role, "review:job") && !own,
      own,
      rerun: can(user.role, "create:job"),
      reopen: can(user.role, "manage:users"),
      newVersion: can(user.role, "create:model"),
    },
  };
});

async function errorOf(e: unknown): Promise<{ status: number; error: string; details?: { path: string; message: string }[] }> {
  if (e instanceof Response) {
    const body = (await e.json().catch(() => null)) as { error?: string; details?: { path: string; message: string }[] } | null;
    return { status: e.status, error: body?.error ?? e.statusText, details: body?.details };
  }
  throw e;
}

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  const { user } = await requireJob(request, params.jobId, "read:job");
  const form = await request.formData();
  const intent = form.get("intent");
  if (intent === "cancel") {
    // own jobs for engineers; cancelJob itself lets only the submitter or an admin through
    assertPermission(user, "cancel:job:own");
    try {
      const job = await cancelJob(params.jobId, user);
      await audit({ request, actor: user, action: "job.cancel", entityType: "job", entityId: job.id, detail: { status: job.status } });
      return { ok: true };
    } catch (e) {
      const err = await errorOf(e);
      return data({ error: err.error }, { status: err.status });
    }
  }
  if (intent === "review") {
    assertPermission(user, "review:job");
    const decision = String(form.get("decision") ?? "");
    if (decision !== "approved" && decision !== "changes-requested")
      return data<ReviewActionData>({ fieldErrors: { decision: "Choose approve or return with changes" } }, { status: 400 });
    try {
      await createReview({ jobId: params.jobId, reviewer: user, decision, comment: String(form.get("comment") ?? ""), request });
      return data<ReviewActionData>({ ok: true });
    } catch (e) {
      const err = await errorOf(e);
      const fieldErrors = Object.fromEntries((err.details ?? []).map((d) => [d.path, d.message]));
      return data<ReviewActionData>({ error: err.details?.length ? undefined : err.error, fieldErrors }, { status: err.status });
    }
  }
  if (intent === "reopen") {
    try {
      await reopenReview({ jobId: params.jobId, admin: user, reason: String(form.get("reason") ?? ""), request });
      return data<ReviewActionData>({ ok: true });
    } catch (e) {
      const err = await errorOf(e);
      const fieldErrors = Object.fromEntries((err.details ?? []).map((d) => [d.path, d.message]));
      return data<ReviewActionData>({ error: err.details?.length ? undefined : err.error, fieldErrors }, { status: err.status });
    }
  }
  return data({ error: "Unknown action" }, { status: 400 });
});

export function ErrorBoundary() {
  return <RouteError what="job" />;
}

export default function JobPage({ loaderData }: Route.ComponentProps) {
  const { job, facts, head, history, reviews, may, tolerance } = loaderData;
  const files = useJobFiles(job.id, facts.modelId, job.modelVersion, job.hasResult && head !== null);
  // only a run with a design to sign off is reviewed (review-request.ts): no review mark otherwise
  const reviewable = job.status === "succeeded" && !OUTCOMES_WITHOUT_REVIEW.includes(job.outcome ?? "");
  const { topology, result } = files;
  const live = job.status === "queued" || job.status === "running";
  // the header follows the live poll between loader runs
  const [shownStatus, setShownStatus] = useState<string>(job.status);
  useEffect(() => setShownStatus(job.status), [job.status]);
  const objectiveKind = head?.objective.kind ?? (job.options.objective as string | undefined) ?? "mass";
  const plotUnits = head?.units ?? loaderData.modelUnits;
  const objectiveLabel = plotUnits ? `${objectiveKind} (${objectiveKind === "mass" ? plotUnits.mass : `${plotUnits.force}·${plotUnits.length}`})` : objectiveKind;
  const current = latestDecision(reviews);
  const topo = useMemo<Topology>(
    () => ({
      members: new Map((topology?.members ?? []).map((m) => [m.id, { start: m.start, end: m.end, group: m.group }])),
      nodes: new Map((topology?.nodes ?? []).map((n) => [n.id, { x: n.x, y: n.y, z: n.z ?? 0, fixed: n.fixed ?? [] }])),
    }),
    [topology],
  );
  const elapsed = job.startedAt && job.finishedAt ? new Date(job.finishedAt).getTime() - new Date(job.startedAt).getTime() : null;
  const q = head?.units ? quantityFormatter(head.units, loaderData.displayUnits) : null;
  const [selectedMember, setSelectedMember] = useState<string | null>(null);
  const saving = head && head.objective.initial > 0 ? 1 - head.objective.final / head.objective.initial : null;
  const objUnit = q ? (head?.objective.kind === "mass" ? q.unit("mass") : `${q.unit("force")}·${q.unit("length")}`) : "";
  const objValue = (v: number) => (q ? q.number(v, head?.objective.kind === "mass" ? "mass" : "compliance") : formatNumber(v));
  // a broken limit is never hidden behind a member utilization just under 100 %
  const worstRatio = Math.max(head?.maxUtilization ?? 0, maxOf((head?.verification?.failures ?? []).map((f) => f.ratio)));

  return (
    <ResultCaseProvider result={result}>
    <div className="space-y-6">
      <header>
        <p className="text-sm text-ink-muted">
          <Link to={`/projects/${facts.projectId}`} className="hover:underline">
            {facts.projectCode} · {facts.projectName}
          </Link>{" "}
          /{" "}
          <Link to={`/models/${facts.modelId}`} className="hover:underline">
            {facts.modelName}
          </Link>
          {job.modelVersion && (
            <>
              {" "}
              /{" "}
              <Link to={`/models/${facts.modelId}/versions/${job.modelVersion}`} className="hover:underline">
                version {job.modelVersion}
              </Link>
            </>
          )}
        </p>
        <h1 className="mt-1 flex flex-wrap items-center gap-3 text-2xl font-semibold sm:text-3xl">
          <span>{job.kind === "analysis" ? "Analysis" : "Job"} {job.id.slice(0, 8)}</span>
          <JobStateBadge status={shownStatus} outcome={shownStatus === job.status ? job.outcome : null} hasResult={job.hasResult} waitingFor={job.waitingFor} />
          {reviewable && <ReviewBadge decision={current?.decision} />}
        </h1>
        {(job.answersJobId || loaderData.answeredBy.length > 0) && (
          <p className="mt-2 text-sm" data-testid="review-thread">
            {job.answersJobId && (
              <>
                Answers job{" "}
                <Link to={`/jobs/${job.answersJobId}`} className="font-mono text-info hover:underline" data-testid="answers-link">
                  {job.answersJobId.slice(0, 8)}
                </Link>
                , returned by a checker with changes requested.{" "}
              </>
            )}
            {loaderData.answeredBy.length > 0 && (
              <>
                Answered by{" "}
                {loaderData.answeredBy.map((id, i) => (
                  <span key={id}>
                    {i > 0 && ", "}
                    <Link to={`/jobs/${id}`} className="font-mono text-info hover:underline" data-testid="answered-by-link">
                      job {id.slice(0, 8)}
                    </Link>
                  </span>
                ))}
                .
              </>
            )}
          </p>
        )}
        <p className="mt-2 text-sm text-ink-muted">
          submitted by {facts.submitterName} · {formatDateTime(job.createdAt)}
          {job.finishedAt && <> · finished {formatDateTime(job.finishedAt)}</>}
          {elapsed !== null && <> · ran {formatDuration(elapsed)}</>}
          {Object.keys(job.options).length > 0 && (
            <>
              {" "}
              · options{" "}
              <code className="font-mono text-xs">
                {Object.entries(job.options)
                  .map(([k, v]) => `${k}=${String(v)}`)
                  .join(", ")}
              </code>
            </>
          )}
        </p>
      </header>

      {live && (
        <LiveProgress
          initial={{ id: job.id, status: job.status, outcome: job.outcome, progress: job.progress }}
          initialHistory={history}
          tolerance={tolerance}
          canCancel={may.cancel}
          objectiveLabel={objectiveLabel}
          onStatus={setShownStatus}
        />
      )}

      {!live && (
        <OutcomePanel status={job.status} outcome={job.outcome ?? head?.status ?? null} message={head?.message} hint={head?.hint} error={job.error} hasResult={job.hasResult} />
      )}

      {head && (
        <>
          <Cautions />
          <section className="card" aria-label="Summary">
            <dl className="grid grid-cols-2 gap-x-6 gap-y-4 sm:grid-cols-3 lg:grid-cols-6">
              <Stat label={`${head.objective.kind} initial${objUnit ? ` (${objUnit})` : ""}`} value={objValue(head.objective.initial)} />
              <Stat label={`${head.objective.kind} final${objUnit ? ` (${objUnit})` : ""}`} value={<span data-testid="objective-final">{objValue(head.objective.final)}</span>} />
              <Stat label="change" value={saving !== null ? formatPercent(-saving) : "–"} />
              <Stat label="iterations" value={head.iterations} />
              <Stat label="truss analyses" value={head.analyses} hint="stiffness solves of the whole truss (or evaluations of the equilibrium constraints) the run used" />
              <Stat label="KKT residual" value={formatResidual(head.kktResidual)} />
              <Stat label="largest violation (share of its limit)" value={formatResidual(head.maxViolation)} />
              <Stat label={`volume (${q?.unit("volume")})`} value={q?.number(head.volume, "volume")} />
              {head.mass !== undefined && <Stat label={`mass (${q?.unit("mass")})`} value={q?.number(head.mass, "mass")} />}
              <Stat label="max utilization" value={formatPercent(head.maxUtilization)} />
              {head.formulation && <Stat label="formulation" value={formulationWords(head.formulation)} wrap words />}
              {head.verification && (
                <Stat label="independent check" value={head.verification.allLimitsMet ? "all limits met" : countOf(head.verification.failures.length, "limit exceeded", "limits exceeded")} words hint={`equilibrium residual ${formatResidual(head.verification.equilibriumResidual)}, ${head.verification.checked} checks`} />
              )}
              {head.solver && <Stat label="solver" value={`${head.solver.name} ${head.solver.version}`} wrap />}
            </dl>
          </section>
          <LowerBoundGauge result={head} />
          {may.newVersion && head.memberCount >= CLEAN_LAYOUT_FROM && <CleanLayoutPanel jobId={job.id} hasLpDesign={!!head.lowerBound && head.objective.kind === "mass"} memberCount={head.memberCount} />}
        </>
      )}

      {files.error ? (
        <ErrorNote title="The 3D view and tables could not be loaded">{files.error}</ErrorNote>
      ) : topology && (result || !head) ? (
        <>
          {result && <ResultCasePicker />}
          <ResultTrussViewer
            key={result ? "result" : "initial"}
            model={topology}
            result={result}
            selectedMemberId={selectedMember}
            onSelectMemberId={setSelectedMember}
            displayUnits={loaderData.displayUnits}
            title={viewerTitle(result ? (job.status === "cancelled" ? "cancelled" : (head?.status ?? job.outcome)) : null)} />
        </>
      ) : (
        <div className="card flex h-[26rem] items-center justify-center sm:h-[32rem]" data-testid="truss-viewer-loading">
          <LoadingNote>Loading the geometry{head ? ` and the result of ${head.memberCount} members` : ""}…</LoadingNote>
        </div>
      )}

      {head?.catalogue && <CatalogueDesignPanel result={head} />}

      {head && (
        <div className="grid gap-6">
          <section className="card min-w-0" aria-label="Convergence">
            <h2 className="mb-3 font-semibold">Convergence</h2>
            {result ? <ConvergencePlot history={normalizeHistory(result.history)} objectiveLabel={objectiveLabel} /> : <LoadingNote>Loading the iteration history…</LoadingNote>}
          </section>
          <DeflectionSummaryPanel result={head} />
        </div>
      )}
      {head && <CriterionCostsPanel result={head} activeCount={head.activeCount} />}

      {head && head.variables.length > 0 && (
        <section className="card" aria-label="Shape variables">
          <h2 className="mb-3 font-semibold">Shape variables</h2>
          <table className="data-table max-w-md">
            <thead>
              <tr>
                <th>variable</th>
                <th className="num">offset from the start ({q?.unit("length")})</th>
              </tr>
            </thead>
            <tbody>
              {head.variables.map((v) => (
                <tr key={v.id}>
                  <td>{v.id}</td>
                  <td className="num">{q ? q.number(v.value, "length", { sig: 6 }) : formatNumber(v.value, { sig: 6 })}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}

      {head && !result && !files.error && (
        <section className="card" aria-label="Members">
          <LoadingNote>Loading the member and node tables…</LoadingNote>
        </section>
      )}
      {result && result.members.length > 0 && (
        <>
          <section className="card min-w-0" aria-label="Members">
            <h2 className="mb-3 font-semibold">Members</h2>
            <MemberTable result={result} topology={topo} fileName={facts.modelName} units={loaderData.displayUnits} selectedId={selectedMember} onSelect={setSelectedMember} />
          </section>
          <section className="card min-w-0" aria-label="Nodes">
            <h2 className="mb-3 font-semibold">Nodes</h2>
            <NodeTable result={result} topology={topo} fileName={facts.modelName} units={loaderData.displayUnits} />
          </section>
          <ReactionsPanel result={result} fileName={facts.modelName} />
        </>
      )}

      <div className="grid gap-6 lg:grid-cols-3">
        <section className="card min-w-0 lg:col-span-2" aria-label="Review">
          <h2 className="mb-3 font-semibold">Review</h2>
          <ReviewHistory reviews={reviews} signable={!(job.status === "succeeded" && OUTCOMES_WITHOUT_REVIEW.includes(job.outcome ?? ""))} />
          {current?.decision === "approved" ? (
            <div className="mt-4 border-t border-rule pt-4 text-sm" data-testid="review-closed">
              <p className="text-ink-soft">This run is approved and closed: a change needs a new run{may.reopen ? ", or reopening it below with a reason (recorded in the audit trail)" : " (or an admin reopening it with a reason)"}.</p>
              {may.reopen && <ReopenForm />}
            </div>
          ) : (
            job.status === "succeeded" &&
            may.review && (
              <div className="mt-4 border-t border-rule pt-4">
                <ReviewForm canApprove={!OUTCOMES_WITHOUT_REVIEW.includes(job.outcome ?? "")} />
              </div>
            )
          )}
          {current?.decision === "changes-requested" && may.rerun && (
            <p className="mt-3 flex flex-wrap items-center gap-2 text-sm">
              <Link to={`/models/${facts.modelId}/edit?${job.modelVersion ? `version=${job.modelVersion}&` : ""}answers=${job.id}`} className="btn btn-primary" data-testid="run-again-with-changes">
                Run again with changes
              </Link>
              <Link to={`/models/${facts.modelId}?answers=${job.id}#queue`} className="text-info hover:underline" data-testid="rerun-other-options">
                or queue it again with other options
              </Link>
            </p>
          )}
          {job.status === "succeeded" && may.own && !may.review && (
            <p className="mt-3 text-sm text-ink-muted">You submitted this job, so another checker reviews it (four-eyes rule).</p>
          )}
        </section>
        <section className="card min-w-0" aria-label="Downloads">
          <h2 className="mb-3 font-semibold">Downloads</h2>
          <ul className="space-y-2 text-sm">
            {head && (
              <li>
                <a className="text-info hover:underline" href={`/api/jobs/${job.id}/result`} download={`job-${job.id.slice(0, 8)}.result.json`} data-testid="download-result">
                  Result JSON
                </a>
              </li>
            )}
            {job.status === "succeeded" && (
              <li>
                <a className="text-info hover:underline" href={`/api/jobs/${job.id}/report`} data-testid="download-report">
                  {reportLinkLabel(current?.decision, reviewable)}
                </a>
              </li>
            )}
            <li>
              <a className="text-info hover:underline" href={`/api/models/${facts.modelId}/file${job.modelVersion ? `?version=${job.modelVersion}` : ""}`} download>
                Model file (JSON)
              </a>
              <span className="block truncate font-mono text-2xs text-ink-muted" title={facts.sha256}>
                SHA-256 {facts.sha256}
              </span>
            </li>
          </ul>
          {loaderData.comparable.length > 0 && <CompareWith jobId={job.id} others={loaderData.comparable} />}
          {may.rerun && !live && (
            <div className="mt-4 flex flex-wrap gap-2">
              <Link to={`/models/${facts.modelId}`} className="btn btn-secondary">
                Queue another run
              </Link>
              <Link to={`/models/${facts.modelId}/edit${job.modelVersion ? `?version=${job.modelVersion}` : ""}`} className="btn btn-secondary" data-testid="edit-and-run-again">
                Edit and run again
              </Link>
            </div>
          )}
        </section>
      </div>
    </div>
    </ResultCaseProvider>
  );
}

/** "Compare with…": another run of this model with a result, opened side by side (a GET form to /compare). */
function CompareWith({ jobId, others }: { jobId: string; others: { id: string; modelVersion: number | null; createdAt: string | Date; outcome: string | null; status: string }[] }) {
  return (
    <Form method="get" action="/compare" className="mt-4 flex flex-wrap items-end gap-2 border-t border-rule pt-4" aria-label="Compare with another run">
      <label className="block min-w-0 flex-1">
        <span className="field-label">Compare with…</span>
        <select name="jobs" className="field-input" data-testid="compare-with">
          {others.map((o) => (
            <option key={o.id} value={`${jobId},${o.id}`}>
              job {o.id.slice(0, 8)}
              {o.modelVersion !== null ? ` · version ${o.modelVersion}` : ""} · {formatDateTime(o.createdAt)} · {jobState({ status: o.status, outcome: o.outcome, hasResult: true }).sentence}
            </option>
          ))}
        </select>
      </label>
      <button type="submit" className="btn btn-secondary" data-testid="compare-with-go">
        Compare
      </button>
    </Form>
  );
}
