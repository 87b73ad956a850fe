// Values and explicit partial derivatives of every limit (see problem.ts for their forms).
// Each limit is g(A, x, u) with u entering linearly, so one routine serves both formulations:
// the nested one adds the adjoint term for u = u(A, x), the simultaneous one keeps the u part
// as Jacobian entries on the displacement variables.
import type { DesignProblem, Limit } from "./problem";
import { eulerStrainTerm } from "./buckling";

/** Sparse partials of one limit: by member area, by coordinate dof, by displacement dof. */
export class Partials {
  aIdx: number[] = [];
  aVal: number[] = [];
  xIdx: number[] = [];
  xVal: number[] = [];
  uIdx: number[] = [];
  uVal: number[] = [];
  reset(): void {
    this.aIdx.length = 0; this.aVal.length = 0;
    this.xIdx.length = 0; this.xVal.length = 0;
    this.uIdx.length = 0; this.uVal.length = 0;
  }
  /** d/d(coords) of a function of d = x_j - x_i of member e. */
  addMemberVector(p: DesignProblem, e: number, gd: ArrayLike<number>, scale: number): void {
    const i = 3 * p.structure.start[e], j = 3 * p.structure.end[e];
    for (let a = 0; a < 3; a++) {
      const g = gd[a] * scale;
      if (g === 0) continue;
      this.xIdx.push(j + a, i + a);
      this.xVal.push(g, -g);
    }
  }
  addMemberRelative(p: DesignProblem, e: number, gd: ArrayLike<number>, scale: number): void {
    const i = 3 * p.structure.start[e], j = 3 * p.structure.end[e];
    const fixed = p.structure.fixed;
    for (let a = 0; a < 3; a++) {
      const g = gd[a] * scale;
      if (g === 0) continue;
      if (!fixed[j + a]) { this.uIdx.push(j + a); this.uVal.push(g); }
      if (!fixed[i + a]) { this.uIdx.push(i + a); this.uVal.push(-g); }
    }
  }
}

export interface LimitState {
  areas: Float64Array;
  coords: Float64Array;
  lengths: Float64Array;
  volume: number;
  displacements: ArrayLike<number>[]; // per response (load cases, then combinations), nNodes*3
  /** applied loads per load case (own weight included), nNodes*3 */
  loads: ArrayLike<number>[];
}

const d = new Float64Array(3);
const du = new Float64Array(3);
const gd = new Float64Array(3);

function memberVectors(p: DesignProblem, st: LimitState, e: number, u: ArrayLike<number> | null) {
  const s = p.structure;
  const i = 3 * s.start[e], j = 3 * s.end[e];
  for (let a = 0; a < 3; a++) {
    d[a] = st.coords[j + a] - st.coords[i + a];
    du[a] = u ? u[j + a] - u[i + a] : 0;
  }
}

/** The ratio value of one limit (0 on the limit, negative inside). */
export function limitValue(p: DesignProblem, lim: Limit, st: LimitState): number {
  const s = p.structure;
  switch (lim.kind) {
    case "stress-tension":
    case "stress-compression": {
      memberVectors(p, st, lim.member, st.displacements[lim.loadCase]);
      const L2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
      const sigma = (s.E[lim.member] * (d[0] * du[0] + d[1] * du[1] + d[2] * du[2])) / L2;
      return (lim.sign * sigma) / lim.limit - 1;
    }
    case "buckling": {
      // (-sigma - sigma_E) / sigma_ref = -E / (sigma_ref L^2) ((d.du) + w(A))   (buckling.ts)
      memberVectors(p, st, lim.member, st.displacements[lim.loadCase]);
      const L2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
      const W = d[0] * du[0] + d[1] * du[1] + d[2] * du[2] + eulerStrainTerm(p.buckling!, lim.member, st.areas[lim.member]).w;
      return (-s.E[lim.member] * W) / (lim.limit * L2);
    }
    case "displacement":
      return (lim.sign * st.displacements[lim.loadCase][lim.dof]) / lim.limit - 1;
    case "volume":
      return st.volume / lim.limit - 1;
    case "length":
      return 1 - st.lengths[lim.member] / lim.limit;
  }
}

/** Explicit partials of one limit (u held fixed), appended to out (which is reset first). */
export function limitPartials(p: DesignProblem, lim: Limit, st: LimitState, out: Partials): void {
  out.reset();
  const s = p.structure;
  const e = lim.member;
  switch (lim.kind) {
    case "stress-tension":
    case "stress-compression": {
      // sigma = E (d.du)/L^2; dsigma/dd = E du/L^2 - 2 E (d.du) d/L^4; dsigma/d(du) = E d/L^2
      memberVectors(p, st, e, st.displacements[lim.loadCase]);
      const L2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
      const ed = d[0] * du[0] + d[1] * du[1] + d[2] * du[2];
      const c = (lim.sign * s.E[e]) / lim.limit;
      for (let a = 0; a < 3; a++) gd[a] = du[a] / L2 - (2 * ed * d[a]) / (L2 * L2);
      out.addMemberVector(p, e, gd, c);
      for (let a = 0; a < 3; a++) gd[a] = d[a] / L2;
      out.addMemberRelative(p, e, gd, c);
      return;
    }
    case "buckling": {
      // g = -S W, S = E / (sigma_ref L^2), W = (d.du) + w(A):
      // dg/dA = -S w'(A); dg/d(du) = -S d; dg/dd = -S du + 2 S W d / L^2
      memberVectors(p, st, e, st.displacements[lim.loadCase]);
      const { w, dwdA } = eulerStrainTerm(p.buckling!, e, st.areas[e]);
      const L2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
      const S = s.E[e] / (lim.limit * L2);
      const W = d[0] * du[0] + d[1] * du[1] + d[2] * du[2] + w;
      out.aIdx.push(e);
      out.aVal.push(-S * dwdA);
      for (let a = 0; a < 3; a++) gd[a] = -du[a] + (2 * W * d[a]) / L2;
      out.addMemberVector(p, e, gd, S);
      out.addMemberRelative(p, e, d, -S);
      return;
    }
    case "displacement":
      out.uIdx.push(lim.dof);
      out.uVal.push(lim.sign / lim.limit);
      return;
    case "volume": {
      const m = s.memberIds.length;
      for (let k = 0; k < m; k++) {
        out.aIdx.push(k);
        out.aVal.push(st.lengths[k] / lim.limit);
      }
      for (const k of p.shapeMembers) {
        memberVectors(p, st, k, null);
        const L = st.lengths[k];
        for (let a = 0; a < 3; a++) gd[a] = d[a] / L;
        out.addMemberVector(p, k, gd, st.areas[k] / lim.limit);
      }
      return;
    }
    case "length": {
      memberVectors(p, st, e, null);
      const L = st.lengths[e];
      for (let a = 0; a < 3; a++) gd[a] = d[a] / L;
      out.addMemberVector(p, e, gd, -1 / lim.limit);
      return;
    }
  }
}

/** Objective value in model units (mass, or compliance summed over load cases). */
export function objectiveValue(p: DesignProblem, st: LimitState): number {
  const s = p.structure;
  if (p.objective === "mass") {
    let mass = 0;
    for (let e = 0; e < st.areas.length; e++) mass += s.density[e] * st.areas[e] * st.lengths[e];
    return mass;
  }
  let c = 0;
  for (let l = 0; l < s.loads.length; l++) {
    const f = st.loads[l], u = st.displacements[l];
    for (let q = 0; q < f.length; q++) if (f[q] !== 0) c += f[q] * u[q];
  }
  return c;
}

/** Explicit partials of the mass (areas and coordinates). */
export function massPartials(p: DesignProblem, st: LimitState, out: Partials): void {
  out.reset();
  const s = p.structure;
  const m = s.memberIds.length;
  for (let e = 0; e < m; e++) {
    out.aIdx.push(e);
    out.aVal.push(s.density[e] * st.lengths[e]);
  }
  for (const e of p.shapeMembers) {
    memberVectors(p, st, e, null);
    const L = st.lengths[e];
    for (let a = 0; a < 3; a++) gd[a] = d[a] / L;
    out.addMemberVector(p, e, gd, s.density[e] * st.areas[e]);
  }
}

/** Chain rule from member areas and coordinate dofs onto the scaled design variables. */
export function toDesign(p: DesignProblem, part: Partials, out: Float64Array): void {
  for (let k = 0; k < part.aIdx.length; k++) {
    const v = p.memberVar[part.aIdx[k]];
    out[v] += part.aVal[k] * p.areaVars[v].scale;
  }
  for (let k = 0; k < part.xIdx.length; k++) {
    const list = p.dofShape.get(part.xIdx[k]);
    if (!list) continue;
    for (const { v, c } of list) out[v] += part.xVal[k] * c;
  }
}
