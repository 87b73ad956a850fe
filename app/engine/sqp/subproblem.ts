// The quadratic subproblem at the iterate x (scaled):
//   min 1/2 s'Bs + g's  s.t.  c_E + J_E s = 0,  c_I + J_I s <= 0 (screened rows),
//   lower - x <= s <= upper - x,
// solved by the dual active-set method (dual-qp.ts), warm-started from the previous active set;
// with state equations its null-space form over the design variables (reduced-space.ts). If the
// linearization is incompatible, the elastic subproblem relaxes every violated row by a common
// factor (1 - xi), 0 <= xi <= 1, xi penalized heavily (elastic.ts) — always feasible, and it
// steers toward least violation. The screen: inequality rows within options.screening of
// active, plus those active in the last subproblem.
import { type QpHessian, type QpInput, type QpOutput, qpKey, solveQp } from "./dual-qp";
import { elasticHessian } from "./elastic";
import { solveReducedQp } from "./reduced-space";
import { type QpRow, rowDot } from "./rows";
import type { ScaledPoint } from "./scaled-problem";
import { type Multipliers, type SqpContext, type SqpState, emptyMultipliers } from "./state";

export function screenedRows(state: SqpState): Int32Array {
  const inScreen = state.inScreen;
  let c = 0;
  for (let i = 0; i < inScreen.length; i++) if (inScreen[i]) c++;
  const out = new Int32Array(c);
  c = 0;
  for (let i = 0; i < inScreen.length; i++) if (inScreen[i]) out[c++] = i;
  return out;
}

/** The screen at p: rows near activity, and those with a nonzero multiplier in keep. */
export function rescreen(ctx: SqpContext, state: SqpState, p: ScaledPoint, keep: Float64Array | null): void {
  for (let i = 0; i < ctx.nIneq; i++) state.inScreen[i] = p.ci[i] > -ctx.screening || (keep !== null && keep[i] !== 0) ? 1 : 0;
}

/** Keeps the active set (by row and variable, since the screened rows change) for the next warm start. */
export function rememberActive(ctx: SqpContext, state: SqpState, m: Multipliers): void {
  const { n, nIneq } = ctx;
  state.warmIneq = new Uint8Array(nIneq);
  state.warmLower = new Uint8Array(n);
  state.warmUpper = new Uint8Array(n);
  for (let i = 0; i < nIneq; i++) if (m.ineq[i] > 0) state.warmIneq[i] = 1;
  for (let j = 0; j < n; j++) {
    if (m.lower[j] > 0) state.warmLower[j] = 1;
    if (m.upper[j] > 0) state.warmUpper[j] = 1;
  }
}

function buildQp(ctx: SqpContext, state: SqpState, rowsIn: Int32Array, elastic: boolean): QpInput {
  const { n, nEq, lo, hi, B } = ctx;
  const { x, pt, dv } = state;
  const dim = elastic ? n + 1 : n;
  const g = new Float64Array(dim);
  g.set(dv.g);
  const eq: QpRow[] = [];
  const eqRhs = new Float64Array(nEq);
  for (let i = 0; i < nEq; i++) {
    const r = dv.je[i];
    eq.push(elastic ? { idx: r.idx, val: r.val, extra: -pt.ce[i] } : r);
    eqRhs[i] = -pt.ce[i];
  }
  const ineq: QpRow[] = [];
  const ineqRhs = new Float64Array(rowsIn.length);
  rowsIn.forEach((i, k) => {
    const r = dv.ji[i] as QpRow;
    ineq.push(elastic && pt.ci[i] > 0 ? { idx: r.idx, val: r.val, extra: -pt.ci[i] } : r);
    ineqRhs[k] = -pt.ci[i];
  });
  const lower = new Float64Array(dim);
  const upper = new Float64Array(dim);
  for (let j = 0; j < n; j++) {
    lower[j] = lo[j] - x[j];
    upper[j] = hi[j] - x[j];
  }
  if (elastic) {
    lower[n] = 0;
    upper[n] = 1;
  }
  const warm: number[] = [];
  rowsIn.forEach((i, k) => { if (state.warmIneq[i]) warm.push(qpKey("ineq", k, nEq, rowsIn.length, dim)); });
  for (let j = 0; j < n; j++) {
    if (state.warmLower[j]) warm.push(qpKey("lower", j, nEq, rowsIn.length, dim));
    if (state.warmUpper[j]) warm.push(qpKey("upper", j, nEq, rowsIn.length, dim));
  }
  const hessian: QpHessian = elastic ? elasticHessian(B, n) : B;
  return { dim, base: n, hessian, g, eq, eqRhs, ineq, ineqRhs, lower, upper, warm };
}

/** The subproblem at x: the full QP, or its null-space form with state equations; a sentence when the state factor failed. */
export function solveSubproblem(ctx: SqpContext, state: SqpState, rowsIn: Int32Array, elastic: boolean): QpOutput | string {
  const { stateEq, nB, n, lo, hi, B } = ctx;
  const { x, pt, dv } = state;
  if (!stateEq) return solveQp(buildQp(ctx, state, rowsIn, elastic));
  const factor = ctx.stateFactorAt(x);
  if (typeof factor === "string") return factor;
  const lowerStep = new Float64Array(nB);
  const upperStep = new Float64Array(nB);
  for (let j = 0; j < nB; j++) {
    lowerStep[j] = lo[j] - x[j];
    upperStep[j] = hi[j] - x[j];
  }
  return solveReducedQp({
    nDesign: nB, n, factor, dv, ce: pt.ce, ci: pt.ci, rowsIn, B, lowerStep, upperStep,
    warmIneq: state.warmIneq, warmLower: state.warmLower, warmUpper: state.warmUpper, elastic,
  });
}

/** The subproblem, relaxed when its linearization is incompatible. */
export function solveCompatibleSubproblem(ctx: SqpContext, state: SqpState, rowsIn: Int32Array): { qp: QpOutput; elastic: boolean } | string {
  const solved = solveSubproblem(ctx, state, rowsIn, false);
  if (typeof solved === "string" || solved.status !== "infeasible") return typeof solved === "string" ? solved : { qp: solved, elastic: false };
  const relaxed = solveSubproblem(ctx, state, rowsIn, true);
  return typeof relaxed === "string" ? relaxed : { qp: relaxed, elastic: true };
}

export function qpMultipliers(ctx: SqpContext, qp: QpOutput, rowsIn: Int32Array): Multipliers {
  const { n, nEq, nIneq } = ctx;
  const m = emptyMultipliers(n, nEq, nIneq);
  m.eq.set(qp.eq);
  rowsIn.forEach((i, k) => { m.ineq[i] = qp.ineq[k]; });
  m.lower.set(qp.lower.subarray(0, n));
  m.upper.set(qp.upper.subarray(0, n));
  return m;
}

/** Sum of |c_E + J_E s| + max(0, c_I + J_I s) over the screened rows (linearized l1 violation). */
export function linearizedViolation(ctx: SqpContext, state: SqpState, s: Float64Array, rowsIn: Int32Array): number {
  const { n, nEq } = ctx;
  const { pt, dv } = state;
  let v = 0;
  for (let i = 0; i < nEq; i++) v += Math.abs(pt.ce[i] + rowDot(dv.je[i], s, n));
  for (const i of rowsIn) v += Math.max(0, pt.ci[i] + rowDot(dv.ji[i] as QpRow, s, n));
  return v;
}
