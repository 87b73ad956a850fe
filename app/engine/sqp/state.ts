// The SQP driver's data: what is fixed for a run (SqpContext) and what one iteration changes
// (SqpState), plus the small vector helpers the driver's parts share.
import type { HessianApprox } from "./hessian";
import type { ScaledStateFactor } from "./reduced-space";
import type { QpRow } from "./rows";
import type { ScaledDerivatives, ScaledPoint, ScaledProblem } from "./scaled-problem";
import type { SqpHistoryEntry, SqpOptions, SqpProblem, StateEquations } from "./types";

/** Multipliers of one QP solve, mapped to full row indices. */
export interface Multipliers {
  eq: Float64Array;
  ineq: Float64Array;
  lower: Float64Array;
  upper: Float64Array;
}

/** An iterate worth returning: the best feasible one, or the least violating. */
export interface Snapshot {
  x: Float64Array;
  pt: ScaledPoint;
  mult: Multipliers;
  kkt: number;
  viol: number;
}

/** The three parts of the KKT measure (termination.ts). */
export interface KktParts {
  stat: number;
  compl: number;
  feas: number;
}

export interface SqpContext {
  problem: SqpProblem;
  options: SqpOptions;
  sp: ScaledProblem;
  n: number;
  nEq: number;
  nIneq: number;
  /** Variables the quasi-Newton matrix covers: the design part with state equations, else n. */
  nB: number;
  tol: number;
  maxIter: number;
  screening: number;
  /** Scaled bounds. */
  lo: Float64Array;
  hi: Float64Array;
  B: HessianApprox;
  stateEq: StateEquations | null;
  history: SqpHistoryEntry[];
  started: number;
  /** Projects a scaled point into the bounds in place. */
  clip(v: Float64Array): void;
  /** With declared state equations: trial points get their states re-solved (restoration.ts). */
  restoreStates: boolean;
  /**
   * The state Jacobian's factor at xs (made once per point), or a sentence why it failed;
   * `trial` for a line-search point, whose factor is kept beside the iterate's.
   */
  stateFactorAt(xs: Float64Array, trial?: boolean): ScaledStateFactor | string;
}

export interface SqpState {
  x: Float64Array;
  pt: ScaledPoint;
  dv: ScaledDerivatives;
  mult: Multipliers;
  kkt: number;
  kktParts: KktParts;
  /** l1 penalty parameter of the merit function. */
  rho: number;
  best: Snapshot;
  leastViolating: Snapshot;
  /** Inequality rows linearized in the subproblem. */
  inScreen: Uint8Array;
  /** Working set carried between QPs (by meaning, since the screened rows change). */
  warmIneq: Uint8Array;
  warmLower: Uint8Array;
  warmUpper: Uint8Array;
  iteration: number;
  /** Step length accepted last. */
  lastStep: number;
  elasticRun: number;
  wasElastic: boolean;
  elasticStuck: number;
  elasticStartViol: number;
  updatesSinceReset: number;
  /** The KKT measures of the last few iterations (termination.ts, the noise floor's stall test). */
  kktTrail: number[];
}

export function emptyMultipliers(n: number, nEq: number, nIneq: number): Multipliers {
  return { eq: new Float64Array(nEq), ineq: new Float64Array(nIneq), lower: new Float64Array(n), upper: new Float64Array(n) };
}

export function l1Violation(pt: ScaledPoint): number {
  let v = 0;
  for (let i = 0; i < pt.ce.length; i++) v += Math.abs(pt.ce[i]);
  for (let i = 0; i < pt.ci.length; i++) if (pt.ci[i] > 0) v += pt.ci[i];
  return v;
}

export function maxViolation(ce: Float64Array, ci: Float64Array): number {
  let v = 0;
  for (let i = 0; i < ce.length; i++) v = Math.max(v, Math.abs(ce[i]));
  for (let i = 0; i < ci.length; i++) v = Math.max(v, ci[i]);
  return v;
}

export function maxAbsMultiplier(m: Multipliers): number {
  let v = 0;
  for (const a of [m.eq, m.ineq, m.lower, m.upper]) for (let i = 0; i < a.length; i++) v = Math.max(v, Math.abs(a[i]));
  return v;
}

export function maxAbsVec(v: Float64Array): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) m = Math.max(m, Math.abs(v[i]));
  return m;
}

/** out += alpha * r */
export function axpyRow(r: QpRow, alpha: number, out: Float64Array): void {
  if (r.idx === null) for (let k = 0; k < r.val.length; k++) out[k] += alpha * r.val[k];
  else for (let k = 0; k < r.idx.length; k++) out[r.idx[k]] += alpha * r.val[k];
}

export function abortError(): Error {
  const e = new Error("The optimization was cancelled.");
  e.name = "AbortError";
  return e;
}

export function throwIfAborted(ctx: SqpContext): void {
  if (ctx.options.signal?.aborted) throw abortError();
}

/** Keeps the best feasible and the least violating iterate. */
export function considerSnapshot(ctx: SqpContext, state: SqpState, snap: Snapshot): void {
  const tol = ctx.tol;
  if (snap.viol <= tol ? !(state.best.viol <= tol) || snap.pt.f < state.best.pt.f : !(state.best.viol <= tol) && snap.viol < state.best.viol) state.best = snap;
  if (snap.viol < state.leastViolating.viol) state.leastViolating = snap;
}
