// Support reactions of the chosen load case or combination: one row per supported node, then
// the balance check as figures (the sum of the reactions against the applied loads and own
// weight, and what is left over), and a CSV of every case.
import type { TrussResult } from "~/engine/design/result-types";
import { downloadText, fileSlug, toCsv } from "~/components/tables/csv";
import { formatNumber, formatResidual, noiseFloor } from "~/lib/format";
import { reactionsCsv } from "~/lib/results/result-csv";
import { useResultCase } from "./ResultCase";

const AXES = ["x", "y", "z"] as const;

/** Relative leftover of a balance, for the sentence under the table. */
function balanceWords(residual: number): string {
  if (!Number.isFinite(residual)) return "could not be checked";
  if (residual < 1e-9) return "balance to rounding";
  if (residual < 1e-6) return "balance";
  return "do NOT balance: check the supports and the model";
}

export function ReactionsPanel({ result, fileName }: { result: TrussResult; fileName: string }) {
  const state = useResultCase(result);
  const reactions = result.reactions ?? [];
  if (reactions.length === 0) return null;
  const lc = state.current;
  const f = result.units.force;
  const dims = result.nodes.some((n) => Object.values(n.displacement).some((d) => d[2] !== 0)) || reactions.some((r) => Object.values(r.values).some((v) => v[2] !== 0)) ? 3 : 2;
  const axes = AXES.slice(0, dims);
  const balance = result.reactionBalance?.find((b) => b.id === lc);
  // components a billion times smaller than the largest reaction are rounding noise: print 0
  const zeroBelow = noiseFloor(reactions.flatMap((r) => r.values[lc] ?? []));
  const fmt = (v: number | undefined) => formatNumber(v, { zeroBelow });
  const csv = () => {
    const t = reactionsCsv(result);
    downloadText(`${fileSlug(fileName)}-reactions.csv`, toCsv(t.header, t.rows));
  };
  return (
    <section className="card min-w-0" aria-label="Support reactions" data-testid="reactions">
      <div className="mb-3 flex flex-wrap items-center gap-3">
        <h2 className="mr-auto font-semibold">Support reactions{state.cases.length > 1 ? `, ${lc}` : ""}</h2>
        <button type="button" className="btn btn-secondary px-3 py-1" onClick={csv} data-testid="reactions-csv">
          Reactions CSV
        </button>
      </div>
      <p className="mb-3 text-sm text-ink-muted">Forces the supports exert on the truss, in {f}, along the global axes; 0 on an axis the node is free to move along.</p>
      <div className="overflow-x-auto rounded-md border border-rule">
        <table className="data-table" aria-label="Reactions">
          <thead>
            <tr>
              <th>node</th>
              {axes.map((a) => (
                <th key={a} className="whitespace-nowrap text-right">
                  R{a} ({f})
                </th>
              ))}
              <th className="whitespace-nowrap text-right">|R| ({f})</th>
            </tr>
          </thead>
          <tbody>
            {reactions.map((r) => {
              const v = r.values[lc] ?? [0, 0, 0];
              return (
                <tr key={r.node} data-testid="reaction-row">
                  <td>{r.node}</td>
                  {axes.map((_, k) => (
                    <td key={k} className="num">
                      {fmt(v[k])}
                    </td>
                  ))}
                  <td className="num">{fmt(Math.hypot(...v))}</td>
                </tr>
              );
            })}
          </tbody>
          {balance && (
            <tfoot className="border-t-2 border-rule">
              <tr data-testid="balance-reactions">
                <th scope="row" className="text-left font-medium">
                  sum of reactions
                </th>
                {axes.map((_, k) => (
                  <td key={k} className="num">
                    {fmt(balance.reactions[k])}
                  </td>
                ))}
                <td />
              </tr>
              <tr data-testid="balance-applied">
                <th scope="row" className="text-left font-medium">
                  applied loads + own weight
                </th>
                {axes.map((_, k) => (
                  <td key={k} className="num">
                    {fmt(balance.applied[k])}
                  </td>
                ))}
                <td />
              </tr>
              <tr>
                <th scope="row" className="text-left font-medium">
                  left over (sum of both)
                </th>
                {axes.map((_, k) => (
                  <td key={k} className="num">
                    {formatResidual(balance.reactions[k]! + balance.applied[k]!)}
                  </td>
                ))}
                <td />
              </tr>
            </tfoot>
          )}
        </table>
      </div>
      {balance && (
        <p className="mt-3 text-sm" data-testid="balance-check">
          Equilibrium check: the reactions and the applied loads with own weight {balanceWords(balance.residual)} — what is left over is{" "}
          <strong>{formatResidual(balance.residual)}</strong> of the largest applied component.
        </p>
      )}
    </section>
  );
}
