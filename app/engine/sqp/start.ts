// The start of an SQP run: the problem's shape checked, x0 projected into the bounds, the
// scaling fixed there (scaled-problem.ts), the quasi-Newton matrix chosen, and the first
// multipliers — from the states with state equations (exact, one solve), else least squares
// on stationarity over the rows and bounds active at the start (QR, least-squares-multipliers.ts).
import { DenseBfgs } from "./dense-bfgs";
import type { HessianApprox } from "./hessian";
import { leastSquaresMultipliers } from "./least-squares-multipliers";
import { LimitedBfgs } from "./limited-bfgs";
import { type ScaledStateFactor, checkStateEquations, scaledStateFactor } from "./reduced-space";
import { failedResult, refusedResult } from "./result";
import type { QpRow } from "./rows";
import { ScaledProblem } from "./scaled-problem";
import { type Multipliers, type SqpContext, type SqpState, emptyMultipliers, maxAbsMultiplier, maxViolation } from "./state";
import { rescreen } from "./subproblem";
import { kktMeasure } from "./termination";
import { DEFAULT_LBFGS_MEMORY, DEFAULT_MAX_ITERATIONS, DEFAULT_TOLERANCE, DENSE_BFGS_MAX_VARIABLES, PENALTY_MARGIN, START_ACTIVE_TOLERANCE } from "./thresholds";
import type { SqpHistoryEntry, SqpOptions, SqpProblem, SqpResult } from "./types";

/** Structural checks that need no evaluation: sizes and bounds. Returns a sentence or null. */
function checkShape(p: SqpProblem): string | null {
  if (!Number.isInteger(p.n) || p.n < 1) return `The problem must have at least one variable (n = ${p.n}).`;
  if (!p.x0 || p.x0.length !== p.n) return `The start point x0 has ${p.x0 ? p.x0.length : 0} entries, but the problem has ${p.n} variables.`;
  if (p.lower && p.lower.length !== p.n) return `The lower bounds have ${p.lower.length} entries, but the problem has ${p.n} variables.`;
  if (p.upper && p.upper.length !== p.n) return `The upper bounds have ${p.upper.length} entries, but the problem has ${p.n} variables.`;
  for (const [k, v] of [["nEq", p.nEq], ["nIneq", p.nIneq]] as const)
    if (v !== undefined && (!Number.isInteger(v) || v < 0)) return `${k} must be a non-negative whole number (got ${v}).`;
  const name = (j: number) => p.names?.variables?.[j] ?? `x[${j}]`;
  for (let j = 0; j < p.n; j++) {
    if (!Number.isFinite(p.x0[j])) return `The start value of ${name(j)} is ${p.x0[j]}; give a finite number.`;
    const lo = p.lower ? p.lower[j] : -Infinity;
    const hi = p.upper ? p.upper[j] : Infinity;
    if (Number.isNaN(lo) || Number.isNaN(hi)) return `A bound of ${name(j)} is NaN; use -Infinity/Infinity for no bound.`;
    if (lo > hi) return `The lower bound of ${name(j)} (${lo}) is above its upper bound (${hi}).`;
  }
  return null;
}

/** The run's fixed context, or a result when the problem is refused before any evaluation. */
function makeContext(problem: SqpProblem, options: SqpOptions, started: number, history: SqpHistoryEntry[]): { ctx: SqpContext; x: Float64Array } | SqpResult {
  const n = Number.isInteger(problem.n) && problem.n > 0 ? problem.n : 0;
  const nEq = problem.nEq ?? 0;
  const nIneq = problem.nIneq ?? 0;
  const shapeError = checkShape(problem);
  if (shapeError) return refusedResult(shapeError, new Float64Array(n), n, nEq, nIneq, history);

  // project x0 into the bounds
  const lower = new Float64Array(n);
  const upper = new Float64Array(n);
  const x0 = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    lower[j] = problem.lower ? problem.lower[j] : -Infinity;
    upper[j] = problem.upper ? problem.upper[j] : Infinity;
    x0[j] = Math.min(upper[j], Math.max(lower[j], problem.x0[j]));
  }
  const sp = new ScaledProblem(problem, x0, lower, upper);
  const { lo, hi } = sp;
  const clip = (v: Float64Array): void => {
    for (let j = 0; j < n; j++) v[j] = Math.min(hi[j], Math.max(lo[j], v[j]));
  };
  const x = new Float64Array(n);
  for (let j = 0; j < n; j++) x[j] = x0[j] / sp.d[j];
  clip(x);

  // null-space steps when the equalities are declared state equations (reduced-space.ts):
  // B then approximates the reduced Hessian over the nD design variables
  // (the declared structure also serves the restoration of trial points, restoration.ts)
  const declared = problem.stateEquations ?? null;
  if (declared) {
    const bad = checkStateEquations(declared, n, nEq, lower, upper, (j) => problem.names?.variables?.[j] ?? `x[${j}]`);
    if (bad) return refusedResult(bad, x0, n, nEq, nIneq, history);
  }
  const stateEq = declared && options.reducedSpace !== false ? declared : null;
  const nB = stateEq ? stateEq.nDesign : n;
  const hessianKind = options.hessian ?? (nB <= DENSE_BFGS_MAX_VARIABLES ? "bfgs" : "lbfgs");
  const B: HessianApprox = hessianKind === "bfgs" ? new DenseBfgs(nB) : new LimitedBfgs(nB, Math.max(1, options.memory ?? DEFAULT_LBFGS_MEMORY));

  // two factors kept: the iterate's, which the quasi-Newton pair reads after the line search,
  // and the last trial point's, which becomes the iterate's when that point is accepted
  let iterateFactor: { at: Float64Array; factor: ScaledStateFactor } | null = null;
  let trialFactor: { at: Float64Array; factor: ScaledStateFactor } | null = null;
  const stateFactorAt = (xs: Float64Array, trial = false): ScaledStateFactor | string => {
    if (iterateFactor?.at === xs) return iterateFactor.factor;
    if (trialFactor?.at === xs) {
      if (!trial) [iterateFactor, trialFactor] = [trialFactor, null];
      return (iterateFactor?.at === xs ? iterateFactor : trialFactor)!.factor;
    }
    try {
      const made = { at: xs, factor: scaledStateFactor(sp, declared!, xs) };
      if (trial) trialFactor = made;
      else iterateFactor = made;
      return made.factor;
    } catch (e) {
      if (e instanceof Error && e.name === "AbortError") throw e;
      return `The state equations could not be factored at ${sp.describePoint(xs)}: ${e instanceof Error ? e.message : String(e)}`;
    }
  };
  const ctx: SqpContext = {
    problem, options, sp, n, nEq, nIneq, nB, lo, hi, B, stateEq, history, started, clip, stateFactorAt,
    restoreStates: declared?.linearInStates === true && options.restoreStates !== false,
    tol: options.tolerance ?? DEFAULT_TOLERANCE,
    maxIter: options.maxIterations ?? DEFAULT_MAX_ITERATIONS,
    screening: options.screening ?? Infinity,
  };
  return { ctx, x };
}

/** Least-squares multipliers on stationarity over the rows and bounds active at the start. */
function firstMultipliers(ctx: SqpContext, state: Pick<SqpState, "x" | "pt" | "dv">): Multipliers | string {
  const { n, nEq, nIneq, nB, lo, hi, stateEq, tol } = ctx;
  const { x, pt, dv } = state;
  const m = emptyMultipliers(n, nEq, nIneq);
  if (stateEq) {
    // multipliers of the state equations from stationarity in the states (exact, one solve)
    const fac = ctx.stateFactorAt(x);
    if (typeof fac === "string") return fac;
    m.eq.set(fac.solveTransposed(Float64Array.from(dv.g.subarray(nB, n))).map((v) => -v));
    return m;
  }
  const rows: QpRow[] = [];
  const tags: [kind: number, i: number][] = [];
  const nearTol = Math.max(tol, START_ACTIVE_TOLERANCE);
  for (let i = 0; i < nEq; i++) { rows.push(dv.je[i]); tags.push([0, i]); }
  for (let i = 0; i < nIneq; i++) {
    const row = dv.ji[i];
    if (row && Math.abs(pt.ci[i]) <= nearTol) { rows.push(row); tags.push([1, i]); }
  }
  for (let j = 0; j < n; j++) {
    // an infinite bound is never near: Infinity <= tol * Infinity would hold, and a unit row for
    // every free variable (the simultaneous formulation's displacements) made the least-squares
    // system degenerate, its multipliers ~1e16, the penalty with them, and the first step fail
    if (Number.isFinite(lo[j]) && x[j] - lo[j] <= nearTol * Math.max(1, Math.abs(lo[j]))) { rows.push(unitRow(j, -1)); tags.push([2, j]); }
    else if (Number.isFinite(hi[j]) && hi[j] - x[j] <= nearTol * Math.max(1, Math.abs(hi[j]))) { rows.push(unitRow(j, 1)); tags.push([3, j]); }
  }
  const lam = leastSquaresMultipliers(dv.g, rows, n);
  tags.forEach(([kind, i], k) => {
    if (kind === 0) m.eq[i] = lam[k];
    else if (kind === 1) m.ineq[i] = Math.max(0, lam[k]);
    else if (kind === 2) m.lower[i] = Math.max(0, lam[k]);
    else m.upper[i] = Math.max(0, lam[k]);
  });
  return m;
}

function unitRow(j: number, sign: number): QpRow {
  return { idx: Int32Array.of(j), val: Float64Array.of(sign), extra: 0 };
}

/**
 * Everything up to the first subproblem: the context, and the state at the projected start
 * point with its scaling, screen and first multipliers — or a result when the run ends there
 * (refused, failed, or already optimal).
 */
export function startRun(problem: SqpProblem, options: SqpOptions, started: number): { ctx: SqpContext; state: SqpState } | SqpResult {
  const history: SqpHistoryEntry[] = [];
  const made = makeContext(problem, options, started, history);
  if (!("ctx" in made)) return made;
  const { ctx, x } = made;
  const { sp, n, nEq, nIneq } = ctx;
  const none = () => ({ x, pt: null, mult: emptyMultipliers(n, nEq, nIneq), kkt: Infinity });

  const first = sp.evaluate(x);
  if (!first.ok) return failedResult(ctx, first.message, none(), 0);
  const cal = sp.calibrate(x);
  if (!cal.ok) return failedResult(ctx, cal.message, none(), 0);
  // re-evaluate in the calibrated scaling (values only; cheap relative to derivatives)
  const firstScaled = sp.evaluate(x);
  if (!firstScaled.ok) return failedResult(ctx, firstScaled.message, none(), 0);
  const pt = firstScaled.value;
  const dv = cal.value;

  const mult = firstMultipliers(ctx, { x, pt, dv });
  if (typeof mult === "string") return failedResult(ctx, mult, { x, pt, mult: emptyMultipliers(n, nEq, nIneq), kkt: Infinity }, 0);
  const kkt = kktMeasure(ctx, pt, dv, mult, x);
  const snap = { x: Float64Array.from(x), pt, mult, kkt: kkt.value, viol: maxViolation(pt.ce, pt.ci) };
  const state: SqpState = {
    x, pt, dv, mult, kkt: kkt.value, kktParts: kkt.parts,
    rho: Math.max(1, PENALTY_MARGIN * maxAbsMultiplier(mult)),
    best: snap, leastViolating: snap,
    inScreen: new Uint8Array(nIneq),
    warmIneq: new Uint8Array(nIneq), warmLower: new Uint8Array(n), warmUpper: new Uint8Array(n),
    iteration: 0, lastStep: 0, elasticRun: 0, wasElastic: false, elasticStuck: 0, elasticStartViol: 0, updatesSinceReset: 0, kktTrail: [],
  };
  rescreen(ctx, state, pt, null);
  return { ctx, state };
}
