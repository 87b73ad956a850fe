// The deflection summary of a result: per load case and combination, the largest displacement
// component over the free nodes and, where the deflection limits apply (service combinations,
// else every load case), the limited coordinate closest to its limit. Read from the fresh
// analysis of the final design, so an analysis-only run gets the same summary.
import type { Structure } from "../truss";
import type { DeflectionSummary } from "./result-types";
import { responsesFor, type DesignProblem } from "./problem";

const AXES = ["x", "y", "z"] as const;

export type DeflectionLimits = ReadonlyMap<number, { limit: number; spec: number }>;

/** The limit of each checked coordinate of a design problem (displacement limits of problem.ts). */
export function problemDeflectionLimits(p: DesignProblem): DeflectionLimits {
  const out = new Map<number, { limit: number; spec: number }>();
  for (const l of p.limits) if (l.kind === "displacement") out.set(l.dof, { limit: l.limit, spec: l.spec ?? 0 });
  return out;
}

/**
 * displacements: per response (load cases, then combinations, as s.responseIds), nNodes*3;
 * limits: dof -> its deflection limit (displacementLimitMap of problem.ts).
 */
export function deflectionSummary(s: Structure, dimension: 2 | 3, displacements: readonly ArrayLike<number>[], limits: DeflectionLimits): DeflectionSummary[] {
  const checked = new Set(responsesFor(s, "service"));
  const axisCount = dimension === 2 ? 2 : 3;
  return s.responseIds.map((id, l) => {
    const u = displacements[l];
    let largest = { node: s.nodeIds[0], axis: AXES[0] as (typeof AXES)[number], value: 0 };
    let governing: DeflectionSummary["governing"];
    for (let n = 0; n < s.nodeIds.length; n++) {
      for (let a = 0; a < axisCount; a++) {
        const dof = 3 * n + a;
        if (s.fixed[dof]) continue;
        const value = u[dof];
        if (Math.abs(value) > Math.abs(largest.value)) largest = { node: s.nodeIds[n], axis: AXES[a], value };
        const lim = checked.has(l) ? limits.get(dof) : undefined;
        if (!lim) continue;
        const ratio = Math.abs(value) / lim.limit;
        if (!governing || ratio > governing.ratio) governing = { node: s.nodeIds[n], axis: AXES[a], value, limit: lim.limit, ratio, spec: lim.spec };
      }
    }
    return { case: id, checked: checked.has(l) && limits.size > 0, largest, ...(governing ? { governing } : {}) };
  });
}
