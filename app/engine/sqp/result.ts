// What leaves the solver: the result in user units (x, f, constraint values, multipliers
// unscaled), the iteration history and progress reports, and the sentence for each way to end.
import { type StopReason, describeStop } from "./messages";
import type { ScaledPoint } from "./scaled-problem";
import { type Multipliers, type SqpContext, type SqpState, emptyMultipliers, maxViolation } from "./state";
import type { SqpHistoryEntry, SqpResult } from "./types";

/** The point a result reports: an iterate, or the start when nothing could be evaluated. */
export interface ResultPoint {
  x: Float64Array;
  pt: ScaledPoint | null;
  mult: Multipliers;
  kkt: number;
}

/** A problem refused before any evaluation: nothing computed, the sentence says why. */
export function refusedResult(what: string, x: Float64Array, n: number, nEq: number, nIneq: number, history: SqpHistoryEntry[]): SqpResult {
  const { message, hint } = describeStop({ kind: "failed", what });
  return {
    status: "failed", message, hint, x, f: 0, eq: new Float64Array(nEq), ineq: new Float64Array(nIneq),
    multipliers: emptyMultipliers(n, nEq, nIneq), iterations: 0, evaluations: 0, derivativeEvaluations: 0,
    kktResidual: Infinity, maxViolation: Infinity, history,
  };
}

export function buildResult(ctx: SqpContext, at: ResultPoint, reason: StopReason, iterations: number): SqpResult {
  const { sp, n, nEq, nIneq } = ctx;
  const status: SqpResult["status"] =
    reason.kind === "optimal" ? "optimal" : reason.kind === "infeasible" ? "infeasible" : reason.kind === "failed" ? "failed" : "not-converged";
  const { message, hint } = describeStop(reason);
  const xu = sp.toUser(at.x);
  const m = emptyMultipliers(n, nEq, nIneq);
  const fs = sp.fScale;
  for (let i = 0; i < nEq; i++) m.eq[i] = (at.mult.eq[i] * sp.eqScale[i]) / fs;
  for (let i = 0; i < nIneq; i++) m.ineq[i] = (at.mult.ineq[i] * sp.inScale[i]) / fs;
  for (let j = 0; j < n; j++) {
    m.lower[j] = at.mult.lower[j] / (fs * sp.d[j]);
    m.upper[j] = at.mult.upper[j] / (fs * sp.d[j]);
  }
  const pt = at.pt;
  const eq = pt ? pt.eqRaw : new Float64Array(nEq);
  const ineq = pt ? pt.ineqRaw : new Float64Array(nIneq);
  return {
    status, message, hint, x: xu, f: pt ? pt.fRaw : 0, eq, ineq, multipliers: m, iterations,
    evaluations: sp.evaluations, derivativeEvaluations: sp.derivativeEvaluations,
    kktResidual: at.kkt, maxViolation: pt ? maxViolation(eq, ineq) : Infinity, history: ctx.history,
  };
}

export function failedResult(ctx: SqpContext, what: string, at: ResultPoint, iterations: number): SqpResult {
  return buildResult(ctx, at, { kind: "failed", what }, iterations);
}

/** Failed at the current iterate (an evaluation or factorization that went wrong mid-run). */
export function failedAtIterate(ctx: SqpContext, state: SqpState, what: string): SqpResult {
  return failedResult(ctx, what, state, state.iteration);
}

/** The least-violating point, naming the constraint it violates most. */
export function infeasibleResult(ctx: SqpContext, state: SqpState): SqpResult {
  const { sp, nEq, nIneq } = ctx;
  const p = state.leastViolating.pt;
  let worst = "no constraint";
  let wv = 0;
  for (let i = 0; i < nEq; i++) if (Math.abs(p.eqRaw[i]) > wv) { wv = Math.abs(p.eqRaw[i]); worst = sp.eqName(i); }
  for (let i = 0; i < nIneq; i++) if (p.ineqRaw[i] > wv) { wv = p.ineqRaw[i]; worst = sp.ineqName(i); }
  return buildResult(ctx, state.leastViolating, { kind: "infeasible", worst, violation: wv }, state.iteration);
}

/** One history entry and one progress report per iteration (a retried iteration replaces its entry). */
export function recordIteration(ctx: SqpContext, state: SqpState, iteration: number, step: number, active: number, elastic: boolean): void {
  const { history, sp } = ctx;
  if (history.length > 0 && history[history.length - 1].iteration === iteration) history.pop(); // retried after a Hessian reset
  const entry = { iteration, f: state.pt.fRaw, maxViolation: maxViolation(state.pt.eqRaw, state.pt.ineqRaw), kktResidual: state.kkt, step };
  history.push(entry);
  ctx.options.onProgress?.({ ...entry, penalty: state.rho, active, evaluations: sp.evaluations, elastic });
}
