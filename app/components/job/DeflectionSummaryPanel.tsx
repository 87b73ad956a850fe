// The deflection summary (result.deflections): per load case and combination, the worst
// displacement against its deflection limit, with the node and the direction.
import type { TrussResult } from "~/engine/design/result-types";
import { formatPercent, quantityFormatter, type QuantityFormatter } from "~/lib/format";
import { caseWords } from "~/lib/results/cases";
import { isOverLimit } from "~/lib/utilization-scale";

type Head = Pick<TrussResult, "deflections" | "units" | "loadCases" | "combinations">;

export function DeflectionSummaryPanel({ result, q }: { result: Head; q?: QuantityFormatter }) {
  const rows = result.deflections;
  if (!rows || rows.length === 0) return null;
  const fmt = q ?? quantityFormatter(result.units);
  const len = fmt.unit("length");
  const limited = rows.some((d) => d.governing);
  return (
    <section className="card min-w-0" aria-label="Deflections" data-testid="deflections">
      <h2 className="mb-1 font-semibold">Deflections</h2>
      <p className="mb-3 text-sm text-ink-muted">
        {limited
          ? "Per load case and combination, the displacement closest to its deflection limit, and the largest displacement of any free node."
          : "Per load case and combination, the largest displacement of any free node; the model sets no deflection limit."}
      </p>
      <div className="overflow-x-auto rounded-md border border-rule">
        <table className="data-table" aria-label="Deflection summary">
          <thead>
            <tr>
              <th>load case or combination</th>
              {limited && (
                <>
                  <th>closest to its limit at</th>
                  <th className="whitespace-nowrap text-right">displacement ({len})</th>
                  <th className="whitespace-nowrap text-right">limit ({len})</th>
                  <th className="whitespace-nowrap text-right">share of the limit (%)</th>
                </>
              )}
              <th>largest at</th>
              <th className="whitespace-nowrap text-right">displacement ({len})</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((d) => {
              const g = d.governing;
              const over = g ? isOverLimit(g.ratio) : false;
              return (
                <tr key={d.case} data-testid="deflection-row">
                  {/* on a phone the table scrolls in its box rather than squeezing a case name into five lines */}
                  <td className="min-w-[11rem]">{caseWords(d.case, result)}</td>
                  {limited && (
                    <>
                      <td className="whitespace-nowrap">{g ? `node ${g.node}, ${g.axis}` : d.checked ? "–" : "not checked (strength)"}</td>
                      <td className="num">{g ? fmt.number(g.value, "length") : "–"}</td>
                      <td className="num">{g ? fmt.number(g.limit, "length") : "–"}</td>
                      <td className={`num whitespace-nowrap ${over ? "font-semibold text-bad" : ""}`}>{g ? `${formatPercent(g.ratio)}${over ? " — over" : ""}` : "–"}</td>
                    </>
                  )}
                  <td className="whitespace-nowrap">{`node ${d.largest.node}, ${d.largest.axis}`}</td>
                  <td className="num">{fmt.number(d.largest.value, "length")}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </section>
  );
}
