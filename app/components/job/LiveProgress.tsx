// A queued or running job, live: status and figures from /api/jobs/:id every second, the
// convergence history from /api/jobs/:id/progress every two, both by fetch (no reloads).
// When the job ends the page's loader runs again and the result replaces this panel.
import { useEffect, useRef } from "react";
import { useFetcher, useRevalidator } from "react-router";
import { ConvergencePlot, type ConvergencePoint } from "~/components/charts/ConvergencePlot";
import { formatNumber, formatResidual } from "~/lib/format";
import { ProgressBar } from "~/components/ui/ProgressBar";
import { JobStateBadge } from "~/components/ui/StatusBadge";
import { ErrorNote } from "~/components/ui/States";
import type { LiveJob } from "./types";

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
  maxIterations,
  canCancel,
  objectiveLabel,
  onStatus,
}: {
  onStatus?: (status: string) => void;
  initial: LiveJob;
  initialHistory: ConvergencePoint[];
  maxIterations: number | null;
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

  const points = history.data !== undefined ? normalizeHistory(history.data) : initialHistory;
  const p = live.progress;
  const iteration = p?.iteration ?? null;

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
                ? `iteration ${iteration}${maxIterations ? ` of at most ${maxIterations}` : ""}`
                : "starting…"
              : `${live.status}; loading the result…`}
        </span>
        {canCancel && !done && (
          <cancel.Form method="post" className="ml-auto">
            <input type="hidden" name="intent" value="cancel" />
            <button type="submit" className="btn btn-danger px-3 py-1" disabled={cancel.state !== "idle"}>
              {cancel.state !== "idle" ? "Cancelling…" : "Cancel job"}
            </button>
          </cancel.Form>
        )}
      </div>
      {cancel.data?.error && <ErrorNote title="Could not cancel">{cancel.data.error}</ErrorNote>}
      <ProgressBar value={live.status === "running" ? iteration : null} max={maxIterations} label="Solver iterations" />
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
          <dt className="text-xs font-semibold text-ink-muted">max violation</dt>
          <dd className="num text-left text-lg">{formatResidual(p?.maxViolation)}</dd>
        </div>
        <div>
          <dt className="text-xs font-semibold text-ink-muted">KKT residual</dt>
          <dd className="num text-left text-lg">{formatResidual(p?.kktResidual)}</dd>
        </div>
      </dl>
      {live.status === "running" && <ConvergencePlot history={points} objectiveLabel={objectiveLabel} live />}
    </section>
  );
}

