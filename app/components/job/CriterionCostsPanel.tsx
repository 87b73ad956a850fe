// "What each design criterion costs" (result.criterionCosts): the three costliest criteria as
// sentences, every criterion in a table with the members and nodes where it binds. Results
// stored before the criterion costs existed keep the per-limit shadow prices.
import type { TrussResult } from "~/engine/design/result-types";
import type { QuantityFormatter } from "~/lib/format";
import { bindingCriteria, criterionName, criterionSentence, criterionValue, idleCriteria, idleCriteriaSentence, placesWords, savingText, shareText } from "~/lib/results/criterion-words";
import { EmptyState } from "~/components/ui/States";
import { GoverningConstraints } from "./GoverningConstraints";

type Head = Pick<TrussResult, "criterionCosts" | "criterionCostsOf" | "objective" | "units" | "loadCases" | "combinations" | "status" | "shadowPrices" | "activeConstraints">;

const TOP = 3;

export function CriterionCostsPanel({ result, activeCount, q }: { result: Head; activeCount?: number; q?: QuantityFormatter }) {
  const costs = result.criterionCosts;
  return (
    <section className="card min-w-0" aria-label="What each design criterion costs" data-testid="criterion-costs">
      <h2 className="mb-1 font-semibold">What each design criterion costs</h2>
      {costs === undefined ? (
        <>
          <p className="mb-3 text-sm text-ink-muted">This result was stored before criterion costs were worked out; the limits that bind, with the change of the {result.objective.kind} per unit each is relaxed:</p>
          <GoverningConstraints result={result} total={activeCount} />
        </>
      ) : (
        <CriterionCostsBody result={result} q={q} />
      )}
    </section>
  );
}

function CriterionCostsBody({ result, q }: { result: Head; q?: QuantityFormatter }) {
  const costs = result.criterionCosts ?? [];
  const binding = bindingCriteria(costs);
  if (result.status !== "optimal" && !result.criterionCostsOf) {
    return (
      <EmptyState title="Only a design proved optimal is priced">
        What relaxing a criterion would save is read from the optimizer's multipliers at a proved optimum; this run ended without one, so nothing is priced.
      </EmptyState>
    );
  }
  if (binding.length === 0) {
    return <EmptyState title="No criterion binds">At this design no stress, deflection, volume, buckling or size limit is binding; relaxing one would save nothing.</EmptyState>;
  }
  const top = binding.slice(0, TOP);
  // the binding criteria beyond the top three get a row each; those that do not bind, one line
  const rest = binding.slice(TOP);
  const idle = idleCriteria(costs);
  return (
    <>
      <p className="mb-3 text-sm text-ink-muted">
        What relaxing each criterion by 1 % would save, to first order (the optimizer's multipliers summed by criterion; a re-run gives the exact figure
        {result.criterionCostsOf ? ". For this catalogue design, the figures are those of the continuous optimum it was sized from" : ""}).
      </p>
      <ol className="mb-4 list-decimal space-y-2 pl-5 text-sm text-ink-soft" data-testid="criterion-sentences">
        {top.map((c) => (
          <li key={c.id}>{criterionSentence(c, result, q)}</li>
        ))}
      </ol>
      {rest.length > 0 && (
      <div className="overflow-x-auto rounded-md border border-rule">
        <table className="data-table" aria-label="Criterion costs">
          <thead>
            <tr>
              <th>other criteria that bind</th>
              <th className="text-right">now</th>
              <th>binds at</th>
              <th className="whitespace-nowrap text-right">saving of 1 % relaxed</th>
              <th className="whitespace-nowrap text-right">share of the {result.objective.kind}</th>
            </tr>
          </thead>
          <tbody>
            {rest.map((c) => (
              <tr key={c.id} data-testid="criterion-row">
                <td>{criterionName(c).replace(/^the /, "")}</td>
                <td className="num whitespace-nowrap">{criterionValue(c, result, q)}</td>
                <td className="min-w-[14rem] text-ink-soft">{placesWords(c, result, 4)}</td>
                <td className="num whitespace-nowrap">{savingText(c, result, q)}</td>
                <td className="num whitespace-nowrap">{shareText(c.share)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      )}
      {idle.length > 0 && (
        <p className="mt-3 text-sm text-ink-muted" data-testid="criteria-idle">
          {idleCriteriaSentence(idle, result)}
        </p>
      )}
    </>
  );
}
