// Shadow prices: the solver's multipliers converted back into model units.
//
// The solver minimizes F = f / f0 subject to ratio limits g = r / limit - 1 <= 0 (problem.ts).
// At the optimum dF*/d(limit) = -mu dg/d(limit) = -mu r / limit^2 = -mu (1 + g) / limit, so
// relaxing a limit by one model unit lowers the objective by about
//   price = f0 mu (1 + g) / limit        [objective units per limit unit].
// Buckling is a stress difference over a reference stress, g = (-sigma - sigma_E) / sigma_ref:
// price = f0 mu / sigma_ref per unit of Euler stress.
// Area and shape bounds in scaled variables z = A / A_ref: price = f0 mu / A_ref.
// The dimensionless mu itself is the relative change of F per relative relaxation (times
// f0 / f*), which is what ranks the limits by how much they cost.
import type { SqpResult } from "../sqp";
import type { ActiveConstraint, ShadowPrice } from "./result-types";
import type { DesignProblem, Limit } from "./problem";
import { unitLabel } from "../truss/units";
import { constraintWords } from "./constraint-words";
import type { Units } from "../truss/schema";

/** multipliers below this (scaled, dimensionless) count as zero */
const MULTIPLIER_FLOOR = 1e-9;
/** a limit with |g| below this counts as active even when its multiplier is zero */
const ACTIVE_GAP = 1e-6;

export interface PricedConstraint {
  id: string;
  scaled: number; // solver multiplier (dimensionless)
  price: number; // objective saved per unit relaxation, model units
  unit: string;
  what: string; // plain words for the limit
  relaxUnit: string;
}

/** The unit a limit is relaxed in; its words come from the one rule (constraint-words.ts). */
function relaxUnitOf(p: DesignProblem, lim: Limit): string {
  const u = p.model.units as Units;
  switch (lim.kind) {
    case "stress-tension":
    case "stress-compression":
    case "buckling":
      return unitLabel("stress", u);
    case "displacement":
    case "length":
      return u.length;
    case "volume":
      return unitLabel("volume", u);
  }
}

export function objectiveUnit(p: DesignProblem): string {
  return p.objective === "mass" ? p.model.units.mass : `${p.model.units.force}·${p.model.units.length}`;
}

/** The priced active limits and bounds, most expensive (largest scaled multiplier) first. */
export function priceConstraints(p: DesignProblem, r: SqpResult, objectiveScale: number): PricedConstraint[] {
  const out = new Map<string, PricedConstraint>();
  const objUnit = objectiveUnit(p);
  const add = (id: string, scaled: number, price: number, what: string, relaxUnit: string) => {
    const prev = out.get(id);
    if (prev) {
      prev.scaled += scaled;
      prev.price += price;
    } else {
      out.set(id, { id, scaled, price, unit: `${objUnit} per ${relaxUnit}`, what, relaxUnit });
    }
  };
  p.limits.forEach((lim, k) => {
    const mu = Math.max(0, r.multipliers.ineq[k] ?? 0);
    const g = r.ineq[k];
    if (!(mu > MULTIPLIER_FLOOR) && !(Math.abs(g) < ACTIVE_GAP)) return;
    // buckling is the stress difference (-sigma - sigma_E) / sigma_ref (problem.ts): relaxing
    // the Euler stress by one unit moves g by 1 / sigma_ref, whatever g is
    const perUnit = lim.kind === "buckling" ? 1 / lim.limit : (1 + g) / lim.limit;
    const price = mu > MULTIPLIER_FLOOR ? objectiveScale * mu * perUnit : 0;
    add(lim.id, mu > MULTIPLIER_FLOOR ? mu : 0, price, constraintWords(lim.id, p.model), relaxUnitOf(p, lim));
  });
  const areaUnit = `${p.model.units.length}²`;
  p.areaVars.forEach((v, k) => {
    const lo = Math.max(0, r.multipliers.lower[k] ?? 0);
    const hi = Math.max(0, r.multipliers.upper[k] ?? 0);
    if (lo > MULTIPLIER_FLOOR) add(`area-min:${v.id}`, lo, (objectiveScale * lo) / v.scale, constraintWords(`area-min:${v.id}`, p.model), areaUnit);
    if (hi > MULTIPLIER_FLOOR) add(`area-max:${v.id}`, hi, (objectiveScale * hi) / v.scale, constraintWords(`area-max:${v.id}`, p.model), areaUnit);
  });
  const nA = p.areaVars.length;
  p.shapeVars.forEach((v, k) => {
    const lo = Math.max(0, r.multipliers.lower[nA + k] ?? 0);
    const hi = Math.max(0, r.multipliers.upper[nA + k] ?? 0);
    const len = p.model.units.length;
    if (lo > MULTIPLIER_FLOOR) add(`shape-min:${v.id}`, lo, (objectiveScale * lo) / v.scale, constraintWords(`shape-min:${v.id}`, p.model), len);
    if (hi > MULTIPLIER_FLOOR) add(`shape-max:${v.id}`, hi, (objectiveScale * hi) / v.scale, constraintWords(`shape-max:${v.id}`, p.model), len);
  });
  return [...out.values()].sort((a, b) => b.scaled - a.scaled || a.id.localeCompare(b.id));
}

export function activeConstraints(priced: PricedConstraint[]): ActiveConstraint[] {
  return priced.map((c) => ({ id: c.id, multiplier: c.price }));
}

const fmt = (v: number) => (v === 0 ? "0" : Math.abs(v) >= 1e-3 && Math.abs(v) < 1e5 ? Number(v.toPrecision(3)).toString() : v.toExponential(2));

/** Shadow prices with a plain-words sentence for the three that cost most. */
export function shadowPrices(p: DesignProblem, priced: PricedConstraint[], objectiveFinal: number, objectiveScale: number): ShadowPrice[] {
  const objUnit = objectiveUnit(p);
  const noun = p.objective === "mass" ? "material" : "compliance";
  return priced
    .filter((c) => c.scaled > 0)
    .map((c, rank) => {
      const share = objectiveFinal > 0 ? (100 * c.scaled * objectiveScale) / objectiveFinal : 0;
      const sentence =
        rank < 3
          ? `The ${c.what} governs: relaxing it by 1 ${c.relaxUnit} would save about ${fmt(c.price)} ${objUnit} of ${noun}` +
            ` (relaxing it by 1% saves about ${fmt(share / 100)}% of the total).`
          : "";
      return { constraint: c.id, multiplier: c.price, unit: c.unit, sentence };
    });
}
