// minimize(problem, options): sequential quadratic programming with a quasi-Newton Hessian.
//
// Each iteration at x (all in the scaled space of scaled-problem.ts):
//  1. QP subproblem  min 1/2 s'Bs + g's  s.t.  c_E + J_E s = 0,  c_I + J_I s <= 0 (screened rows),
//     lower - x <= s <= upper - x, solved by the dual active-set method (dual-qp.ts), warm-started
//     from the previous active set. B: damped BFGS (dense-bfgs.ts) or limited-memory
//     (limited-bfgs.ts). If the linearization is incompatible, the elastic subproblem relaxes
//     every violated row by a common factor (1 - xi), 0 <= xi <= 1, with xi penalized by
//     1/2 * 1e6 * xi^2 — always feasible, and it steers toward least violation.
//  2. KKT test at x with the QP multipliers (below). Converged -> "optimal".
//  3. l1 exact-penalty merit  phi = f + rho * (sum |c_E| + sum max(0, c_I)); rho follows Powell's
//     rule rho = max(rho_req, (rho + rho_req)/2) with rho_req the larger of 1.1 * max |lambda| and
//     the value making the step a descent direction. Backtracking (Armijo, 1e-4 times the
//     directional derivative of phi; safeguarded quadratic interpolation); if the full step is
//     rejected, one second-order correction (same QP with the constraint values at x + s) fights
//     the Maratos effect. A row outside the screen that the full step violates joins the screen
//     and the QP is solved again.
//  4. Damped BFGS update with the change of the Lagrangian gradient at the new multipliers.
// Multipliers at the start point: least squares on stationarity for the rows active there.
//
// Termination (documented tolerances, tol = options.tolerance, default 1e-8), all scaled:
//   stationarity     ||g + J_E'l_E + J_I'l_I - nu_lower + nu_upper||inf <= tol
//   feasibility      max(|c_E|, max(0, c_I)) over EVERY row <= tol
//   complementarity  max(|l_i c_i|, nu_j * distance to bound j) <= tol
// (stationarity divided by max(1, mean |multiplier| / 100): with huge multipliers the residual
// carries their rounding, the measure interior-point codes use.) kktResidual is the largest of the three. "optimal" only when all three hold at the returned
// point, which satisfies all rows to tol (scaled) — never at a violating point.
// Other ends: iteration or time limit and no-progress -> "not-converged" with the best point
// (lowest objective among feasible iterates, else the least violation); elastic mode that can
// no longer reduce the violation -> "infeasible" with the least-violation point; a non-finite
// value from the user's functions (or a throw) -> "failed" naming the function and the point.
// Every iterate is inside the bounds (x0 is projected, trial points are clipped).
import { DenseBfgs } from "./dense-bfgs";
import { type QpHessian, type QpInput, type QpOutput, qpKey, solveQp } from "./dual-qp";
import { elasticHessian } from "./elastic";
import type { HessianApprox } from "./hessian";
import { dot } from "./hessian";
import { leastSquaresMultipliers } from "./least-squares-multipliers";
import { LimitedBfgs } from "./limited-bfgs";
import { type StopReason, describeStop } from "./messages";
import { checkStateEquations, reduceVector, scaledStateFactor, solveReducedQp, type ScaledStateFactor } from "./reduced-space";
import { type QpRow, rowDot } from "./rows";
import { type ScaledDerivatives, type ScaledPoint, ScaledProblem } from "./scaled-problem";
import type { SqpHistoryEntry, SqpOptions, SqpProblem, SqpResult } from "./types";

const ARMIJO = 1e-4;
/** scaled l1 violation below which a point counts as feasible to rounding in the line search */
const FEASIBLE_NOISE = 1e-11;

function abortError(): Error {
  const e = new Error("The optimization was cancelled.");
  e.name = "AbortError";
  return e;
}

/** Multipliers of one QP solve, mapped to full row indices. */
interface Multipliers {
  eq: Float64Array;
  ineq: Float64Array;
  lower: Float64Array;
  upper: Float64Array;
}

interface Snapshot {
  x: Float64Array;
  pt: ScaledPoint;
  mult: Multipliers;
  kkt: number;
  viol: number;
}

function l1Violation(pt: ScaledPoint): number {
  let v = 0;
  for (let i = 0; i < pt.ce.length; i++) v += Math.abs(pt.ce[i]);
  for (let i = 0; i < pt.ci.length; i++) if (pt.ci[i] > 0) v += pt.ci[i];
  return v;
}

function maxViolation(ce: Float64Array, ci: Float64Array): number {
  let v = 0;
  for (let i = 0; i < ce.length; i++) v = Math.max(v, Math.abs(ce[i]));
  for (let i = 0; i < ci.length; i++) v = Math.max(v, ci[i]);
  return v;
}

function emptyResult(n: number, nEq: number, nIneq: number): Multipliers {
  return { eq: new Float64Array(nEq), ineq: new Float64Array(nIneq), lower: new Float64Array(n), upper: new Float64Array(n) };
}

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

export function minimize(problem: SqpProblem, options: SqpOptions = {}): SqpResult {
  const started = performance.now();
  const signal = options.signal;
  if (signal?.aborted) throw abortError();
  const tol = options.tolerance ?? 1e-8;
  const maxIter = options.maxIterations ?? 200;
  const screening = options.screening ?? Infinity;
  const history: SqpHistoryEntry[] = [];

  const shapeError = checkShape(problem);
  const n = Number.isInteger(problem.n) && problem.n > 0 ? problem.n : 0;
  const nEq = problem.nEq ?? 0;
  const nIneq = problem.nIneq ?? 0;
  /** A problem refused before any evaluation: nothing computed, the sentence says why. */
  const refused = (what: string, x: Float64Array): SqpResult => {
    const { message, hint } = describeStop({ kind: "failed", what });
    return {
      status: "failed", message, hint, x, f: 0, eq: new Float64Array(nEq), ineq: new Float64Array(nIneq),
      multipliers: emptyResult(n, nEq, nIneq), iterations: 0, evaluations: 0, derivativeEvaluations: 0,
      kktResidual: Infinity, maxViolation: Infinity, history,
    };
  };
  if (shapeError) return refused(shapeError, new Float64Array(n));

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
  let x: Float64Array = new Float64Array(n);
  for (let j = 0; j < n; j++) x[j] = x0[j] / sp.d[j];
  clip(x);

  // null-space steps when the equalities are declared state equations (reduced-space.ts):
  // B then approximates the reduced Hessian over the nD design variables
  const stateEq = problem.stateEquations && options.reducedSpace !== false ? problem.stateEquations : null;
  if (stateEq) {
    const bad = checkStateEquations(stateEq, n, nEq, lower, upper, (j) => problem.names?.variables?.[j] ?? `x[${j}]`);
    if (bad) return refused(bad, x0);
  }
  const nB = stateEq ? stateEq.nDesign : n;
  const hessianKind = options.hessian ?? (nB <= 400 ? "bfgs" : "lbfgs");
  const B: HessianApprox = hessianKind === "bfgs" ? new DenseBfgs(nB) : new LimitedBfgs(nB, Math.max(1, options.memory ?? 10));
  /** B s over the variables B covers (the design part in reduced space), zero elsewhere */
  const modelHessianTimes = (v: Float64Array): Float64Array => {
    const out = new Float64Array(n);
    const o = new Float64Array(nB);
    B.applyB(Float64Array.from(v.subarray(0, nB)), o);
    out.set(o);
    return out;
  };
  // the state Jacobian's factor at the current iterate, made once per iterate
  let stateFactor: { at: Float64Array; factor: ScaledStateFactor } | null = null;
  const stateFactorAt = (xs: Float64Array): ScaledStateFactor | string => {
    if (stateFactor?.at === xs) return stateFactor.factor;
    try {
      stateFactor = { at: xs, factor: scaledStateFactor(sp, stateEq!, xs) };
      return stateFactor.factor;
    } catch (e) {
      if (e instanceof Error && e.name === "AbortError") throw e;
      return `The state equations could not be factored at ${sp.describePoint(xs)}: ${e instanceof Error ? e.message : String(e)}`;
    }
  };
  let updatesSinceReset = 0;

  // ---------- result assembly ----------
  const build = (snap: { x: Float64Array; pt: ScaledPoint | null; mult: Multipliers; kkt: number }, reason: StopReason, iterations: number): SqpResult => {
    const status: SqpResult["status"] =
      reason.kind === "optimal" ? "optimal" : reason.kind === "infeasible" ? "infeasible" : reason.kind === "failed" ? "failed" : "not-converged";
    const { message, hint } = describeStop(reason);
    const xu = sp.toUser(snap.x);
    const m = emptyResult(n, nEq, nIneq);
    const fs = sp.fScale;
    for (let i = 0; i < nEq; i++) m.eq[i] = (snap.mult.eq[i] * sp.eqScale[i]) / fs;
    for (let i = 0; i < nIneq; i++) m.ineq[i] = (snap.mult.ineq[i] * sp.inScale[i]) / fs;
    for (let j = 0; j < n; j++) {
      m.lower[j] = snap.mult.lower[j] / (fs * sp.d[j]);
      m.upper[j] = snap.mult.upper[j] / (fs * sp.d[j]);
    }
    const pt = snap.pt;
    const eq = pt ? pt.eqRaw : new Float64Array(nEq);
    const ineq = pt ? pt.ineqRaw : new Float64Array(nIneq);
    return {
      status, message, hint, x: xu, f: pt ? pt.fRaw : 0, eq, ineq, multipliers: m, iterations,
      evaluations: sp.evaluations, derivativeEvaluations: sp.derivativeEvaluations,
      kktResidual: snap.kkt, maxViolation: pt ? maxViolation(eq, ineq) : Infinity, history,
    };
  };
  const failed = (what: string, at: { x: Float64Array; pt: ScaledPoint | null; mult: Multipliers; kkt: number }, it: number) =>
    build(at, { kind: "failed", what }, it);

  // ---------- start point ----------
  const first = sp.evaluate(x);
  if (!first.ok) return failed(first.message, { x, pt: null, mult: emptyResult(n, nEq, nIneq), kkt: Infinity }, 0);
  const cal = sp.calibrate(x);
  if (!cal.ok) return failed(cal.message, { x, pt: null, mult: emptyResult(n, nEq, nIneq), kkt: Infinity }, 0);
  // re-evaluate in the calibrated scaling (values only; cheap relative to derivatives)
  const firstScaled = sp.evaluate(x);
  if (!firstScaled.ok) return failed(firstScaled.message, { x, pt: null, mult: emptyResult(n, nEq, nIneq), kkt: Infinity }, 0);
  let pt = firstScaled.value;
  let dv: ScaledDerivatives = cal.value;

  const inScreen = new Uint8Array(nIneq);
  const screenedList = (): Int32Array => {
    let c = 0;
    for (let i = 0; i < nIneq; i++) if (inScreen[i]) c++;
    const out = new Int32Array(c);
    c = 0;
    for (let i = 0; i < nIneq; i++) if (inScreen[i]) out[c++] = i;
    return out;
  };
  const rescreen = (p: ScaledPoint, keep: Float64Array | null): void => {
    for (let i = 0; i < nIneq; i++) inScreen[i] = p.ci[i] > -screening || (keep !== null && keep[i] !== 0) ? 1 : 0;
  };
  rescreen(pt, null);

  // working set carried between QPs (by meaning, since the screened rows change)
  let warmIneq = new Uint8Array(nIneq);
  let warmLower = new Uint8Array(n);
  let warmUpper = new Uint8Array(n);

  // ---------- KKT measure ----------
  let kktParts = { stat: Infinity, compl: Infinity, feas: Infinity };
  const kktAt = (p: ScaledPoint, d: ScaledDerivatives, m: Multipliers, xs: Float64Array): number => {
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
    stat /= Math.max(1, mSum / (nEq + nIneq + 2 * n) / 100);
    const feas = maxViolation(p.ce, p.ci);
    kktParts = { stat, compl, feas };
    return Math.max(stat, compl, feas);
  };
  /**
   * Converged to the precision rounding allows: feasible and complementary to tol, stationary
   * to sqrt(tol), and the step's predicted merit decrease below the rounding noise of the merit
   * value (no line search could then verify progress).
   */
  const atNoiseFloor = (D: number, phi0: number): boolean =>
    kktParts.feas <= tol && kktParts.compl <= tol && kktParts.stat <= Math.sqrt(tol) && -D <= 1e-13 * (1 + Math.abs(phi0));

  // first multipliers: from the states with state equations, else least squares on the rows
  // active at the start
  const lsMult = emptyResult(n, nEq, nIneq);
  if (stateEq) {
    // multipliers of the state equations from stationarity in the states (exact, one solve)
    const fac = stateFactorAt(x);
    if (typeof fac === "string") return failed(fac, { x, pt, mult: emptyResult(n, nEq, nIneq), kkt: Infinity }, 0);
    lsMult.eq.set(fac.solveTransposed(Float64Array.from(dv.g.subarray(nB, n))).map((v) => -v));
  } else {
    const rows: QpRow[] = [];
    const tags: [kind: number, i: number][] = [];
    const nearTol = Math.max(tol, 1e-6);
    for (let i = 0; i < nEq; i++) { rows.push(dv.je[i]); tags.push([0, i]); }
    for (let i = 0; i < nIneq; i++) {
      const row = dv.ji[i];
      if (row && Math.abs(pt.ci[i]) <= nearTol) { rows.push(row); tags.push([1, i]); }
    }
    for (let j = 0; j < n; j++) {
      if (x[j] - lo[j] <= nearTol * Math.max(1, Math.abs(lo[j]))) { rows.push(unitRow(j, -1)); tags.push([2, j]); }
      else if (hi[j] - x[j] <= nearTol * Math.max(1, Math.abs(hi[j]))) { rows.push(unitRow(j, 1)); tags.push([3, j]); }
    }
    const lam = leastSquaresMultipliers(dv.g, rows, n);
    tags.forEach(([kind, i], k) => {
      if (kind === 0) lsMult.eq[i] = lam[k];
      else if (kind === 1) lsMult.ineq[i] = Math.max(0, lam[k]);
      else if (kind === 2) lsMult.lower[i] = Math.max(0, lam[k]);
      else lsMult.upper[i] = Math.max(0, lam[k]);
    });
  }
  let mult: Multipliers = lsMult;
  let kkt = kktAt(pt, dv, lsMult, x);
  let rho = Math.max(1, 1.1 * maxAbs(lsMult));

  let best: Snapshot = { x: Float64Array.from(x), pt, mult, kkt, viol: maxViolation(pt.ce, pt.ci) };
  let leastViolating: Snapshot = best;
  const consider = (snap: Snapshot): void => {
    const feas = (s: Snapshot) => s.viol <= tol;
    if (feas(snap) ? !feas(best) || snap.pt.f < best.pt.f : !feas(best) && snap.viol < best.viol) best = snap;
    if (snap.viol < leastViolating.viol) leastViolating = snap;
  };

  const record = (iteration: number, step: number, active: number, elastic: boolean): void => {
    if (history.length > 0 && history[history.length - 1].iteration === iteration) history.pop(); // retried after a Hessian reset
    const entry = { iteration, f: pt.fRaw, maxViolation: maxViolation(pt.eqRaw, pt.ineqRaw), kktResidual: kkt, step };
    history.push(entry);
    options.onProgress?.({ ...entry, penalty: rho, active, evaluations: sp.evaluations, elastic });
  };

  if (kkt <= tol) {
    record(0, 0, 0, false);
    return build({ x, pt, mult, kkt }, { kind: "optimal", tolerance: tol, maxViolation: maxViolation(pt.eqRaw, pt.ineqRaw), iterations: 0 }, 0);
  }

  // ---------- QP assembly ----------
  const buildQp = (rowsIn: Int32Array, ceVal: Float64Array, ciVal: Float64Array, elastic: boolean): QpInput => {
    const dim = elastic ? n + 1 : n;
    const g = new Float64Array(dim);
    g.set(dv.g);
    const eq: QpRow[] = [];
    const eqRhs = new Float64Array(nEq);
    for (let i = 0; i < nEq; i++) {
      const r = dv.je[i];
      eq.push(elastic ? { idx: r.idx, val: r.val, extra: -pt.ce[i] } : r);
      eqRhs[i] = -ceVal[i];
    }
    const ineq: QpRow[] = [];
    const ineqRhs = new Float64Array(rowsIn.length);
    rowsIn.forEach((i, k) => {
      const r = dv.ji[i] as QpRow;
      ineq.push(elastic && pt.ci[i] > 0 ? { idx: r.idx, val: r.val, extra: -pt.ci[i] } : r);
      ineqRhs[k] = -ciVal[i];
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
    rowsIn.forEach((i, k) => { if (warmIneq[i]) warm.push(qpKey("ineq", k, nEq, rowsIn.length, dim)); });
    for (let j = 0; j < n; j++) {
      if (warmLower[j]) warm.push(qpKey("lower", j, nEq, rowsIn.length, dim));
      if (warmUpper[j]) warm.push(qpKey("upper", j, nEq, rowsIn.length, dim));
    }
    const hessian: QpHessian = elastic ? elasticHessian(B, n) : B;
    return { dim, base: n, hessian, g, eq, eqRhs, ineq, ineqRhs, lower, upper, warm };
  };

  /** The subproblem at x: the full QP, or its null-space form with state equations. */
  const subproblem = (rowsIn: Int32Array, elastic: boolean): QpOutput | string => {
    if (!stateEq) return solveQp(buildQp(rowsIn, pt.ce, pt.ci, elastic));
    const factor = stateFactorAt(x);
    if (typeof factor === "string") return factor;
    const lowerStep = new Float64Array(nB);
    const upperStep = new Float64Array(nB);
    for (let j = 0; j < nB; j++) {
      lowerStep[j] = lo[j] - x[j];
      upperStep[j] = hi[j] - x[j];
    }
    return solveReducedQp({
      nDesign: nB, n, factor, dv, ce: pt.ce, ci: pt.ci, rowsIn, B, lowerStep, upperStep,
      warmIneq, warmLower, warmUpper, elastic,
    });
  };

  const toMultipliers = (qp: QpOutput, rowsIn: Int32Array): Multipliers => {
    const m = emptyResult(n, nEq, nIneq);
    m.eq.set(qp.eq);
    rowsIn.forEach((i, k) => { m.ineq[i] = qp.ineq[k]; });
    m.lower.set(qp.lower.subarray(0, n));
    m.upper.set(qp.upper.subarray(0, n));
    return m;
  };

  /** Sum of |c_E + J_E s| + max(0, c_I + J_I s) over the screened rows (linearized l1 violation). */
  const linearizedViolation = (s: Float64Array, rowsIn: Int32Array): number => {
    let v = 0;
    for (let i = 0; i < nEq; i++) v += Math.abs(pt.ce[i] + rowDot(dv.je[i], s, n));
    for (const i of rowsIn) v += Math.max(0, pt.ci[i] + rowDot(dv.ji[i] as QpRow, s, n));
    return v;
  };

  // ---------- main loop ----------
  let iteration = 0;
  let lastStep = 0;
  let elasticRun = 0;
  let wasElastic = false;
  let elasticStuck = 0;
  let elasticStartViol = 0;
  const timeUp = () => options.timeLimitMs !== undefined && performance.now() - started > options.timeLimitMs;

  for (;;) {
    if (signal?.aborted) throw abortError();
    let rowsIn = screenedList();
    // QP, with screen expansion if the full step violates a row outside the screen
    let qp: QpOutput;
    let s: Float64Array;
    let elastic = false;
    let xi = 0;
    let expansions = 0;
    let stepInfo: { D: number; phi0: number; viol0: number } | null = null;
    let trialFull: ScaledPoint | null = null;
    let trialFullX: Float64Array | null = null;
    for (;;) {
      elastic = false;
      const solved = subproblem(rowsIn, false);
      if (typeof solved === "string") return failed(solved, { x, pt, mult, kkt }, iteration);
      qp = solved;
      if (qp.status === "infeasible") {
        elastic = true;
        const relaxed = subproblem(rowsIn, true);
        if (typeof relaxed === "string") return failed(relaxed, { x, pt, mult, kkt }, iteration);
        qp = relaxed;
      }
      s = qp.s.subarray(0, n);
      xi = elastic ? qp.s[n] : 0;
      mult = toMultipliers(qp, rowsIn);
      kkt = kktAt(pt, dv, mult, x);
      if (kkt <= tol || iteration >= maxIter || timeUp() || options.stopRequested?.()) break;

      // merit parameters
      const viol0 = l1Violation(pt);
      const linViol = linearizedViolation(s, rowsIn);
      const bs = modelHessianTimes(s);
      const gs = dot(dv.g, s, n);
      const sBs = dot(s, bs, n);
      // elastic multipliers carry the relaxation weight, not the problem's prices: only the
      // descent requirement below sets the penalty then
      let rhoReq = elastic ? 0 : 1.1 * maxAbs(mult);
      const reduction = viol0 - linViol;
      // the descent requirement only where the violation is more than noise: dividing by a
      // rounding-level reduction would blow the penalty up and freeze the iterates
      if (viol0 > tol && reduction > 0.1 * viol0) rhoReq = Math.max(rhoReq, (gs + 0.5 * sBs) / (0.7 * reduction));
      rho = wasElastic && !elastic ? Math.max(rhoReq, 1e-8) : Math.max(rhoReq, 0.5 * (rho + rhoReq), 1e-8);
      const D = gs + rho * (linViol - viol0);
      stepInfo = { D, phi0: pt.f + rho * viol0, viol0 };
      if (!elastic && atNoiseFloor(D, stepInfo.phi0)) break;

      // full-step trial (also used to widen the screen)
      const xt = Float64Array.from(x);
      for (let j = 0; j < n; j++) xt[j] += s[j];
      clip(xt);
      if (signal?.aborted) throw abortError();
      const ev = sp.evaluate(xt);
      trialFull = ev.ok ? ev.value : null;
      trialFullX = xt;
      if (!ev.ok) break;
      if (expansions < 5 && Number.isFinite(screening)) {
        const add: number[] = [];
        for (let i = 0; i < nIneq; i++) if (!inScreen[i] && ev.value.ci[i] > 0) add.push(i);
        if (add.length > 0) {
          expansions++;
          for (const i of add) inScreen[i] = 1;
          const extra = sp.derivatives(x, Int32Array.from(add));
          if (!extra.ok) return failed(extra.message, { x, pt, mult, kkt }, iteration);
          for (const i of add) dv.ji[i] = extra.value.ji[i];
          rowsIn = screenedList();
          rememberActive(mult); // the re-solve starts from this solve's active set
          continue;
        }
      }
      break;
    }

    rememberActive(mult);

    const snap: Snapshot = { x: Float64Array.from(x), pt, mult, kkt, viol: maxViolation(pt.ce, pt.ci) };
    consider(snap);
    record(iteration, lastStep, qp.active.length, elastic);

    if (kkt <= tol) return build(snap, { kind: "optimal", tolerance: tol, maxViolation: maxViolation(pt.eqRaw, pt.ineqRaw), iterations: iteration }, iteration);
    if (stepInfo && !elastic && atNoiseFloor(stepInfo.D, stepInfo.phi0))
      return build(snap, { kind: "optimal", tolerance: tol, maxViolation: maxViolation(pt.eqRaw, pt.ineqRaw), iterations: iteration, stationarity: kktParts.stat }, iteration);
    if (iteration >= maxIter) return build(best, { kind: "iteration-limit", iterations: iteration, feasible: best.viol <= tol }, iteration);
    if (timeUp()) return build(best, { kind: "time-limit", iterations: iteration, limitMs: options.timeLimitMs ?? 0, feasible: best.viol <= tol }, iteration);
    if (options.stopRequested?.()) return build(best, { kind: "stopped", iterations: iteration, feasible: best.viol <= tol }, iteration);

    // infeasibility detection in elastic mode
    const violNow = l1Violation(pt);
    if (elastic) {
      if (elasticRun === 0) elasticStartViol = violNow;
      elasticRun++;
      elasticStuck = xi > 1 - 1e-6 ? elasticStuck + 1 : 0;
      const stalled = elasticRun >= 30 && violNow > 0.99 * elasticStartViol;
      if (elasticStuck >= 3 || stalled) return infeasibleResult();
      if (elasticRun % 30 === 0) elasticStartViol = violNow;
    } else {
      elasticRun = 0;
      elasticStuck = 0;
    }
    wasElastic = elastic;

    // ---------- line search on the l1 merit ----------
    const info = stepInfo as { D: number; phi0: number; viol0: number };
    let accepted: { x: Float64Array; pt: ScaledPoint; alpha: number } | null = null;
    const sNorm = maxAbsVec(s);
    if (info.D < 0 && sNorm > 1e-15) {
      let alpha = 1;
      let trial = trialFull;
      let xt = trialFullX as Float64Array;
      let nonFinite: string | null = trialFull === null ? "pending" : null;
      if (nonFinite) {
        const ev = sp.evaluate(xt);
        nonFinite = ev.ok ? null : ev.message;
        trial = ev.ok ? ev.value : null;
      }
      let triedSoc = false;
      while (alpha > 1e-10) {
        if (trial) {
          const phi = trial.f + rho * l1Violation(trial);
          // near the solution the predicted decrease can fall below the rounding noise of phi
          // itself; then a step that does not visibly increase phi is taken as is
          const noise = 1e-14 * (1 + Math.abs(info.phi0));
          const belowNoise = -info.D <= 10 * noise && phi <= info.phi0 + noise;
          // both points feasible to rounding: the penalty term is noise times rho (large when
          // some multiplier is), so the objective alone decides
          const violTrial = l1Violation(trial);
          const roundingFeasible = info.viol0 <= FEASIBLE_NOISE && violTrial <= FEASIBLE_NOISE;
          const objectiveDecides = roundingFeasible && trial.f <= pt.f + ARMIJO * alpha * info.D + 1e-14 * (1 + Math.abs(pt.f));
          if (phi <= info.phi0 + ARMIJO * alpha * info.D || belowNoise || objectiveDecides) {
            accepted = { x: xt, pt: trial, alpha };
            break;
          }
          if (alpha === 1 && !triedSoc && !elastic && (nEq > 0 || rowsIn.length > 0)) {
            triedSoc = true;
            const soc = secondOrderCorrection(trial, s, rowsIn, qp, info);
            if (soc) {
              accepted = soc;
              break;
            }
          }
          const denom = 2 * (phi - info.phi0 - alpha * info.D);
          const interp = denom > 0 ? (-info.D * alpha * alpha) / denom : 0.5 * alpha;
          alpha = Math.min(0.5 * alpha, Math.max(0.1 * alpha, interp));
        } else {
          alpha *= 0.1;
        }
        xt = Float64Array.from(x);
        for (let j = 0; j < n; j++) xt[j] += alpha * s[j];
        clip(xt);
        if (signal?.aborted) throw abortError();
        const ev = sp.evaluate(xt);
        if (ev.ok) {
          trial = ev.value;
          nonFinite = null;
        } else {
          trial = null;
          nonFinite = ev.message;
        }
      }
      if (!accepted && nonFinite && nonFinite !== "pending") return failed(nonFinite, { x, pt, mult, kkt }, iteration);
    }

    if (!accepted) {
      if (updatesSinceReset > 0) {
        // the quasi-Newton matrix may be poor: restart it and try this iteration again
        B.reset();
        updatesSinceReset = 0;
        continue;
      }
      // infeasible only when the relaxation itself could not reduce the violation
      if (elastic && xi > 0.5) return infeasibleResult();
      return build(best, { kind: "no-progress", iterations: iteration, feasible: best.viol <= tol }, iteration);
    }

    // ---------- accept, new derivatives, quasi-Newton update ----------
    const xNew = accepted.x;
    const ptNew = accepted.pt;
    rescreen(ptNew, mult.ineq);
    const rowsNew = screenedList();
    const dNew = sp.derivatives(xNew, rowsNew);
    if (!dNew.ok) return failed(dNew.message, { x, pt, mult, kkt }, iteration);
    const y = new Float64Array(n);
    for (let j = 0; j < n; j++) y[j] = dNew.value.g[j] - dv.g[j];
    for (let i = 0; i < nEq; i++) {
      const l = mult.eq[i];
      if (l !== 0) {
        axpyRow(dNew.value.je[i], l, y);
        axpyRow(dv.je[i], -l, y);
      }
    }
    for (let i = 0; i < nIneq; i++) {
      const l = mult.ineq[i];
      const a = dNew.value.ji[i];
      const b = dv.ji[i];
      if (l !== 0 && a && b) {
        axpyRow(a, l, y);
        axpyRow(b, -l, y);
      }
    }
    const step = new Float64Array(n);
    for (let j = 0; j < n; j++) step[j] = xNew[j] - x[j];
    // after a relaxed (elastic) subproblem the multipliers are not the problem's: no update
    if (!elastic) {
      let pair: [Float64Array, Float64Array] = [step, y];
      if (stateEq) {
        // the reduced pair (s_d, Z'y) with Z at the old iterate, whose factor is at hand
        const fac = stateFactorAt(x);
        if (typeof fac === "string") return failed(fac, { x, pt, mult, kkt }, iteration);
        pair = [step.subarray(0, nB), reduceVector(fac, dv.je, y, nB, n)];
      }
      if (B.update(pair[0], pair[1]) !== "skipped") updatesSinceReset++;
    }
    x = xNew;
    pt = ptNew;
    dv = dNew.value;
    lastStep = accepted.alpha;
    iteration++;
  }

  /** Keeps the active set (by row and variable, since the screened rows change) for the next warm start. */
  function rememberActive(m: Multipliers): void {
    warmIneq = new Uint8Array(nIneq);
    warmLower = new Uint8Array(n);
    warmUpper = new Uint8Array(n);
    for (let i = 0; i < nIneq; i++) if (m.ineq[i] > 0) warmIneq[i] = 1;
    for (let j = 0; j < n; j++) {
      if (m.lower[j] > 0) warmLower[j] = 1;
      if (m.upper[j] > 0) warmUpper[j] = 1;
    }
  }

  function infeasibleResult(): SqpResult {
    const p = leastViolating.pt;
    let worst = "no constraint";
    let wv = 0;
    for (let i = 0; i < nEq; i++) if (Math.abs(p.eqRaw[i]) > wv) { wv = Math.abs(p.eqRaw[i]); worst = sp.eqName(i); }
    for (let i = 0; i < nIneq; i++) if (p.ineqRaw[i] > wv) { wv = p.ineqRaw[i]; worst = sp.ineqName(i); }
    return build(leastViolating, { kind: "infeasible", worst, violation: wv }, iteration);
  }

  /** Second-order correction: the last QP's active set and factors, constraint values taken at x + s. */
  function secondOrderCorrection(trial: ScaledPoint, s: Float64Array, rowsIn: Int32Array, qp: QpOutput, info: { D: number; phi0: number }): { x: Float64Array; pt: ScaledPoint; alpha: number } | null {
    const ce = new Float64Array(nEq);
    const ci = new Float64Array(nIneq);
    for (let i = 0; i < nEq; i++) ce[i] = trial.ce[i] - rowDot(dv.je[i], s, n);
    for (const i of rowsIn) ci[i] = trial.ci[i] - rowDot(dv.ji[i] as QpRow, s, n);
    const ciRows = Float64Array.from(rowsIn, (i) => -ci[i]);
    const s2 = qp.resolve(Float64Array.from(ce, (v) => -v), ciRows);
    for (let j = 0; j < n; j++) if (!Number.isFinite(s2[j])) return null;
    const xt = Float64Array.from(x);
    for (let j = 0; j < n; j++) xt[j] += s2[j];
    clip(xt);
    if (signal?.aborted) throw abortError();
    const ev = sp.evaluate(xt);
    if (!ev.ok) return null;
    const phi = ev.value.f + rho * l1Violation(ev.value);
    return phi <= info.phi0 + ARMIJO * info.D ? { x: xt, pt: ev.value, alpha: 1 } : null;
  }
}

function axpyRow(r: QpRow, alpha: number, out: Float64Array): void {
  if (r.idx === null) for (let k = 0; k < r.val.length; k++) out[k] += alpha * r.val[k];
  else for (let k = 0; k < r.idx.length; k++) out[r.idx[k]] += alpha * r.val[k];
}

function unitRow(j: number, sign: number): QpRow {
  return { idx: Int32Array.of(j), val: Float64Array.of(sign), extra: 0 };
}

function maxAbs(m: Multipliers): number {
  let v = 0;
  for (const a of [m.eq, m.ineq, m.lower, m.upper]) for (let i = 0; i < a.length; i++) v = Math.max(v, Math.abs(a[i]));
  return v;
}

function maxAbsVec(v: Float64Array): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) m = Math.max(m, Math.abs(v[i]));
  return m;
}
