// The l1 exact-penalty merit phi = f + rho * (sum |c_E| + sum max(0, c_I)) and its line search.
// rho follows Powell's rule rho = max(rho_req, (rho + rho_req)/2) with rho_req the larger of
// 1.1 * max |lambda| and the value making the step a descent direction. Backtracking: Armijo
// (1e-4 times the directional derivative of phi) with safeguarded quadratic interpolation; if the
// full step is rejected, one second-order correction (same QP with the constraint values at
// x + s) fights the Maratos effect. Every trial point is clipped into the bounds.
import { dot } from "./hessian";
import type { QpOutput } from "./dual-qp";
import { type QpRow, rowDot } from "./rows";
import type { ScaledPoint } from "./scaled-problem";
import { type SqpContext, type SqpState, l1Violation, maxAbsMultiplier, maxAbsVec, throwIfAborted } from "./state";
import { linearizedViolation } from "./subproblem";
import { evaluateTrial } from "./restoration";
import {
  ARMIJO, BACKTRACK_HIGH, BACKTRACK_LOW, BELOW_NOISE_FACTOR, DESCENT_SHARE, FEASIBLE_NOISE, MERIT_NOISE, MIN_STEP_LENGTH,
  MIN_STEP_NORM, NON_FINITE_SHRINK, PENALTY_FLOOR, PENALTY_MARGIN, VIOLATION_REDUCTION_SHARE,
} from "./thresholds";

/** The merit's directional derivative D along the step and its value phi0 and violation viol0 at x. */
export interface MeritStep {
  D: number;
  phi0: number;
  viol0: number;
}

/** B s over the variables B covers (the design part in reduced space), zero elsewhere. */
function modelHessianTimes(ctx: SqpContext, v: Float64Array): Float64Array {
  const { n, nB, B } = ctx;
  const out = new Float64Array(n);
  const o = new Float64Array(nB);
  B.applyB(Float64Array.from(v.subarray(0, nB)), o);
  out.set(o);
  return out;
}

/** Updates the penalty parameter for step s and returns the merit's slope along it. */
export function meritStep(ctx: SqpContext, state: SqpState, s: Float64Array, rowsIn: Int32Array, elastic: boolean): MeritStep {
  const { n, tol } = ctx;
  const { pt, dv } = state;
  const viol0 = l1Violation(pt);
  const linViol = linearizedViolation(ctx, state, s, rowsIn);
  const bs = modelHessianTimes(ctx, s);
  const gs = dot(dv.g, s, n);
  const sBs = dot(s, bs, n);
  // elastic multipliers carry the relaxation weight, not the problem's prices: only the
  // descent requirement below sets the penalty then
  // with restored states every trial point meets the state equations, so their multipliers
  // (the adjoints, often far larger than any limit's) need no weight in the merit (restoration.ts)
  let rhoReq = elastic ? 0 : PENALTY_MARGIN * maxAbsMultiplier(ctx.restoreStates ? { ...state.mult, eq: new Float64Array(0) } : state.mult);
  const reduction = viol0 - linViol;
  // the descent requirement only where the violation is more than noise: dividing by a
  // rounding-level reduction would blow the penalty up and freeze the iterates
  if (viol0 > tol && reduction > VIOLATION_REDUCTION_SHARE * viol0) rhoReq = Math.max(rhoReq, (gs + 0.5 * sBs) / (DESCENT_SHARE * reduction));
  state.rho = state.wasElastic && !elastic ? Math.max(rhoReq, PENALTY_FLOOR) : Math.max(rhoReq, 0.5 * (state.rho + rhoReq), PENALTY_FLOOR);
  const D = gs + state.rho * (linViol - viol0);
  return { D, phi0: pt.f + state.rho * viol0, viol0 };
}

/** x + alpha s, clipped into the bounds. */
export function trialPoint(ctx: SqpContext, x: Float64Array, s: Float64Array, alpha: number): Float64Array {
  const xt = Float64Array.from(x);
  for (let j = 0; j < ctx.n; j++) xt[j] += alpha * s[j];
  ctx.clip(xt);
  return xt;
}

export interface AcceptedStep {
  x: Float64Array;
  pt: ScaledPoint;
  alpha: number;
}

/** The full step's trial point, evaluated once before the line search (it also widens the screen). */
export interface FullTrial {
  x: Float64Array;
  /** null when the functions gave no finite value there */
  pt: ScaledPoint | null;
}

/**
 * Backtracking on the merit from the full step. Returns the accepted point, null when no step
 * length gave sufficient decrease, or a sentence when the functions failed at every trial.
 */
export function lineSearch(
  ctx: SqpContext, state: SqpState, s: Float64Array, info: MeritStep, full: FullTrial | null, rowsIn: Int32Array, qp: QpOutput, elastic: boolean,
): AcceptedStep | null | string {
  const { sp, nEq } = ctx;
  const { pt, x } = state;
  const rho = state.rho;
  if (!(info.D < 0 && maxAbsVec(s) > MIN_STEP_NORM)) return null;
  let alpha = 1;
  let trial = full?.pt ?? null;
  let xt = full ? full.x : trialPoint(ctx, x, s, 1);
  let nonFinite: string | null = trial === null ? "pending" : null;
  if (nonFinite) {
    const ev = evaluateTrial(ctx, xt);
    nonFinite = ev.ok ? null : ev.message;
    trial = ev.ok ? ev.value : null;
  }
  let triedSoc = false;
  while (alpha > MIN_STEP_LENGTH) {
    if (trial) {
      const phi = trial.f + rho * l1Violation(trial);
      // near the solution the predicted decrease can fall below the rounding noise of phi
      // itself; then a step that does not visibly increase phi is taken as is
      const noise = MERIT_NOISE * (1 + Math.abs(info.phi0));
      const belowNoise = -info.D <= BELOW_NOISE_FACTOR * noise && phi <= info.phi0 + noise;
      // both points feasible to rounding: the penalty term is noise times rho (large when
      // some multiplier is), so the objective alone decides
      const violTrial = l1Violation(trial);
      const roundingFeasible = info.viol0 <= FEASIBLE_NOISE && violTrial <= FEASIBLE_NOISE;
      const objectiveDecides = roundingFeasible && trial.f <= pt.f + ARMIJO * alpha * info.D + MERIT_NOISE * (1 + Math.abs(pt.f));
      if (phi <= info.phi0 + ARMIJO * alpha * info.D || belowNoise || objectiveDecides) return { x: xt, pt: trial, alpha };
      if (alpha === 1 && !triedSoc && !elastic && (nEq > 0 || rowsIn.length > 0)) {
        triedSoc = true;
        const soc = secondOrderCorrection(ctx, state, trial, s, rowsIn, qp, info);
        if (soc) return soc;
      }
      const denom = 2 * (phi - info.phi0 - alpha * info.D);
      const interp = denom > 0 ? (-info.D * alpha * alpha) / denom : 0.5 * alpha;
      alpha = Math.min(BACKTRACK_HIGH * alpha, Math.max(BACKTRACK_LOW * alpha, interp));
    } else {
      alpha *= NON_FINITE_SHRINK;
    }
    xt = trialPoint(ctx, x, s, alpha);
    throwIfAborted(ctx);
    const ev = evaluateTrial(ctx, xt);
    if (ev.ok) {
      trial = ev.value;
      nonFinite = null;
    } else {
      trial = null;
      nonFinite = ev.message;
    }
  }
  return nonFinite && nonFinite !== "pending" ? nonFinite : null;
}

/** Second-order correction: the last QP's active set and factors, constraint values taken at x + s. */
function secondOrderCorrection(ctx: SqpContext, state: SqpState, trial: ScaledPoint, s: Float64Array, rowsIn: Int32Array, qp: QpOutput, info: MeritStep): AcceptedStep | null {
  const { n, nEq, nIneq, sp } = ctx;
  const { dv, x } = state;
  const ce = new Float64Array(nEq);
  const ci = new Float64Array(nIneq);
  for (let i = 0; i < nEq; i++) ce[i] = trial.ce[i] - rowDot(dv.je[i], s, n);
  for (const i of rowsIn) ci[i] = trial.ci[i] - rowDot(dv.ji[i] as QpRow, s, n);
  const ciRows = Float64Array.from(rowsIn, (i) => -ci[i]);
  const s2 = qp.resolve(Float64Array.from(ce, (v) => -v), ciRows);
  for (let j = 0; j < n; j++) if (!Number.isFinite(s2[j])) return null;
  const xt = trialPoint(ctx, x, s2, 1);
  throwIfAborted(ctx);
  const ev = evaluateTrial(ctx, xt);
  if (!ev.ok) return null;
  const phi = ev.value.f + state.rho * l1Violation(ev.value);
  return phi <= info.phi0 + ARMIJO * info.D ? { x: xt, pt: ev.value, alpha: 1 } : null;
}
