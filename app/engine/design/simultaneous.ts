// Simultaneous formulation: the displacements of every load case are optimization variables
// beside the design variables, and equilibrium K(A, x) u = f is an equality constraint per free
// degree of freedom and load case. No stiffness solve happens inside the optimizer; an
// evaluation is one element loop.
//
// Variables: z = [design (scaled as in problem.ts) | w_1 | ... | w_nLc] with
//   u = u_0 + u_ref,l (w_l - 1) on the free dofs, u_0 the starting displacements and u_ref,l the
//   largest of them in load case l: every displacement variable starts at exactly 1 and moves
//   on the same scale (a dof that starts with a tiny displacement is not magnified the way a
//   per-variable |x0| scaling would magnify it).
// Equalities: r = ((K u)_q - f_q) / f_ref,l, f_ref,l = largest load of case l.
// Jacobian: exact and sparse (SparseRow). Equilibrium is linear in u and bilinear in (A, u),
//   so a row of node q holds only the areas, the displacements and the shape variables of the
//   members meeting at q: about (members per node) x (2 dim + 1) entries. The sparsity
//   pattern is fixed, built once, and refilled by one element loop per evaluation, so the cost
//   of an evaluation grows with the member count, never with the square of the dof count.
// Steps: equilibrium is declared to the solver as state equations (SqpProblem.stateEquations):
//   d(eq)/dw is the free-dof stiffness matrix times u_ref,l / f_ref,l, block diagonal over load
//   cases with one K, so the solver takes null-space steps (sqp/reduced-space.ts): one sparse
//   factorization of K per iterate, the displacement part of each step from solves with it,
//   and the quasi-Newton matrix only over the design variables, where the curvature is unknown.
//   The displacements stay optimization variables, but the solver re-solves them at every trial
//   design before reading it (declared linearInStates; sqp/restoration.ts): a step meets
//   equilibrium only to first order, and the limits read at the stale displacements of a much
//   thinner design looked met, so the merit accepted steps the next subproblem could not
//   recover from. Nothing in this module stores a dense matrix.
// Own weight: the load of case l is P_l + s_l W(A, x) (own-weight.ts), so the equilibrium rows
//   depend on the areas (and the shape) through the load as well as through K: the rows of the
//   gravity dofs at a member's ends get +s_l/2 g rho L (per unit area) and its length
//   derivative. Combinations are not variables: a limit on a combination reads the factored
//   sum of the cases' displacement variables.
// Start: the displacements of one stiffness analysis at the starting design, so the first
//   iterate is in equilibrium and the limit values start exactly as in the nested formulation.
import { analyze, caseLoads, combineVectors, factorStiffness, responseFactors } from "../truss";
import { addOwnWeightGradient } from "./own-weight";
import type { SparseRow, SqpProblem } from "../sqp";
import { internalForceByGeometry, memberLengths } from "./element";
import { Partials, limitPartials, limitValue, massPartials, objectiveValue, type LimitState } from "./limits";
import { designState, type DesignProblem } from "./problem";
import type { Counters, Formulation } from "./nested";
import { appendAll } from "../util/extent";

const AXIS = ["x", "y", "z"];

export interface SimultaneousFormulation extends Formulation<LimitState> {
  nFree: number;
}

export function simultaneousFormulation(p: DesignProblem): SimultaneousFormulation {
  const s = p.structure;
  const m = s.memberIds.length;
  const nLc = s.loads.length;
  const nDof = s.coords.length;
  const nD = p.nDesign;
  const counters: Counters = { analyses: 0, solves: 0 };

  const freeIndex = new Int32Array(nDof).fill(-1);
  const freeDofs: number[] = [];
  for (let q = 0; q < nDof; q++) if (!s.fixed[q]) { freeIndex[q] = freeDofs.length; freeDofs.push(q); }
  const nFree = freeDofs.length;

  // Start: one analysis at the starting design.
  const start = designState(p, p.x0);
  const a0 = analyze(s, { areas: start.areas, coords: start.coords });
  counters.analyses++;
  const uRef = new Float64Array(nLc), fRef = new Float64Array(nLc);
  for (let l = 0; l < nLc; l++) {
    let um = 0, fm = 0;
    for (const q of freeDofs) {
      um = Math.max(um, Math.abs(a0.displacements[l][q]));
      fm = Math.max(fm, Math.abs(a0.loads[l][q]));
    }
    uRef[l] = um > 0 ? um : 1;
    fRef[l] = fm > 0 ? fm : 1;
  }
  const n = nD + nLc * nFree;
  const x0 = new Float64Array(n);
  x0.set(p.x0);
  for (let l = 0; l < nLc; l++) {
    for (let k = 0; k < nFree; k++) x0[nD + l * nFree + k] = 1;
  }
  const lower = new Float64Array(n).fill(-Infinity);
  const upper = new Float64Array(n).fill(Infinity);
  lower.set(p.lower);
  upper.set(p.upper);

  // Sparsity pattern of the equilibrium rows (the same for every load case, w columns shifted).
  // Columns are kept as "design column" (< nD) or "nD + free index" for load case 0.
  const rowCols: number[][] = Array.from({ length: nFree }, () => []);
  const dofsOf = (e: number) => {
    const i = 3 * s.start[e], j = 3 * s.end[e];
    return [i, i + 1, i + 2, j, j + 1, j + 2];
  };
  const shapeColsOfDof = (q: number) => (p.dofShape.get(q) ?? []).map((t) => t.v);
  const isShapeMember = new Uint8Array(m);
  for (const e of p.shapeMembers) isShapeMember[e] = 1;
  for (let e = 0; e < m; e++) {
    const dofs = dofsOf(e);
    const shapeCols = isShapeMember[e] ? dofs.flatMap(shapeColsOfDof) : [];
    for (const q of dofs) {
      const r = freeIndex[q];
      if (r < 0) continue;
      rowCols[r].push(p.memberVar[e], ...shapeCols);
      for (const q2 of dofs) if (freeIndex[q2] >= 0) rowCols[r].push(nD + freeIndex[q2]);
    }
  }
  const patternIndex: Int32Array[] = [];
  const rowPos: Map<number, number>[] = [];
  for (let r = 0; r < nFree; r++) {
    const cols = [...new Set(rowCols[r])].sort((a, b) => a - b);
    patternIndex.push(Int32Array.from(cols));
    rowPos.push(new Map(cols.map((c, k) => [c, k])));
  }
  // The pattern of each load case's rows: its displacement columns shifted by l * nFree.
  const casePattern = Array.from({ length: nLc }, (_, l) =>
    l === 0 ? patternIndex : patternIndex.map((ix) => ix.map((c) => (c >= nD ? c + l * nFree : c))),
  );
  // Per member and local row (6), the value positions of its area column and u columns (6x6).
  const posA = new Int32Array(m * 6).fill(-1);
  const posU = new Int32Array(m * 36).fill(-1);
  for (let e = 0; e < m; e++) {
    const dofs = dofsOf(e);
    for (let a = 0; a < 6; a++) {
      const r = freeIndex[dofs[a]];
      if (r < 0) continue;
      posA[e * 6 + a] = rowPos[r].get(p.memberVar[e])!;
      for (let b = 0; b < 6; b++) {
        const c = freeIndex[dofs[b]];
        if (c >= 0) posU[e * 36 + a * 6 + b] = rowPos[r].get(nD + c)!;
      }
    }
  }

  function stateAt(z: Float64Array): LimitState {
    const { areas, coords } = designState(p, z);
    const lengths = memberLengths(s, coords);
    let volume = 0;
    for (let e = 0; e < m; e++) volume += areas[e] * lengths[e];
    const displacements: Float64Array[] = [];
    for (let l = 0; l < nLc; l++) {
      const u = new Float64Array(nDof);
      const off = nD + l * nFree;
      const u0 = a0.displacements[l];
      for (let k = 0; k < nFree; k++) u[freeDofs[k]] = u0[freeDofs[k]] + uRef[l] * (z[off + k] - 1);
      displacements.push(u);
    }
    if (s.combinations.length > 0) appendAll(displacements, combineVectors(s.combinations, displacements));
    return { areas, coords, lengths, volume, displacements, loads: caseLoads(s, areas, lengths) };
  }
  const weightPerLength = new Float64Array(m); // g rho / 2: a member end's own weight per unit A L
  for (let e = 0; e < m; e++) weightPerLength[e] = 0.5 * s.weightPerMass * s.density[e];
  const gAxis = s.gravityAxis;

  const f0 = objectiveValue(p, stateAt(x0));
  const objectiveScale = f0 > 0 ? f0 : 1;
  const part = new Partials();
  const dv = new Float64Array(3), dU = new Float64Array(3), G = new Float64Array(9);

  function memberForce(st: LimitState, e: number, u: Float64Array): number {
    // returns A E (d.du) / L^3 and leaves d in dv, du in dU
    const i = 3 * s.start[e], j = 3 * s.end[e];
    for (let a = 0; a < 3; a++) {
      dv[a] = st.coords[j + a] - st.coords[i + a];
      dU[a] = u[j + a] - u[i + a];
    }
    const L = st.lengths[e];
    return (st.areas[e] * s.E[e] * (dv[0] * dU[0] + dv[1] * dU[1] + dv[2] * dU[2])) / (L * L * L);
  }

  const sums = new ColumnSums(n);

  function designColumns(part: Partials, sums: ColumnSums) {
    for (let k = 0; k < part.aIdx.length; k++) {
      const v = p.memberVar[part.aIdx[k]];
      sums.add(v, part.aVal[k] * p.areaVars[v].scale);
    }
    for (let k = 0; k < part.xIdx.length; k++) {
      const list = p.dofShape.get(part.xIdx[k]);
      if (!list) continue;
      for (const { v, c } of list) sums.add(v, part.xVal[k] * c);
    }
  }

  /**
   * The own-weight part of the equilibrium rows r = (K u - f) / fRef of one case for member e:
   * -s dW/dA_e = +s g rho L / 2 at both ends' gravity dofs, and the length derivative
   * -s dW/dd = +s g rho A / 2 d / L through the shape variables. Expects dv = d (memberForce).
   */
  function ownWeightRows(st: LimitState, e: number, sw: number, fr: number, vals: Float64Array[]) {
    const dofs = dofsOf(e);
    const vA = p.areaVars[p.memberVar[e]].scale;
    const L = st.lengths[e];
    const perArea = (sw * weightPerLength[e] * L * vA) / fr;
    for (const a of [gAxis, 3 + gAxis]) {
      const r = freeIndex[dofs[a]];
      if (r < 0) continue;
      vals[r][posA[e * 6 + a]] += perArea;
      if (!isShapeMember[e]) continue;
      const perLength = (sw * weightPerLength[e] * st.areas[e]) / (L * fr); // d/dL, times dL/dd_b = d_b / L below
      for (let b = 0; b < 6; b++) {
        const list = p.dofShape.get(dofs[b]);
        if (!list) continue;
        const sb = b < 3 ? -1 : 1;
        const g = sb * perLength * dv[b % 3];
        for (const t of list) vals[r][rowPos[r].get(t.v)!] += g * t.c;
      }
    }
  }

  /** The equilibrium rows r = (K u - f) / fRef of every load case at the state st. */
  function equilibriumResidual(st: LimitState): Float64Array {
    const eq = new Float64Array(nLc * nFree);
    for (let l = 0; l < nLc; l++) {
      const u = st.displacements[l] as Float64Array;
      const f = st.loads[l];
      const off = l * nFree;
      for (let k = 0; k < nFree; k++) eq[off + k] = -f[freeDofs[k]];
      for (let e = 0; e < m; e++) {
        const c = memberForce(st, e, u);
        const i = 3 * s.start[e], j = 3 * s.end[e];
        for (let a = 0; a < 3; a++) {
          const pj = c * dv[a];
          const rj = freeIndex[j + a], ri = freeIndex[i + a];
          if (rj >= 0) eq[off + rj] += pj;
          if (ri >= 0) eq[off + ri] -= pj;
        }
      }
      for (let k = 0; k < nFree; k++) eq[off + k] /= fRef[l];
    }
    return eq;
  }

  const problem: SqpProblem = {
    n,
    x0,
    lower,
    upper,
    nEq: nLc * nFree,
    nIneq: p.limits.length,
    evaluate(z) {
      const st = stateAt(z);
      const eq = equilibriumResidual(st);
      const ineq = new Float64Array(p.limits.length);
      for (let r = 0; r < p.limits.length; r++) ineq[r] = limitValue(p, p.limits[r], st);
      return { f: objectiveValue(p, st) / objectiveScale, eq, ineq };
    },
    derivatives(z, rows) {
      const st = stateAt(z);
      const grad = new Float64Array(n);
      if (p.objective === "mass") {
        massPartials(p, st, part);
        designColumns(part, sums);
        const { index, value } = sums.take();
        for (let k = 0; k < index.length; k++) grad[index[k]] = value[k] / objectiveScale;
      } else {
        const gDesign = new Float64Array(nD);
        for (let l = 0; l < nLc; l++) {
          const off = nD + l * nFree;
          for (let k = 0; k < nFree; k++) grad[off + k] = (st.loads[l][freeDofs[k]] * uRef[l]) / objectiveScale;
          // C = sum f_l(A).u_l: the own-weight load's share u_l^T dW/dp
          if (s.selfWeight[l] !== 0) addOwnWeightGradient(p, st.areas, st.coords, st.lengths, st.displacements[l], s.selfWeight[l], gDesign, isShapeMember);
        }
        for (let k = 0; k < nD; k++) grad[k] += gDesign[k] / objectiveScale;
      }

      // Equilibrium rows.
      const eq: SparseRow[] = [];
      for (let l = 0; l < nLc; l++) {
        const u = st.displacements[l] as Float64Array;
        const vals = patternIndex.map((ix) => new Float64Array(ix.length));
        const wScale = uRef[l] / fRef[l];
        const sw = s.selfWeight[l];
        for (let e = 0; e < m; e++) {
          const c = memberForce(st, e, u);
          if (sw !== 0) ownWeightRows(st, e, sw, fRef[l], vals);
          const L = st.lengths[e];
          const k0 = (st.areas[e] * s.E[e]) / (L * L * L);
          const dofs = dofsOf(e);
          const vA = p.areaVars[p.memberVar[e]].scale;
          for (let a = 0; a < 6; a++) {
            const r = freeIndex[dofs[a]];
            if (r < 0) continue;
            const ra = a % 3;
            const sa = a < 3 ? -1 : 1; // p_i = -p_j
            const row = vals[r];
            row[posA[e * 6 + a]] += (sa * c * dv[ra] * vA) / (st.areas[e] * fRef[l]);
            for (let b = 0; b < 6; b++) {
              const pos = posU[e * 36 + a * 6 + b];
              if (pos < 0) continue;
              const sb = b < 3 ? -1 : 1;
              row[pos] += sa * sb * k0 * dv[ra] * dv[b % 3] * wScale;
            }
          }
          if (isShapeMember[e]) {
            internalForceByGeometry(st.areas[e], s.E[e], dv, dU, G);
            for (let a = 0; a < 6; a++) {
              const r = freeIndex[dofs[a]];
              if (r < 0) continue;
              const ra = a % 3;
              const sa = a < 3 ? -1 : 1;
              for (let b = 0; b < 6; b++) {
                const list = p.dofShape.get(dofs[b]);
                if (!list) continue;
                const sb = b < 3 ? -1 : 1; // d = x_j - x_i
                const g = (sa * sb * G[3 * ra + (b % 3)]) / fRef[l];
                for (const t of list) vals[r][rowPos[r].get(t.v)!] += g * t.c;
              }
            }
          }
        }
        for (let r = 0; r < nFree; r++) eq.push({ index: casePattern[l][r], value: vals[r] });
      }

      // Requested limits.
      const ineq: SparseRow[] = [];
      for (let k = 0; k < rows.length; k++) {
        const lim = p.limits[rows[k]];
        limitPartials(p, lim, st, part);
        designColumns(part, sums);
        if (part.uIdx.length) {
          // a combination's u is the factored sum of its cases' displacement variables
          const factors = responseFactors(nLc, s.combinations, lim.loadCase);
          for (let l = 0; l < nLc; l++) {
            if (factors[l] === 0) continue;
            const off = nD + l * nFree;
            const sc = uRef[l] * factors[l];
            for (let t = 0; t < part.uIdx.length; t++) {
              const c = off + freeIndex[part.uIdx[t]];
              sums.add(c, part.uVal[t] * sc);
            }
          }
        }
        ineq.push(sums.take());
      }
      return { grad, eq, ineq };
    },
    stateEquations: {
      nDesign: nD,
      // K(A, x) u = f(A, x) is linear in u: the solver restores each trial design's equilibrium
      // with one solve, so the merit reads the limits at true displacements (sqp/restoration.ts)
      linearInStates: true,
      // the restoration reads the equilibrium rows alone before re-solving (no limit values)
      residual: (z) => equilibriumResidual(stateAt(z)),
      factor(z) {
        const { areas, coords } = designState(p, z);
        const K = factorStiffness(s, areas, coords);
        counters.analyses++;
        // K is symmetric, so the transposed solve is the same solve
        const solve = (rhs: Float64Array): Float64Array => {
          const out = new Float64Array(nLc * nFree);
          const full = new Float64Array(nDof);
          for (let l = 0; l < nLc; l++) {
            const off = l * nFree;
            for (let k = 0; k < nFree; k++) full[freeDofs[k]] = rhs[off + k];
            const u = K.solve(full);
            counters.solves++;
            const c = fRef[l] / uRef[l];
            for (let k = 0; k < nFree; k++) out[off + k] = u[freeDofs[k]] * c;
          }
          return out;
        };
        return { solve, solveTransposed: solve };
      },
    },
    names: {
      variables: [
        ...p.areaVars.map((v) => `area:${v.id}`),
        ...p.shapeVars.map((v) => `shape:${v.id}`),
        ...s.loadCaseIds.flatMap((lc) => freeDofs.map((q) => `u:${s.nodeIds[Math.floor(q / 3)]}:${AXIS[q % 3]}:${lc}`)),
      ],
      eq: (i) => {
        const l = Math.floor(i / nFree), q = freeDofs[i % nFree];
        return `equilibrium:${s.nodeIds[Math.floor(q / 3)]}:${AXIS[q % 3]}:${s.loadCaseIds[l]}`;
      },
      ineq: (i) => p.limits[i]?.id ?? `limit ${i}`,
    },
  };
  return { problem, counters, objectiveScale, nFree, stateAt };
}

/**
 * Sums of terms by column, taken as a sparse row (columns ascending): what a Map from column to
 * sum did here, without a Map per row. Each column's terms are added in the order they come,
 * starting from 0 as the Map's did, so the sums have the same bits.
 */
class ColumnSums {
  private readonly sum: Float64Array;
  private readonly touched: Uint8Array;
  private readonly columns: number[] = [];

  constructor(n: number) {
    this.sum = new Float64Array(n);
    this.touched = new Uint8Array(n);
  }

  add(column: number, term: number): void {
    if (this.touched[column]) this.sum[column] += term;
    else {
      this.touched[column] = 1;
      this.sum[column] = 0 + term;
      this.columns.push(column);
    }
  }

  /** The row so far, and the sums emptied for the next one. */
  take(): SparseRow {
    const { sum, touched, columns } = this;
    columns.sort((a, b) => a - b);
    const index = Int32Array.from(columns);
    const value = new Float64Array(columns.length);
    for (let k = 0; k < columns.length; k++) {
      value[k] = sum[columns[k]];
      touched[columns[k]] = 0;
    }
    columns.length = 0;
    return { index, value };
  }
}
