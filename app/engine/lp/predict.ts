// For the solver: the plastic design as a starting point and a predictor of which members
// vanish at the optimum. In a least-mass design with stress limits the members the LP leaves at
// zero area usually end at their minimum area in the elastic optimum too (compatibility moves
// forces between members but rarely revives a member the LP finds useless).
import type { TrussModel } from "../truss";
import type { LpSolver } from "./solver";
import { plasticInputFromModel } from "./from-model";
import { solvePlasticDesign } from "./plastic";

export interface VanishingPrediction {
  /** per member, the LP's area (model units): a starting design */
  areas: Float64Array;
  /** per member, true where the LP area is below `threshold` times the largest LP area */
  vanishing: boolean[];
  /** the LP optimum: a lower bound on the least mass (model mass units) */
  mass: number;
}

/** The LP design of a model at its own geometry, or null with the reason when the LP has none. */
export function predictVanishingMembers(
  model: TrussModel,
  solver: LpSolver,
  threshold = 1e-3,
): { ok: true; prediction: VanishingPrediction } | { ok: false; reason: string } {
  const { input } = plasticInputFromModel(model);
  const lp = solvePlasticDesign(input, solver);
  if (lp.status !== "optimal") return { ok: false, reason: lp.message };
  return { ok: true, prediction: { areas: lp.memberAreas, vanishing: vanishingMembers(lp.memberAreas, threshold), mass: lp.mass } };
}

/**
 * Per member, true where the LP area is at most `threshold` times the largest: the prediction
 * from LP areas already at hand (e.g. OptimizeOptions.plasticStart, which the worker fills for
 * mass runs without shape variables), without solving the LP again.
 */
export function vanishingMembers(areas: ArrayLike<number>, threshold = 1e-3): boolean[] {
  let largest = 0;
  for (let e = 0; e < areas.length; e++) largest = Math.max(largest, areas[e]);
  return Array.from(areas, (a) => a <= threshold * largest);
}
