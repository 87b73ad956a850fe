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
  let largest = 0;
  for (const a of lp.memberAreas) largest = Math.max(largest, a);
  return {
    ok: true,
    prediction: { areas: lp.memberAreas, vanishing: Array.from(lp.memberAreas, (a) => a <= threshold * largest), mass: lp.mass },
  };
}
