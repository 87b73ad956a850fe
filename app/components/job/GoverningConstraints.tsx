// The limits that shape the design, with their shadow prices: how much objective each one
// costs per unit it is relaxed (the Lagrange multipliers of the active constraints).
import type { TrussResult } from "~/engine/design/result-types";
import { formatResidual } from "~/lib/format";
import { EmptyState } from "~/components/ui/States";
import { constraintWords } from "~/engine/design/constraint-words";
import { shadowPriceUnit } from "~/lib/results/criterion-words";

type WithLimits = Pick<TrussResult, "shadowPrices" | "activeConstraints" | "objective"> & Partial<Pick<TrussResult, "units">> & Partial<Pick<TrussResult, "loadCases" | "combinations" | "members">>;

/** `total`: how many active limits the whole result has, when `result` carries only the first ones. */
export function GoverningConstraints({ result, limit = 12, total }: { result: WithLimits; limit?: number; total?: number }) {
  const rows =
    result.shadowPrices && result.shadowPrices.length
      ? result.shadowPrices.map((p) => ({
          id: p.constraint,
          multiplier: p.multiplier,
          unit: result.units ? shadowPriceUnit(p.constraint, { objective: result.objective, units: result.units }) : p.unit,
          sentence: p.sentence || `Relaxing the ${constraintWords(p.constraint, result)} by one unit would change the ${result.objective.kind} by about ${formatResidual(p.multiplier)} ${p.unit}.`,
        }))
      : result.activeConstraints.map((a) => ({
          id: a.id,
          multiplier: a.multiplier,
          unit: result.units ? shadowPriceUnit(a.id, { objective: result.objective, units: result.units }) : "",
          sentence: `Relaxing the ${constraintWords(a.id, result)} by one unit would change the ${result.objective.kind} by about ${formatResidual(a.multiplier)}${result.units ? ` ${shadowPriceUnit(a.id, { objective: result.objective, units: result.units })}` : ""}.`,
        }));
  // shadow prices come ranked by the engine on a unit-free scale; raw multipliers of different
  // units cannot be compared, so only the fallback list is ordered here
  if (!result.shadowPrices?.length) rows.sort((a, b) => Math.abs(b.multiplier) - Math.abs(a.multiplier));
  if (rows.length === 0)
    return <EmptyState title="No limit is active">At this design no limit is binding; the area bounds or the objective alone decide the sizes.</EmptyState>;
  const shown = rows.slice(0, limit);
  return (
    <div data-testid="governing">
      <ol className="space-y-2">
        {shown.map((r) => (
          <li key={r.id} className="rounded-md border border-rule px-3 py-2">
            <div className="flex flex-wrap items-baseline justify-between gap-x-4">
              <span className="min-w-0 text-xs text-ink-muted" title={`check id: ${r.id}`}>
                {constraintWords(r.id, result)}
              </span>
              <span className="num text-sm text-ink" title="shadow price (Lagrange multiplier)">
                {formatResidual(r.multiplier)} {r.unit}
              </span>
            </div>
            <p className="mt-1 text-sm text-ink-soft">{r.sentence}</p>
          </li>
        ))}
      </ol>
      {rows.length > shown.length && (
        <details className="mt-2 text-sm">
          <summary className="cursor-pointer text-ink-muted">{rows.length - shown.length} more active limits</summary>
          <ul className="mt-2 space-y-1">
            {rows.slice(limit).map((r) => (
              <li key={r.id} className="flex gap-3">
                <span className="text-xs text-ink-muted" title={`check id: ${r.id}`}>{constraintWords(r.id, result)}</span>
                <span className="num">{formatResidual(r.multiplier)} {r.unit}</span>
              </li>
            ))}
          </ul>
        </details>
      )}
      {total !== undefined && total > rows.length && (
        <p className="mt-2 text-xs text-ink-muted">
          The {rows.length} largest of {total} active limits are listed; the result JSON holds them all.
        </p>
      )}
    </div>
  );
}
