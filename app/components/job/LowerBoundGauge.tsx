// How close the design is to the best possible: the gap between the result's objective and the
// proven lower bound (result field lowerBound) on a gauge, one line in words, and what the bound
// assumes on request. A result without a bound says why.
import type { TrussResult } from "~/engine/design/result-types";
import { gapLabel, gapMagnitude, gapSentence, GAUGE_TICKS, gaugePosition } from "~/lib/lower-bound-words";
import { formatPercent } from "~/lib/format";

type WithBound = Pick<TrussResult, "lowerBound" | "lowerBoundWithheld" | "objective" | "units" | "verification" | "status">;

export function LowerBoundGauge({ result }: { result: WithBound }) {
  const lb = result.lowerBound;
  const kind = result.objective.kind;
  const title = kind === "mass" ? "How close to the least possible mass" : "How close to the least possible compliance";
  if (!lb) {
    if (!result.lowerBoundWithheld) return null; // results made before the bound existed
    return (
      <section className="card" aria-label="Lower bound" data-testid="lower-bound">
        <h2 className="mb-1 font-semibold">{title}</h2>
        <p className="text-sm text-ink-muted" data-testid="lower-bound-withheld">
          No bound for this run. {result.lowerBoundWithheld}
        </p>
      </section>
    );
  }
  const unit = kind === "mass" ? result.units.mass : `${result.units.force}·${result.units.length}`;
  const limitsMet = result.verification?.allLimitsMet ?? result.status === "optimal";
  const pos = gaugePosition(lb.gap);
  // a bound that leaves out governing limits (buckling, displacement) is looser: its gap is no warning
  const tone = !limitsMet ? "bg-ink-muted" : lb.gap < 0.02 ? "bg-ok" : lb.leftOut?.length ? "bg-info" : lb.gap < 0.15 ? "bg-brass" : "bg-warn";
  return (
    <section className="card" aria-label="Lower bound" data-testid="lower-bound">
      <div className="flex flex-wrap items-baseline justify-between gap-x-4">
        <h2 className="font-semibold">{title}</h2>
        <span className="font-mono text-lg" data-testid="lower-bound-gap">
          {gapMagnitude(lb.gap)} <span className="text-xs text-ink-muted">{gapLabel(lb)}</span>
        </span>
      </div>
      <p className="mt-1 text-sm" data-testid="lower-bound-sentence">
        {gapSentence(lb, kind, unit, limitsMet)}
      </p>
      <div className="mt-3" aria-hidden="true">
        <div className="relative h-3 rounded-full bg-paper-sunk">
          <div className={`absolute inset-y-0 left-0 rounded-full ${tone}`} style={{ width: `${Math.max(2, pos * 100)}%` }} />
        </div>
        <div className="relative mt-1 h-4 font-mono text-2xs text-ink-muted">
          {GAUGE_TICKS.map((t) => (
            <span key={t} className="absolute -translate-x-1/2 whitespace-nowrap first:translate-x-0 last:-translate-x-full" style={{ left: `${gaugePosition(t) * 100}%` }}>
              {t === GAUGE_TICKS[0] ? `≤ ${formatPercent(t)}` : formatPercent(t, 0)}
            </span>
          ))}
        </div>
      </div>
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer text-info">What the bound assumes{lb.geometry === "final" ? " (taken at the final geometry)" : ""}</summary>
        <p className="mt-1 text-ink-soft" data-testid="lower-bound-basis">
          {lb.basis}
        </p>
      </details>
    </section>
  );
}
