// One load case or combination chosen for the whole result: the member, node and reaction
// tables and the 3D view all show it. The page mounts the provider and the picker once; a
// table outside a provider keeps a choice of its own.
import { createContext, useContext, useMemo, useState, type ReactNode } from "react";
import type { TrussResult } from "~/engine/design/result-types";
import { caseLabel, defaultCaseId, factorsText, resultCases, type ResultCase } from "~/lib/results/cases";

export interface ResultCaseState {
  cases: ResultCase[];
  current: string;
  setCurrent: (id: string) => void;
  shared: boolean; // true inside a page-wide provider
}

const Ctx = createContext<ResultCaseState | null>(null);

function useOwnCase(result: Pick<TrussResult, "loadCases" | "combinations" | "members" | "nodes">, shared: boolean): ResultCaseState {
  const cases = useMemo(() => resultCases(result), [result]);
  const [current, setCurrent] = useState<string | null>(null);
  // until someone picks, (and whenever the pick is not in this result) the default case
  return { cases, current: current !== null && cases.some((c) => c.id === current) ? current : defaultCaseId(cases), setCurrent, shared };
}

/**
 * Without a result (still loading, or none) the children see no shared choice. The provider
 * element stays the same either way, so the page below it keeps its state when the result arrives.
 */
export function ResultCaseProvider({ result, children }: { result: TrussResult | null; children?: ReactNode }) {
  const state = useOwnCase(result ?? EMPTY, true);
  return <Ctx.Provider value={result ? state : null}>{children}</Ctx.Provider>;
}

const EMPTY: Pick<TrussResult, "loadCases" | "combinations" | "members" | "nodes"> = { loadCases: [], combinations: [], members: [], nodes: [] };

/** The page-wide choice, or null outside a provider. */
export function useSharedCase(): ResultCaseState | null {
  return useContext(Ctx);
}

/** The page's choice when there is a provider, else a choice local to the caller. */
export function useResultCase(result: Pick<TrussResult, "loadCases" | "combinations" | "members" | "nodes">): ResultCaseState {
  const shared = useContext(Ctx);
  const own = useOwnCase(result, false);
  return shared ?? own;
}

export function CaseSelect({ state, label = "Load case or combination" }: { state: ResultCaseState; label?: string }) {
  const loadCases = state.cases.filter((c) => c.kind === "load case");
  const combos = state.cases.filter((c) => c.kind === "combination");
  if (state.cases.length <= 1) return null;
  const option = (c: ResultCase) => (
    <option key={c.id} value={c.id}>
      {caseLabel(c)}
    </option>
  );
  return (
    // min-w-0 down the chain: on a phone a long case name shrinks the select, not the page
    <label className="flex min-w-0 max-w-full items-center gap-2 text-sm">
      <span className="whitespace-nowrap text-ink-muted">{label}</span>
      <select className="field-input w-auto min-w-0 max-w-full py-1" value={state.current} onChange={(e) => state.setCurrent(e.target.value)} data-testid="result-case">
        {combos.length ? (
          <>
            <optgroup label="Load cases">{loadCases.map(option)}</optgroup>
            <optgroup label="Combinations">{combos.map(option)}</optgroup>
          </>
        ) : (
          loadCases.map(option)
        )}
      </select>
    </label>
  );
}

/** The page-wide picker, with what the chosen case is made of. */
export function ResultCasePicker() {
  const state = useContext(Ctx);
  if (!state || state.cases.length <= 1) return null;
  const c = state.cases.find((x) => x.id === state.current);
  return (
    <section className="card flex flex-wrap items-center gap-x-4 gap-y-2" aria-label="Load case or combination shown" data-testid="case-picker">
      <CaseSelect state={state} label="Show results for" />
      {c?.kind === "combination" && (
        <p className="text-sm text-ink-muted">
          {factorsText(c.factors)} · {c.use === "strength" ? "carries the stress and buckling limits" : "carries the displacement limits"}
        </p>
      )}
      {c?.kind === "load case" && c.selfWeight ? <p className="text-sm text-ink-muted">includes the truss's own weight × {c.selfWeight}</p> : null}
    </section>
  );
}
