// Loads that depend on the design (own weight) and the load combinations (docs/model-format.md,
// "Additions"). Responses are numbered load cases first, then combinations: every per-case
// array of an analysis continues with one entry per combination, and a combination's entry
// is the factored sum of the cases' entries (the analysis is linear, one factorization).
import { FORCE_IN_N, MASS_IN_KG } from "./units";
import type { ForceUnit, MassUnit } from "./schema";

/** Standard gravity in m/s^2 (exact by definition, NIST SP 811). */
export const STANDARD_GRAVITY = 9.80665;

/** The weight of one model mass unit in model force units: 1 kg -> 9.80665 N, 1 t -> 9.80665 kN, 1 lb -> 1 lbf. */
export function weightPerMass(units: { force: string; mass: string }): number {
  return (MASS_IN_KG[units.mass as MassUnit] * STANDARD_GRAVITY) / FORCE_IN_N[units.force as ForceUnit];
}

export interface CombinationData {
  id: string;
  name?: string;
  use: "strength" | "service";
  /** factor per load case index (0 for cases the combination leaves out) */
  factors: Float64Array;
}

/** What the own-weight loads need: topology, densities, the gravity axis and unit weight. */
export interface WeightTopology {
  start: Int32Array;
  end: Int32Array;
  density: Float64Array;
  /** dof offset of gravity within a node: 1 (y) in 2D, 2 (z) in 3D */
  gravityAxis: 1 | 2;
  /** model force units per model mass unit */
  weightPerMass: number;
}

/**
 * The own-weight load vector at factor 1: half of each member's weight on each end node, along
 * -gravity. W(A, L)_q = -1/2 sum_e g rho_e A_e L_e over members meeting at q's node, q the
 * gravity dof.
 */
export function ownWeightLoads(t: WeightTopology, nDof: number, areas: ArrayLike<number>, lengths: ArrayLike<number>, out?: Float64Array): Float64Array {
  const w = out ?? new Float64Array(nDof);
  if (out) w.fill(0);
  const g = t.gravityAxis;
  for (let e = 0; e < t.start.length; e++) {
    const half = 0.5 * t.weightPerMass * t.density[e] * areas[e] * lengths[e];
    w[3 * t.start[e] + g] -= half;
    w[3 * t.end[e] + g] -= half;
  }
  return w;
}

/**
 * lambda^T dW/dA_e for one member, W the own-weight vector at factor 1:
 * -1/2 g rho_e L_e (lambda_i + lambda_j) along gravity. dW/dL_e is this times A_e / L_e.
 */
export function ownWeightAdjoint(t: WeightTopology, e: number, lengths: ArrayLike<number>, lambda: ArrayLike<number>): number {
  const g = t.gravityAxis;
  return -0.5 * t.weightPerMass * t.density[e] * lengths[e] * (lambda[3 * t.start[e] + g] + lambda[3 * t.end[e] + g]);
}

/** Factored sums of per-case vectors, one per combination. */
export function combineVectors(combinations: readonly CombinationData[], perCase: readonly ArrayLike<number>[]): Float64Array[] {
  const n = perCase.length > 0 ? perCase[0].length : 0;
  return combinations.map((c) => {
    const out = new Float64Array(n);
    for (let l = 0; l < perCase.length; l++) {
      const f = c.factors[l];
      if (f === 0) continue;
      const v = perCase[l];
      for (let q = 0; q < n; q++) out[q] += f * v[q];
    }
    return out;
  });
}

/** The own-weight factor of every response (cases, then combinations: the factored sum). */
export function responseSelfWeight(selfWeight: Float64Array, combinations: readonly CombinationData[]): Float64Array {
  const out = new Float64Array(selfWeight.length + combinations.length);
  out.set(selfWeight);
  combinations.forEach((c, k) => {
    let s = 0;
    for (let l = 0; l < selfWeight.length; l++) s += c.factors[l] * selfWeight[l];
    out[selfWeight.length + k] = s;
  });
  return out;
}

/** The case factors of response r: a unit vector for a case, the factors for a combination. */
export function responseFactors(nCases: number, combinations: readonly CombinationData[], r: number): Float64Array {
  if (r >= nCases) return combinations[r - nCases].factors;
  const f = new Float64Array(nCases);
  f[r] = 1;
  return f;
}
