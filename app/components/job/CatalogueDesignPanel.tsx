// A catalogue design beside the continuous optimum it started from: the objective of each, the
// gap between them, the round-up-and-repair floor, and for each area variable the section it
// got and the limit that kept it from the next lighter section.
import type { TrussResult } from "~/engine/design/result-types";
import { formatNumber, formatPercent } from "~/lib/format";
import { steppedByWords } from "~/lib/results/catalogue-words";

export function CatalogueDesignPanel({ result }: { result: Pick<TrussResult, "catalogue" | "objective" | "units"> & Partial<Pick<TrussResult, "loadCases" | "combinations" | "members">> }) {
  const c = result.catalogue;
  if (!c) return null;
  const kind = result.objective.kind;
  const unit = kind === "mass" ? result.units.mass : `${result.units.force}·${result.units.length}`;
  const a = `${result.units.length}²`;
  const final = result.objective.final;
  const saved = c.roundedObjective > 0 ? 1 - final / c.roundedObjective : null;
  return (
    <section className="card min-w-0" aria-label="Catalogue design" data-testid="catalogue-design">
      <h2 className="mb-1 font-semibold">Catalogue design beside the continuous optimum</h2>
      <p className="mb-3 text-sm text-ink-muted">
        Every area variable takes one catalogue section; every limit was checked again by a full analysis of the catalogue design ({c.analyses} analyses in the
        search).
      </p>
      <div className="overflow-x-auto rounded-md border border-rule">
        <table className="data-table" aria-label="Catalogue and continuous designs">
          <thead>
            <tr>
              <th>design</th>
              <th className="whitespace-nowrap text-right">
                {kind} ({unit})
              </th>
              <th className="whitespace-nowrap text-right">above the continuous optimum</th>
            </tr>
          </thead>
          <tbody>
            <tr>
              <td>continuous optimum (any area){c.continuousStatus !== "optimal" ? ` — ${c.continuousStatus}` : ""}</td>
              <td className="num" data-testid="continuous-objective">
                {formatNumber(c.continuousObjective, { sig: 5 })}
              </td>
              <td className="num">–</td>
            </tr>
            <tr>
              <td>every variable rounded up to a section, then repaired</td>
              <td className="num">{formatNumber(c.roundedObjective, { sig: 5 })}</td>
              <td className="num">{formatPercent(c.roundedObjective / c.continuousObjective - 1)}</td>
            </tr>
            <tr className="font-medium">
              <td>catalogue design (this result)</td>
              <td className="num" data-testid="catalogue-objective">
                {formatNumber(final, { sig: 5 })}
              </td>
              <td className="num" data-testid="catalogue-gap">
                {formatPercent(c.gap)}
              </td>
            </tr>
          </tbody>
        </table>
      </div>
      {saved !== null && saved > 0 && <p className="mt-2 text-sm text-ink-muted">The search saved {formatPercent(saved)} against rounding up and repairing.</p>}

      <h3 className="mb-2 mt-5 text-sm font-semibold">Section of each variable, and what made it step up</h3>
      <div className="overflow-x-auto rounded-md border border-rule">
        <table className="data-table" aria-label="Catalogue sections by variable">
          <thead>
            <tr>
              <th>group or member</th>
              <th className="whitespace-nowrap text-right">members</th>
              <th className="whitespace-nowrap text-right">continuous area ({a})</th>
              <th>section</th>
              <th className="whitespace-nowrap text-right">section area ({a})</th>
              <th className="whitespace-nowrap text-right">step</th>
              <th>kept from the next lighter section by</th>
            </tr>
          </thead>
          <tbody>
            {c.choices.map((ch) => (
              <tr key={ch.id} data-testid="catalogue-choice">
                <td>{ch.id}</td>
                <td className="num">{ch.members}</td>
                <td className="num">{formatNumber(ch.continuousArea)}</td>
                <td className="font-mono text-xs">{ch.section}</td>
                <td className="num">{formatNumber(ch.area)}</td>
                <td className="num">{ch.continuousArea > 0 ? formatPercent(ch.area / ch.continuousArea - 1) : "–"}</td>
                <td>{steppedByWords(ch.steppedBy, result)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}
