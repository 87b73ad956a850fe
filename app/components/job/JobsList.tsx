// A table of jobs: status with live progress, model, project, submitter, times, objective.
// Sorting runs over the rows on the page; while any row is queued or running the table asks
// /api/jobs for fresh figures every two seconds (a fetch, not a page reload) and merges them.
import { createColumnHelper } from "@tanstack/react-table";
import { useEffect, useMemo, useRef, useState, type ReactNode } from "react";
import { Link, useFetcher } from "react-router";
import { DataTable } from "~/components/tables/DataTable";
import { gapColumn } from "./gap-column";
import { formatDateTime, formatDuration, formatNumber } from "~/lib/format";
import { JobStateBadge, ReviewBadge } from "~/components/ui/StatusBadge";

export interface JobListRow {
  id: string;
  status: string;
  outcome: string | null;
  modelName: string;
  modelId?: string;
  projectCode: string;
  submitter: string | null;
  createdAt: string;
  startedAt?: string | null;
  finishedAt: string | null;
  objective: { kind: string; final: number } | null;
  /** objective / lower bound - 1 (result field lowerBound), when the run has one */
  gap?: number | null;
  progress: { iteration: number | null } | null;
  /** the review decision in force, null when none */
  review?: string | null;
  hasResult?: boolean;
  waitingFor?: string | null;
  /** the model's units, for the objective's unit */
  units?: { length: string; force: string; mass: string } | null;
}

interface ApiJob {
  id: string;
  status: string;
  outcome: string | null;
  finishedAt: string | null;
  startedAt?: string | null;
  progress: { iteration: number | null } | null;
  summary?: { objectiveKind: string; objectiveFinal: number; lowerBoundGap?: number } | null;
}

const LIVE = new Set(["queued", "running"]);

export function mergeLive(rows: JobListRow[], fresh: ApiJob[] | undefined): JobListRow[] {
  if (!fresh?.length) return rows;
  const byId = new Map(fresh.map((j) => [j.id, j]));
  return rows.map((r) => {
    const f = byId.get(r.id);
    if (!f) return r;
    return {
      ...r,
      status: f.status,
      outcome: f.outcome,
      finishedAt: f.finishedAt,
      startedAt: f.startedAt ?? r.startedAt,
      progress: f.progress,
      objective: f.summary ? { kind: f.summary.objectiveKind, final: f.summary.objectiveFinal } : r.objective,
      gap: f.summary ? (f.summary.lowerBoundGap ?? null) : r.gap,
    };
  });
}

export function JobsList({
  rows,
  pollUrl,
  showProject = true,
  showModel = true,
  empty,
  pageSize = 25,
  selectable = false,
}: {
  rows: JobListRow[];
  pollUrl?: string;
  showProject?: boolean;
  showModel?: boolean;
  empty?: ReactNode;
  pageSize?: number;
  /** a checkbox per finished run and "Compare selected" (the compare page) */
  selectable?: boolean;
}) {
  const [picked, setPicked] = useState<string[]>([]);
  const toggle = (id: string, on: boolean) => setPicked((p) => (on ? [...p.filter((x) => x !== id), id] : p.filter((x) => x !== id)));
  const fetcher = useFetcher<{ jobs?: ApiJob[] }>();
  const merged = useMemo(() => mergeLive(rows, fetcher.data?.jobs), [rows, fetcher.data]);
  const anyLive = merged.some((r) => LIVE.has(r.status));
  const url = pollUrl ?? (rows.length ? `/api/jobs?limit=${Math.min(200, rows.length + 10)}` : undefined);
  const ref = useRef(fetcher);
  ref.current = fetcher;
  useEffect(() => {
    if (!anyLive || !url) return;
    const t = setInterval(() => {
      if (ref.current.state === "idle") ref.current.load(url);
    }, 2000);
    return () => clearInterval(t);
  }, [anyLive, url]);

  const col = createColumnHelper<JobListRow>();
  const columns = useMemo(
    () => [
      ...(selectable
        ? [
            col.display({
              id: "pick",
              header: () => <span className="sr-only">select to compare</span>,
              cell: (c) => {
                const r = c.row.original;
                const comparable = r.hasResult ?? r.status === "succeeded";
                return (
                  <input
                    type="checkbox"
                    className="h-4 w-4 accent-[var(--color-brass)]"
                    aria-label={`Compare job ${r.id.slice(0, 8)} of ${r.modelName}`}
                    disabled={!comparable}
                    title={comparable ? undefined : "only runs with a result can be compared"}
                    checked={picked.includes(r.id)}
                    onChange={(e) => toggle(r.id, e.target.checked)}
                    data-testid="compare-pick"
                  />
                );
              },
            }),
          ]
        : []),
      col.accessor("id", {
        header: "job",
        cell: (c) => (
          <Link to={`/jobs/${c.getValue()}`} className="font-mono text-xs text-info hover:underline" data-testid="job-link">
            {c.getValue().slice(0, 8)}
          </Link>
        ),
      }),
      col.accessor("status", {
        header: "status",
        cell: (c) => {
          const r = c.row.original;
          return (
            <span className="flex max-w-[15rem] flex-wrap items-center gap-1.5 whitespace-normal" data-testid="job-status">
              <JobStateBadge status={r.status} outcome={r.outcome} hasResult={r.hasResult} waitingFor={r.waitingFor} />
              {r.status === "running" && r.progress?.iteration != null && <span className="font-mono text-2xs text-ink-muted">it. {r.progress.iteration}</span>}
            </span>
          );
        },
      }),
      col.accessor((r) => r.review ?? "", {
        id: "review",
        header: "review",
        cell: (c) => {
          const r = c.row.original;
          if (r.review) return <ReviewBadge decision={r.review} />;
          if (r.status === "succeeded" && r.outcome !== "infeasible" && r.outcome !== "failed") return <span className="text-xs text-ink-muted" data-review="waiting">waiting for review</span>;
          return <span className="text-xs text-ink-muted" data-review="none">nothing to review</span>;
        },
      }),
      ...(showModel ? [col.accessor("modelName", { header: "model", cell: (c) => <span className="block max-w-[13rem] truncate" title={c.getValue()}>{c.getValue()}</span> })] : []),
      ...(showProject ? [col.accessor("projectCode", { header: "project" })] : []),
      // who and when share a column, so the figures at the end stay in view at desktop widths
      col.accessor("createdAt", {
        header: "queued",
        cell: (c) => (
          <span className="block leading-tight">
            <span className="whitespace-nowrap">{formatDateTime(c.getValue())}</span>
            {c.row.original.submitter && <span className="block max-w-[11rem] truncate text-xs text-ink-muted">by {c.row.original.submitter}</span>}
          </span>
        ),
        meta: { className: "hidden sm:table-cell" },
      }),
      col.accessor((r) => (r.startedAt && r.finishedAt ? Date.parse(r.finishedAt) - Date.parse(r.startedAt) : null), {
        id: "duration",
        header: "ran",
        cell: (c) => formatDuration(c.getValue()),
        meta: { numeric: true, className: "hidden md:table-cell" },
        sortUndefined: "last",
      }),
      col.accessor((r) => r.objective?.final ?? null, {
        id: "objective",
        header: "result",
        meta: { numeric: true },
        cell: (c) => {
          const o = c.row.original.objective;
          const u = c.row.original.units;
          const unit = u ? (o?.kind === "compliance" ? `${u.force}·${u.length}` : u.mass) : "";
          return o ? (
            <span className="whitespace-nowrap">
              {formatNumber(o.final)} <span className="text-xs text-ink-muted">{unit ? `${unit} ` : ""}{o.kind === "compliance" ? "compliance" : "mass"}</span>
            </span>
          ) : (
            "–"
          );
        },
      }),
      gapColumn(col),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [showModel, showProject, selectable, picked],
  );
  const pickedModels = new Set(merged.filter((r) => picked.includes(r.id)).map((r) => r.modelId ?? r.modelName));
  const toolbar = selectable ? (
    <span className="flex flex-wrap items-center gap-2 text-sm" data-testid="compare-bar">
      <span className="text-ink-muted" aria-live="polite">
        {picked.length === 0
          ? "Tick two or more runs of one model to compare them."
          : pickedModels.size > 1
            ? `${picked.length} runs of ${pickedModels.size} different models selected: pick runs of one model.`
            : `${picked.length} selected${picked.length < 2 ? ": pick one more" : ""}.`}
      </span>
      {picked.length >= 2 && pickedModels.size === 1 ? (
        <Link to={`/compare?jobs=${picked.join(",")}`} className="btn btn-primary px-3 py-1" data-testid="compare-selected">
          Compare selected
        </Link>
      ) : (
        <button type="button" className="btn btn-secondary px-3 py-1" disabled data-testid="compare-selected">
          Compare selected
        </button>
      )}
      {picked.length > 0 && (
        <button type="button" className="btn btn-secondary px-3 py-1" onClick={() => setPicked([])}>
          Clear selection
        </button>
      )}
    </span>
  ) : undefined;
  return <DataTable label="Jobs" data={merged} columns={columns} pageSize={pageSize} empty={empty} getRowId={(r) => r.id} rowTestId="job-row" toolbar={toolbar} />;
}
