// A queued or running job, live: status and figures from /api/jobs/:id every second, the
// convergence history from /api/jobs/:id/progress every two, both by fetch (no reloads).
// When the job ends the page's loader runs again and the result replaces this panel.
import { useEffect, useRef, useState } from "react";
import { useFetcher, useRevalidator } from "react-router";
import { ConvergencePlot, type ConvergencePoint } from "~/components/charts/ConvergencePlot";
import { formatNumber, formatResidual } from "~/lib/format";
import { ProgressBar } from "~/components/ui/ProgressBar";
import { JobStateBadge } from "~/components/ui/StatusBadge";
import { ErrorNote } from "~/components/ui/States";
import type { LiveJob } from "./types";
import { minOf } from "~/engine/util/extent";

const TERMINAL = new Set(["succeeded", "failed", "cancelled"]);

export function normalizeHistory(data: unknown): ConvergencePoint[] {
  const list = Array.isArray(data) ? data : ((data as { history?: unknown[]; entries?: unknown[] } | null)?.history ?? (data as { entries?: unknown[] } | null)?.entries ?? []);
  return (list as Record<string, unknown>[])
    .map((h) => ({
      iteration: Number(h.iteration),
      objective: num(h.objective ?? h.f),
      maxViolation: num(h.maxViolation),
      kktResidual: num(h.kktResidual),
    }))
    .filter((h) => Number.isFinite(h.iteration))
    .sort((a, b) => a.iteration - b.iteration);
}

function num(v: unknown): number | null {
  return typeof v === "number" && Number.isFinite(v) ? v : null;
}

function usePoll(fn: () => void, ms: number, active: boolean) {
  const saved = useRef(fn);
  saved.current = fn;
  useEffect(() => {
    if (!active) return;
    saved.current();
    const t = setInterval(() => saved.current(), ms);
    return () => clearInterval(t);
  }, [ms, active]);
}

export function LiveProgress({
  initial,
  initialHistory,
  tolerance,
  canCancel,
  objectiveLabel,
  onStatus,
}: {
  onStatus?: (status: string) => void;
  initial: LiveJob;
  initialHistory: ConvergencePoint[];
  /** the solver's tolerance on the optimality residual */
  tolerance: number;
  canCancel: boolean;
  objectiveLabel: string;
}) {
  const job = useFetcher<LiveJob>();
  const history = useFetcher<unknown>();
  const cancel = useFetcher<{ error?: string }>();
  const revalidator = useRevalidator();
  const live: LiveJob = job.data && (job.data as LiveJob).id ? (job.data as LiveJob) : initial;
  const done = TERMINAL.has(live.status);

  usePoll(() => job.state === "idle" && job.load(`/api/jobs/${initial.id}`), 1000, !done);
  usePoll(() => history.state === "idle" && history.load(`/api/jobs/${initial.id}/progress`), 2000, !done && live.status === "running");

  useEffect(() => onStatus?.(live.status), [live.status, onStatus]);

  useEffect(() => {
    if (done && revalidator.state === "idle") revalidator.revalidate();
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [done]);

  const recorded = history.data !== undefined ? normalizeHistory(history.data) : initialHistory;
  const p = live.progress;
  // the status line and the plot read the same iterations: the latest progress row joins the
  // plotted history when the history poll has not caught up with it yet
  const points = withLatest(recorded, p);
  const iteration = points.length ? points[points.length - 1]!.iteration : (p?.iteration ?? null);
  const closeness = convergenceShare(points, tolerance);
  const [confirming, setConfirming] = useState(false);

  return (
    <section className="card space-y-4" aria-label="Progress" data-testid="live-progress">
      <div className="flex flex-wrap items-center gap-3">
        <h2 className="font-semibold">Progress</h2>
        <JobStateBadge status={live.status} outcome={live.outcome} />
        <span className="text-sm text-ink-muted" aria-live="polite" data-testid="live-status">
          {live.status === "queued"
            ? "waiting for a free worker…"
            : live.status === "running"
              ? iteration !== null
                ? `iteration ${iteration}`
                : "starting…"
              : "finished; loading the result…"}
        </span>
        {canCancel && !done && !confirming && (
          <button type="button" className="btn btn-danger ml-auto px-3 py-1" onClick={() => setConfirming(true)} data-testid="cancel-job">
            Stop this run…
          </button>
        )}
      </div>
      {canCancel && !done && confirming && (
        <cancel.Form method="post" className="rounded-md border border-bad/30 bg-bad-wash px-4 py-3 text-sm" data-testid="cancel-confirm">
          <input type="hidden" name="intent" value="cancel" />
          <p className="font-semibold text-bad">Stop this run?</p>
          <p className="mt-1 text-ink-soft">
            {live.status === "running"
              ? "The solver stops after its current iteration. The best design found so far is kept on this page, marked as not converged; it cannot be approved, but you can queue a new run from it."
              : "The run has not started; stopping it removes it from the queue."}
          </p>
          <div className="mt-3 flex flex-wrap gap-2">
            <button type="submit" className="btn btn-danger px-3 py-1" disabled={cancel.state !== "idle"} data-testid="cancel-confirm-yes">
              {cancel.state !== "idle" ? "Stopping…" : "Stop the run"}
            </button>
            <button type="button" className="btn btn-secondary px-3 py-1" onClick={() => setConfirming(false)}>
              Keep it running
            </button>
          </div>
        </cancel.Form>
      )}
      {cancel.data?.error && <ErrorNote title="Could not stop the run">{cancel.data.error}</ErrorNote>}
      <div>
        <ProgressBar value={live.status === "running" && closeness !== null ? Math.round(closeness * 100) : null} max={100} label="Closeness to the optimum" />
        <p className="mt-1 text-xs text-ink-muted">
          {closeness !== null
            ? `Closeness to the optimum: the optimality residual has fallen ${Math.round(closeness * 100)} % of the way (log scale) from its first value to the tolerance ${formatResidual(tolerance)}.`
            : "The bar fills as the optimality residual falls toward the tolerance."}
        </p>
      </div>
      <dl className="grid grid-cols-2 gap-4 sm:grid-cols-4">
        <div>
          <dt className="text-xs font-semibold text-ink-muted">iteration</dt>
          <dd className="num text-left text-lg">{iteration ?? "–"}</dd>
        </div>
        <div>
          <dt className="text-xs font-semibold text-ink-muted">{objectiveLabel}</dt>
          <dd className="num text-left text-lg">{formatNumber(p?.objective)}</dd>
        </div>
        <div>
          <dt className="text-xs font-semibold text-ink-muted">largest violation (share of its limit)</dt>
          <dd className="num text-left text-lg">{formatResidual(p?.maxViolation)}</dd>
        </div>
        <div>
          <dt className="text-xs font-semibold text-ink-muted">optimality residual (KKT)</dt>
          <dd className="num text-left text-lg">{formatResidual(p?.kktResidual)}</dd>
        </div>
      </dl>
      {live.status === "running" && <ConvergencePlot history={points} objectiveLabel={objectiveLabel} live />}
    </section>
  );
}


function withLatest(points: ConvergencePoint[], p: LiveJob["progress"]): ConvergencePoint[] {
  if (!p || p.iteration === null || p.iteration === undefined) return points;
  const last = points[points.length - 1];
  if (last && last.iteration >= p.iteration) return points;
  return [...points, { iteration: p.iteration, objective: num(p.objective), maxViolation: num(p.maxViolation), kktResidual: num(p.kktResidual) }];
}

/** Share of the decades between the first optimality residual and the tolerance already fallen (0..1). */
export function convergenceShare(points: ConvergencePoint[], tolerance: number): number | null {
  const kkt = points.map((h) => h.kktResidual).filter((v): v is number => v !== null && v > 0);
  if (kkt.length < 2 || !(tolerance > 0)) return null;
  const first = Math.log10(kkt[0]!);
  const goal = Math.log10(tolerance);
  if (first <= goal) return 1;
  const now = Math.log10(minOf(kkt));
  return Math.min(1, Math.max(0, (first - now) / (first - goal)));
}
