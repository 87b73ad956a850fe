// The figures of two or more runs side by side, one column per run (A, B, …), one row per
// figure; each group's area below, with its change against run A. Wide comparisons scroll
// inside their box; the row names stay in view.
import type { ReactNode } from "react";
import { Link } from "react-router";
import type { ComparedRun, Comparison } from "~/lib/jobs/compare.server";
import { formatDateTime, formatNumber, formatPercent, withUnit } from "~/lib/format";
import { formatGap } from "~/lib/lower-bound-words";
import { JobStateBadge, ReviewBadge } from "~/components/ui/StatusBadge";
import type { QuantityFormatter } from "~/lib/format";
import { OUTCOMES_WITHOUT_REVIEW } from "~/lib/review-request";

/** "+12.3 %" / "−4.0 %" / "0.0 %" of b against a; "–" when a is missing or zero. */
export function changeAgainst(a: number | null | undefined, b: number | null | undefined): string {
  if (a === null || a === undefined || b === null || b === undefined || !Number.isFinite(a) || !Number.isFinite(b) || a === 0) return "–";
  const text = formatPercent(b / a - 1);
  return b / a - 1 > 5e-4 ? `+${text}` : text;
}

function Row({ label, runs, cell, testId }: { label: ReactNode; runs: ComparedRun[]; cell: (r: ComparedRun, i: number) => ReactNode; testId?: string }) {
  return (
    <tr data-testid={testId}>
      <th scope="row" className="sticky left-0 z-[1] min-w-[9rem] max-w-[14rem] bg-paper-sunk text-left align-top">
        {label}
      </th>
      {runs.map((r, i) => (
        <td key={r.id} className="align-top">
          {cell(r, i)}
        </td>
      ))}
    </tr>
  );
}

export function CompareTable({ comparison, q }: { comparison: Comparison; q: QuantityFormatter | null }) {
  const { runs, groups } = comparison;
  const base = runs[0]!;
  const massUnit = q?.unit("mass") ?? "";
  const areaUnit = q?.unit("area") ?? "";
  const num = (v: number | null | undefined, kind: "mass" | "area") => (q ? q.number(v, kind) : formatNumber(v));
  const objUnit = (r: ComparedRun) => (r.objective?.kind === "compliance" ? (q ? `${q.unit("force")}·${q.unit("length")}` : "") : massUnit);
  return (
    <div className="overflow-x-auto rounded-md border border-rule" data-testid="compare-table-box">
      <table className="data-table" aria-label="Runs side by side" data-testid="compare-table">
        <thead>
          <tr>
            <th scope="col" className="sticky left-0 z-[1]">
              figure (unit)
            </th>
            {runs.map((r) => (
              <th key={r.id} scope="col" className="min-w-[10rem]">
                <span className="block text-sm text-ink">run {r.letter}</span>
                <Link to={`/jobs/${r.id}`} className="font-mono text-2xs text-info hover:underline">
                  job {r.id.slice(0, 8)}
                </Link>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          <Row label="outcome" runs={runs} testId="compare-outcome" cell={(r) => <JobStateBadge status={r.state.status} outcome={r.state.outcome} hasResult={r.state.hasResult} />} />
          <Row
            label="review"
            runs={runs}
            cell={(r) => (r.state.status === "succeeded" && !OUTCOMES_WITHOUT_REVIEW.includes(r.state.outcome ?? "") ? <ReviewBadge decision={r.review} /> : <span className="text-xs text-ink-muted">nothing to review</span>)}
          />
          <Row label="model version" runs={runs} cell={(r) => (r.modelVersion === null ? "–" : `version ${r.modelVersion}`)} />
          <Row label="queued" runs={runs} cell={(r) => <span className="whitespace-nowrap">{formatDateTime(r.createdAt)}</span>} />
          <Row label={withUnit("mass", massUnit)} runs={runs} testId="compare-mass" cell={(r) => <span className="num">{num(r.mass, "mass")}</span>} />
          <Row label="mass against run A" runs={runs} cell={(r, i) => <span className="num">{i === 0 ? "—" : changeAgainst(base.mass, r.mass)}</span>} />
          {runs.some((r) => r.objective?.kind === "compliance") && (
            <Row label="objective" runs={runs} cell={(r) => (r.objective ? `${formatNumber(r.objective.final)} ${objUnit(r)} ${r.objective.kind}` : "–")} />
          )}
          <Row label="iterations" runs={runs} testId="compare-iterations" cell={(r) => <span className="num">{r.iterations === null ? "–" : r.iterations.toLocaleString("en-US")}</span>} />
          <Row label="max utilization (%)" runs={runs} cell={(r) => <span className="num">{formatPercent(r.maxUtilization)}</span>} />
          <Row label="limits (independent check)" runs={runs} cell={(r) => (r.allLimitsMet === null ? "–" : r.allLimitsMet ? "all met" : "some exceeded")} />
          <Row label={withUnit("least-mass bound", massUnit)} runs={runs} testId="compare-bound" cell={(r) => (r.lowerBound ? <span className="num" title={r.lowerBound.basis}>{num(r.lowerBound.value, "mass")}</span> : "–")} />
          <Row label="gap to the bound (%)" runs={runs} cell={(r) => <span className="num">{r.lowerBound ? formatGap(r.lowerBound.gap) : "–"}</span>} />
          <Row
            label="governing limits (count)"
            runs={runs}
            testId="compare-governing"
            cell={(r) =>
              r.governing.length === 0 ? (
                "none active"
              ) : (
                <ul className="space-y-0.5 whitespace-normal">
                  {r.governing.map((g) => (
                    <li key={g.kind}>
                      {g.kind} <span className="text-ink-muted">× {g.count}</span>
                    </li>
                  ))}
                </ul>
              )
            }
          />
          <tr>
            <th colSpan={runs.length + 1} scope="colgroup" className="bg-paper text-ink">
              {withUnit("area of each group", areaUnit)} — change against run A in brackets
            </th>
          </tr>
          {groups.map((g) => (
            <Row
              key={g.key}
              testId="compare-group"
              label={
                <span className="block truncate" title={g.key}>
                  {g.grouped ? g.key : `member ${g.key}`}
                  {g.grouped && <span className="ml-1 font-normal text-ink-muted">({g.members} members)</span>}
                </span>
              }
              runs={runs}
              cell={(r, i) => {
                const a = r.groupAreas[g.key];
                if (a === undefined) return <span className="text-ink-muted">not in this run</span>;
                return (
                  <span className="num whitespace-nowrap">
                    {num(a, "area")}
                    {i > 0 && <span className="ml-1 text-xs text-ink-muted">({changeAgainst(base.groupAreas[g.key], a)})</span>}
                  </span>
                );
              }}
            />
          ))}
        </tbody>
      </table>
    </div>
  );
}
