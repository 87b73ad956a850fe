// The compliance analogue of the least-mass bound, for a minimum-compliance run under a volume
// limit. For any design with volume sum A_e L_e <= V that carries load case k:
//
//   C_k = f_k . u_k = min over forces q balancing f_k of  sum q_e^2 L_e / (E_e A_e)   (least complementary energy)
//   (sum |q_e| L_e)^2 <= sum q_e^2 L_e / (E_e A_e) * sum E_e A_e L_e <= C_k * E_max * V   (Cauchy-Schwarz)
//
// so C_k >= W_k^2 / (E_max V), W_k = min sum L_e |q_e| over forces balancing f_k: the plastic LP
// with unit allowables and unit density, one load case at a time. With one load case and one
// material the bound is the optimum itself (the stiffest truss of given volume is the least-
// volume truss scaled, from memory: the classical equivalence of the two ground-structure
// problems). With several load cases it is looser. Own weight makes the loads depend on the
// design, which this argument does not cover: such models get no bound.
import type { TrussModel } from "../truss";
import type { JobOptions } from "../design/options";
import type { TrussResult } from "../design/result-types";
import type { LpSolver } from "./solver";
import type { BoundOutcome } from "./outcome";
import { plasticInputFromModel, resultCoords } from "./from-model";
import { solvePlasticDesign } from "./plastic";
import { maxOf } from "../util/extent";

export function complianceLowerBound(model: TrussModel, result: TrussResult, options: JobOptions, solver: LpSolver): BoundOutcome {
  const volumeMax = options.volumeMax ?? model.design?.constraints?.volume?.max;
  if (volumeMax === undefined) {
    return { kind: "withheld", reason: "A compliance bound needs a volume limit, and this run has none." };
  }
  if (model.loadCases.some((lc) => (lc.selfWeight ?? 0) !== 0)) {
    return { kind: "withheld", reason: "Own weight makes the loads depend on the areas; the compliance bound does not cover that, so none is shown." };
  }
  const final = (model.design?.shape?.length ?? 0) > 0;
  const coords = final ? resultCoords(model, result) : undefined;
  const { input, loadCaseLoads } = plasticInputFromModel(model, coords);
  const m = input.memberIds.length;
  const unit = new Float64Array(m).fill(1);
  const own = Int32Array.from({ length: m }, (_, e) => e);
  const eMax = maxOf(model.materials.map((mat) => mat.E));
  // the compliance objective sums over load cases, never combinations
  let bound = 0;
  let solverName = "";
  for (let l = 0; l < model.loadCases.length; l++) {
    const lc = model.loadCases[l];
    const lp = solvePlasticDesign(
      { ...input, density: unit, allowTension: unit, allowCompression: unit, memberVar: own, varIds: input.memberIds, cases: [{ id: lc.id, loads: loadCaseLoads[l], selfWeight: 0 }] },
      solver,
    );
    if (lp.status !== "optimal") return { kind: "withheld", reason: lp.message };
    solverName = lp.solver;
    bound += (lp.mass * lp.mass) / (eMax * volumeMax);
  }
  if (!(bound > 0)) return { kind: "withheld", reason: "No load case loads the truss, so the compliance bound is zero and certifies nothing." };
  const oneMaterial = new Set(model.members.map((mm) => mm.material)).size === 1;
  const tight = model.loadCases.length === 1 && oneMaterial ? " With one load case and one material it is the least compliance itself." : "";
  return {
    kind: "bound",
    plasticAreas: null,
    lowerBound: {
      value: bound,
      gap: result.objective.final / bound - 1,
      basis:
        `The least compliance of any truss on these ${model.members.length} members with volume at most ${volumeMax} ${model.units.length}³: ` +
        `the sum over load cases of W² / (E V), where W is the least sum of |force| × length that balances the case ` +
        `(a linear program solved with ${solverName}), E the stiffest material's modulus and V the volume limit.` +
        tight +
        " Areas may fall to zero and have no upper limit; members of a group share one area in the design but not in the bound." +
        (final ? " It is taken at the final node positions of this run." : ""),
      geometry: final ? "final" : "model",
    },
  };
}
