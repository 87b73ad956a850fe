// Own weight in the design formulations. The load vector of a case is f_l = P_l + s_l W(A, x),
// P the point loads, s_l the case's selfWeight factor and W the own weight at factor 1
// (truss/loading.ts): W_q = -1/2 g rho_e A_e L_e summed over the members meeting at q's node,
// q the gravity dof. A combination carries s_r = sum of factor * s_l. Both formulations need
// mu^T dW/dp for a vector mu (the adjoint in the nested formulation, u itself for compliance):
//   d/dA_e  = -1/2 g rho_e L_e (mu_i + mu_j)          (gravity components)
//   d/dd_e  = -1/2 g rho_e A_e (mu_i + mu_j) d / L    (d = x_j - x_i; L depends on the shape)
import { ownWeightAdjoint } from "../truss";
import type { DesignProblem } from "./problem";

/** out[design] += factor * mu^T dW/d(design variable), for the scaled design variables. */
export function addOwnWeightGradient(p: DesignProblem, areas: Float64Array, coords: Float64Array, lengths: Float64Array, mu: ArrayLike<number>, factor: number, out: Float64Array, isShapeMember: Uint8Array): void {
  const s = p.structure;
  const m = s.memberIds.length;
  for (let e = 0; e < m; e++) {
    const dA = factor * ownWeightAdjoint(s, e, lengths, mu); // d(mu^T W)/dA_e times factor
    if (dA === 0) continue;
    const v = p.memberVar[e];
    out[v] += dA * p.areaVars[v].scale;
    if (isShapeMember[e]) {
      const i = 3 * s.start[e], j = 3 * s.end[e];
      const L = lengths[e];
      const dL = (dA * areas[e]) / L; // d(mu^T W)/dL_e times factor
      for (let a = 0; a < 3; a++) {
        const g = (dL * (coords[j + a] - coords[i + a])) / L;
        const lj = p.dofShape.get(j + a), li = p.dofShape.get(i + a);
        if (lj) for (const t of lj) out[t.v] += g * t.c;
        if (li) for (const t of li) out[t.v] -= g * t.c;
      }
    }
  }
}
