// When the SQP driver stops (tol = options.tolerance, all scaled):
//   stationarity     ||g + J_E'l_E + J_I'l_I - nu_lower + nu_upper||inf <= tol
//   feasibility      max(|c_E|, max(0, c_I)) over EVERY row <= tol
//   complementarity  max(|l_i c_i|, nu_j * distance to bound j) <= tol
// (stationarity divided by max(1, mean |multiplier| / 100): with huge multipliers the residual
// carries their rounding, the measure interior-point codes use.) The KKT measure is the largest
// of the three; "optimal" only when all three hold at the returned point, which then satisfies
// all rows to tol (scaled) — never at a violating point. Also optimal: at the noise floor
// (atNoiseFloor), where feasibility and complementarity hold to tol, stationarity to sqrt(tol),
// the step's predicted merit decrease is below NOISE_FLOOR_DECREASE x (1 + |merit|), so no
// line search can verify progress, and the KKT measure has stopped falling (kktStuck). That happens when the gradient carries noise no step
// removes (finite differences of a large value: tests/engine/sqp/noise-floor.test.ts, which
// also shows the rule staying silent on a slowly converging degenerate minimum whose predicted
// decrease stays measurable); the message then says "to the precision rounding allows".
// Other ends: iteration or time limit, a stop request -> "not-converged" with the best point;
// elastic mode that can no longer reduce the violation -> "infeasible".
import type { StopReason } from "./messages";
import type { ScaledDerivatives, ScaledPoint } from "./scaled-problem";
import { type KktParts, type Multipliers, type SqpContext, type SqpState, axpyRow, maxViolation } from "./state";
import {
  ELASTIC_FULL_RELAXATION, ELASTIC_STALL_RATIO, ELASTIC_STALL_WINDOW, ELASTIC_STUCK_ITERATIONS, NOISE_FLOOR_DECREASE, NOISE_FLOOR_FALL, NOISE_FLOOR_WINDOW,
  STATIONARITY_MULTIPLIER_SCALE,
} from "./thresholds";

/** The KKT measure at (p, d) with multipliers m, and its three parts. */
export function kktMeasure(ctx: SqpContext, p: ScaledPoint, d: ScaledDerivatives, m: Multipliers, xs: Float64Array): { value: number; parts: KktParts } {
  const { n, nEq, nIneq, lo, hi } = ctx;
  const r = Float64Array.from(d.g);
  for (let i = 0; i < nEq; i++) if (m.eq[i] !== 0) axpyRow(d.je[i], m.eq[i], r);
  for (let i = 0; i < nIneq; i++) if (m.ineq[i] !== 0) {
    const row = d.ji[i];
    if (row) axpyRow(row, m.ineq[i], r);
  }
  let stat = 0;
  let compl = 0;
  for (let j = 0; j < n; j++) {
    stat = Math.max(stat, Math.abs(r[j] - m.lower[j] + m.upper[j]));
    if (m.lower[j] > 0) compl = Math.max(compl, m.lower[j] * (xs[j] - lo[j]));
    if (m.upper[j] > 0) compl = Math.max(compl, m.upper[j] * (hi[j] - xs[j]));
  }
  for (let i = 0; i < nIneq; i++) if (m.ineq[i] !== 0) compl = Math.max(compl, Math.abs(m.ineq[i] * p.ci[i]));
  // stationarity relative to the multipliers' size, as interior-point codes measure it:
  // divided by max(1, mean |multiplier| / 100), since with multipliers of 1e7 the residual
  // of g + J'l carries their rounding (IPOPT's s_d, Waechter & Biegler 2006)
  let mSum = 0;
  for (const a of [m.eq, m.ineq, m.lower, m.upper]) for (let i = 0; i < a.length; i++) mSum += Math.abs(a[i]);
  stat /= Math.max(1, mSum / (nEq + nIneq + 2 * n) / STATIONARITY_MULTIPLIER_SCALE);
  const feas = maxViolation(p.ce, p.ci);
  return { value: Math.max(stat, compl, feas), parts: { stat, compl, feas } };
}

/** Sets the state's multipliers and KKT measure. */
export function setMultipliers(ctx: SqpContext, state: SqpState, m: Multipliers): void {
  const k = kktMeasure(ctx, state.pt, state.dv, m, state.x);
  state.mult = m;
  state.kkt = k.value;
  state.kktParts = k.parts;
}

/**
 * Converged to the precision rounding allows: feasible and complementary to tol, stationary
 * to sqrt(tol), and the step's predicted merit decrease D below the rounding noise of the merit
 * value phi0 (no line search could then verify progress).
 */
export function atNoiseFloor(ctx: SqpContext, state: SqpState, D: number, phi0: number): boolean {
  const { tol } = ctx;
  const parts = state.kktParts;
  return parts.feas <= tol && parts.compl <= tol && parts.stat <= Math.sqrt(tol) && -D <= NOISE_FLOOR_DECREASE * (1 + Math.abs(phi0)) && kktStuck(state);
}

/**
 * The KKT measure has not fallen by NOISE_FLOOR_FALL over the last NOISE_FLOOR_WINDOW
 * iterations: a floor, not a run that is still converging (which would meet the ordinary test
 * an iteration or two later, even where its predicted decrease is already below the merit's
 * rounding, as on a problem whose objective carries a large constant).
 */
function kktStuck(state: SqpState): boolean {
  const trail = state.kktTrail;
  if (trail.length < NOISE_FLOOR_WINDOW) return false;
  return state.kkt > NOISE_FLOOR_FALL * trail[trail.length - NOISE_FLOOR_WINDOW];
}

/** Keeps this iteration's KKT measure for the stall test of the noise floor. */
export function recordKkt(state: SqpState): void {
  state.kktTrail.push(state.kkt);
  if (state.kktTrail.length > NOISE_FLOOR_WINDOW) state.kktTrail.shift();
}

export function timeUp(ctx: SqpContext): boolean {
  return ctx.options.timeLimitMs !== undefined && performance.now() - ctx.started > ctx.options.timeLimitMs;
}

/** Converged, or out of iterations, time or the caller's patience: no line search this iteration. */
export function shouldStopBeforeStep(ctx: SqpContext, state: SqpState): boolean {
  return state.kkt <= ctx.tol || state.iteration >= ctx.maxIter || timeUp(ctx) || (ctx.options.stopRequested?.() ?? false);
}

/** The reason to stop after this iteration's subproblem, or null to go on. `step` is the merit step's D and phi0 when computed. */
export function stopReason(ctx: SqpContext, state: SqpState, step: { D: number; phi0: number } | null, elastic: boolean): { reason: StopReason; atBest: boolean } | null {
  const { tol, options } = ctx;
  const { pt, iteration, best } = state;
  if (state.kkt <= tol) return { reason: { kind: "optimal", tolerance: tol, maxViolation: maxViolation(pt.eqRaw, pt.ineqRaw), iterations: iteration }, atBest: false };
  if (step && !elastic && atNoiseFloor(ctx, state, step.D, step.phi0))
    return { reason: { kind: "optimal", tolerance: tol, maxViolation: maxViolation(pt.eqRaw, pt.ineqRaw), iterations: iteration, stationarity: state.kktParts.stat }, atBest: false };
  if (iteration >= ctx.maxIter) return { reason: { kind: "iteration-limit", iterations: iteration, feasible: best.viol <= tol }, atBest: true };
  if (timeUp(ctx)) return { reason: { kind: "time-limit", iterations: iteration, limitMs: options.timeLimitMs ?? 0, feasible: best.viol <= tol }, atBest: true };
  if (options.stopRequested?.()) return { reason: { kind: "stopped", iterations: iteration, feasible: best.viol <= tol }, atBest: true };
  return null;
}

/**
 * Infeasibility detection in elastic mode: fully relaxed several iterations in a row, or no
 * visible fall of the violation over a window of elastic iterations. Updates the counters.
 */
export function elasticShowsInfeasible(state: SqpState, elastic: boolean, relaxation: number, violNow: number): boolean {
  if (elastic) {
    if (state.elasticRun === 0) state.elasticStartViol = violNow;
    state.elasticRun++;
    state.elasticStuck = relaxation > ELASTIC_FULL_RELAXATION ? state.elasticStuck + 1 : 0;
    const stalled = state.elasticRun >= ELASTIC_STALL_WINDOW && violNow > ELASTIC_STALL_RATIO * state.elasticStartViol;
    if (state.elasticStuck >= ELASTIC_STUCK_ITERATIONS || stalled) return true;
    if (state.elasticRun % ELASTIC_STALL_WINDOW === 0) state.elasticStartViol = violNow;
  } else {
    state.elasticRun = 0;
    state.elasticStuck = 0;
  }
  state.wasElastic = elastic;
  return false;
}
