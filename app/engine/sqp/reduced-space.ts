// Null-space steps for problems with state equations c(d, y) = 0 (types.ts StateEquations):
// the states y are the last nEq variables and J_y = dc/dy is square and nonsingular, so the
// linearized equalities J_d sd + J_y sy = -c fix sy for any design step sd:
//
//   sy = p - J_y^-1 J_d sd,   p = -J_y^-1 c                         (range step)
//
// Substituted into the subproblem this leaves a QP over the design variables only:
//
//   min 1/2 sd' B_r sd + g_r' sd     g_r = g_d - J_d' w,        w = J_y^-T g_y
//   s.t. c_i + G_y,i p + (G_d,i - J_d' t_i) sd <= 0,             t_i = J_y^-T G_y,i'
//        bounds on d,
//
// B_r a quasi-Newton approximation of the reduced Hessian Z'WZ (Z = [I; -J_y^-1 J_d]) updated
// with the pair (sd, Z'y). The multipliers of the equalities follow from stationarity in y:
// lambda = -(w + sum_i mu_i t_i), with no further solve. The dense work is on the design
// variables alone; the states cost one factorization of J_y per iterate and one solve per
// screened row that depends on them (the row's adjoint), which is the price of a nested
// sensitivity analysis. Incompatible inequality rows are relaxed as in the full QP (elastic
// variable at index nD); the equalities stay exact, since the range step always satisfies them.
import { type QpInput, type QpOutput, qpKey, solveQp } from "./dual-qp";
import { elasticHessian } from "./elastic";
import type { HessianApprox } from "./hessian";
import type { QpRow } from "./rows";
import type { ScaledDerivatives, ScaledProblem } from "./scaled-problem";
import type { StateEquations } from "./types";

/** Solves with the scaled state Jacobian J_y,s = E J_y D_y (E row scales, D_y state scales). */
export interface ScaledStateFactor {
  solve(r: Float64Array): Float64Array;
  solveTransposed(r: Float64Array): Float64Array;
}

export function scaledStateFactor(sp: ScaledProblem, se: StateEquations, xs: Float64Array): ScaledStateFactor {
  const nD = se.nDesign;
  const nY = sp.nEq;
  const f = se.factor(sp.toUser(xs));
  const E = sp.eqScale;
  const d = sp.d;
  return {
    solve(r) {
      const t = new Float64Array(nY);
      for (let i = 0; i < nY; i++) t[i] = r[i] / E[i];
      const u = f.solve(t);
      for (let k = 0; k < nY; k++) t[k] = u[k] / d[nD + k];
      return t;
    },
    solveTransposed(r) {
      const t = new Float64Array(nY);
      for (let k = 0; k < nY; k++) t[k] = r[k] / d[nD + k];
      const u = f.solveTransposed(t);
      for (let i = 0; i < nY; i++) t[i] = u[i] / E[i];
      return t;
    },
  };
}

/** Checks the declared structure against the problem; a sentence naming the fault, or null. */
export function checkStateEquations(se: StateEquations, n: number, nEq: number, lower: Float64Array, upper: Float64Array, name: (j: number) => string): string | null {
  if (!Number.isInteger(se.nDesign) || se.nDesign < 0 || n - se.nDesign !== nEq)
    return `stateEquations.nDesign = ${se.nDesign} does not leave one state variable per equality (n = ${n}, nEq = ${nEq}).`;
  for (let j = se.nDesign; j < n; j++)
    if (Number.isFinite(lower[j]) || Number.isFinite(upper[j])) return `The state variable ${name(j)} has a bound; state variables must be unbounded.`;
  return null;
}

export interface ReducedQpInput {
  nDesign: number;
  n: number;
  factor: ScaledStateFactor;
  dv: ScaledDerivatives;
  ce: Float64Array;
  ci: Float64Array;
  rowsIn: Int32Array;
  /** quasi-Newton approximation of the reduced Hessian (dimension nDesign) */
  B: HessianApprox;
  lowerStep: Float64Array; // lo - x over the design variables
  upperStep: Float64Array;
  warmIneq: Uint8Array; // by full inequality row index
  warmLower: Uint8Array; // by variable
  warmUpper: Uint8Array;
  elastic: boolean;
}

/** J_d' t over the design columns of the equality rows. */
export function designTransposeTimes(je: QpRow[], t: Float64Array, nD: number): Float64Array {
  const out = new Float64Array(nD);
  for (let i = 0; i < je.length; i++) {
    const ti = t[i];
    if (ti === 0) continue;
    const { idx, val } = je[i];
    if (idx === null) for (let c = 0; c < nD; c++) out[c] += ti * val[c];
    else for (let k = 0; k < idx.length; k++) if (idx[k] < nD) out[idx[k]] += ti * val[k];
  }
  return out;
}

function designTimes(je: QpRow[], v: Float64Array, nD: number): Float64Array {
  const out = new Float64Array(je.length);
  for (let i = 0; i < je.length; i++) {
    const { idx, val } = je[i];
    let s = 0;
    if (idx === null) for (let c = 0; c < nD; c++) s += val[c] * v[c];
    else for (let k = 0; k < idx.length; k++) if (idx[k] < nD) s += val[k] * v[idx[k]];
    out[i] = s;
  }
  return out;
}

/** The state part of a row as a dense vector of length nY, or null when it has none. */
function statePart(r: QpRow, nD: number, nY: number): Float64Array | null {
  const { idx, val } = r;
  let out: Float64Array | null = null;
  if (idx === null) {
    for (let c = nD; c < nD + nY; c++) if (val[c] !== 0) (out ??= new Float64Array(nY))[c - nD] = val[c];
  } else {
    for (let k = 0; k < idx.length; k++) if (idx[k] >= nD) (out ??= new Float64Array(nY))[idx[k] - nD] += val[k];
  }
  return out;
}

function designPart(r: QpRow, nD: number): Float64Array {
  const out = new Float64Array(nD);
  const { idx, val } = r;
  if (idx === null) out.set(val.subarray(0, nD));
  else for (let k = 0; k < idx.length; k++) if (idx[k] < nD) out[idx[k]] += val[k];
  return out;
}

/**
 * The subproblem in the null space of the linearized state equations, returned in the shape
 * of a full-space QP solution (step over all n variables, multipliers of every row).
 */
export function solveReducedQp(q: ReducedQpInput): QpOutput {
  const { nDesign: nD, n, factor, dv, ce, ci, rowsIn, B, elastic } = q;
  const nY = n - nD;
  const gy = dv.g.subarray(nD, n);
  const p = factor.solve(Float64Array.from(ce, (v) => -v));
  const w = factor.solveTransposed(Float64Array.from(gy));
  const gr = designTransposeTimes(dv.je, w, nD);
  for (let j = 0; j < nD; j++) gr[j] = dv.g[j] - gr[j];

  // reduced inequality rows: one adjoint solve per row that depends on the states
  const adjoints: (Float64Array | null)[] = [];
  const stateParts: (Float64Array | null)[] = []; // G_y,i, kept for the correction solve
  const shifts = new Float64Array(rowsIn.length); // G_y,i p
  const rows: QpRow[] = [];
  const rhs = new Float64Array(rowsIn.length);
  rowsIn.forEach((i, k) => {
    const r = dv.ji[i] as QpRow;
    const gyRow = statePart(r, nD, nY);
    stateParts.push(gyRow);
    const red = designPart(r, nD);
    let t: Float64Array | null = null;
    if (gyRow) {
      t = factor.solveTransposed(gyRow);
      const jt = designTransposeTimes(dv.je, t, nD);
      for (let j = 0; j < nD; j++) red[j] -= jt[j];
      let sh = 0;
      for (let c = 0; c < nY; c++) sh += gyRow[c] * p[c];
      shifts[k] = sh;
    }
    adjoints.push(t);
    const value = ci[i] + shifts[k];
    rows.push({ idx: null, val: red, extra: elastic && value > 0 ? -value : 0 });
    rhs[k] = -value;
  });

  const dim = elastic ? nD + 1 : nD;
  const g = new Float64Array(dim);
  g.set(gr);
  const lower = new Float64Array(dim);
  const upper = new Float64Array(dim);
  lower.set(q.lowerStep);
  upper.set(q.upperStep);
  if (elastic) upper[nD] = 1;
  const warm: number[] = [];
  rowsIn.forEach((i, k) => { if (q.warmIneq[i]) warm.push(qpKey("ineq", k, 0, rowsIn.length, dim)); });
  for (let j = 0; j < nD; j++) {
    if (q.warmLower[j]) warm.push(qpKey("lower", j, 0, rowsIn.length, dim));
    if (q.warmUpper[j]) warm.push(qpKey("upper", j, 0, rowsIn.length, dim));
  }
  const input: QpInput = {
    dim, base: nD, hessian: elastic ? elasticHessian(B, nD) : B, g, eq: [], eqRhs: new Float64Array(0),
    ineq: rows, ineqRhs: rhs, lower, upper, warm,
  };
  const qr = solveQp(input);

  /** full step from a design step and a range step */
  const lift = (sd: Float64Array, range: Float64Array): Float64Array => {
    const s = new Float64Array(elastic ? n + 1 : n);
    s.set(sd.subarray(0, nD));
    const sy = factor.solve(designTimes(dv.je, sd, nD));
    for (let k = 0; k < nY; k++) s[nD + k] = range[k] - sy[k];
    if (elastic) s[n] = sd[nD];
    return s;
  };

  const lambda = Float64Array.from(w, (v) => -v);
  rowsIn.forEach((_, k) => {
    const t = adjoints[k];
    const mu = qr.ineq[k];
    if (t && mu !== 0) for (let c = 0; c < nY; c++) lambda[c] -= mu * t[c];
  });
  const full = (a: Float64Array) => {
    const out = new Float64Array(elastic ? n + 1 : n);
    out.set(a.subarray(0, nD));
    if (elastic) out[n] = a[nD];
    return out;
  };

  return {
    status: qr.status,
    s: lift(qr.s, p),
    eq: lambda,
    ineq: qr.ineq,
    lower: full(qr.lower),
    upper: full(qr.upper),
    active: qr.active,
    iterations: qr.iterations,
    resolve(eqRhs, ineqRhs) {
      const p2 = factor.solve(eqRhs);
      const red = new Float64Array(rowsIn.length);
      rowsIn.forEach((_, k) => {
        const gyRow = stateParts[k];
        let sh = 0;
        if (gyRow) for (let c = 0; c < nY; c++) sh += gyRow[c] * p2[c];
        red[k] = ineqRhs[k] - sh;
      });
      const sd = qr.resolve(new Float64Array(0), red);
      return lift(sd, p2).subarray(0, n);
    },
  };
}

/** Z'v = v_d - J_d' J_y^-T v_y: a full-space gradient difference seen in the design space. */
export function reduceVector(factor: ScaledStateFactor, je: QpRow[], v: Float64Array, nD: number, n: number): Float64Array {
  const t = factor.solveTransposed(Float64Array.from(v.subarray(nD, n)));
  const jt = designTransposeTimes(je, t, nD);
  const out = new Float64Array(nD);
  for (let j = 0; j < nD; j++) out[j] = v[j] - jt[j];
  return out;
}
