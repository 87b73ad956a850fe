// minimize(problem, options): sequential quadratic programming with a quasi-Newton Hessian.
//
// One iteration at x (all in the scaled space of scaled-problem.ts):
//  1. subproblem.ts   the QP at x (relaxed when incompatible); a row outside the screen that the
//                     full step violates joins the screen and the QP is solved again
//  2. termination.ts  the KKT measure with the QP's multipliers; stop when converged or out of budget
//  3. merit.ts        l1 exact-penalty merit, penalty update, backtracking with one second-order
//                     correction
//  4. step.ts         accept: new derivatives, damped BFGS update
// start.ts projects and scales the start and finds the first multipliers; result.ts maps the
// answer back to user units. Every tolerance and budget is named in thresholds.ts.
// Other ends: iteration or time limit and no-progress -> "not-converged" with the best point
// (lowest objective among feasible iterates, else the least violation); elastic mode that can
// no longer reduce the violation -> "infeasible" with the least-violation point; a non-finite
// value from the user's functions (or a throw) -> "failed" naming the function and the point.
// Every iterate is inside the bounds (x0 is projected, trial points are clipped).
import type { QpOutput } from "./dual-qp";
import { type FullTrial, type MeritStep, lineSearch, meritStep, trialPoint } from "./merit";
import { buildResult, failedAtIterate, infeasibleResult, recordIteration } from "./result";
import { evaluateTrial } from "./restoration";
import { startRun } from "./start";
import { type SqpContext, type SqpState, abortError, considerSnapshot, l1Violation, maxViolation, throwIfAborted } from "./state";
import { takeStep } from "./step";
import { qpMultipliers, rememberActive, screenedRows, solveCompatibleSubproblem } from "./subproblem";
import { atNoiseFloor, elasticShowsInfeasible, recordKkt, setMultipliers, shouldStopBeforeStep, stopReason } from "./termination";
import { ELASTIC_INFEASIBLE_RELAXATION, MAX_SCREEN_EXPANSIONS } from "./thresholds";
import type { SqpOptions, SqpProblem, SqpResult } from "./types";

export function minimize(problem: SqpProblem, options: SqpOptions = {}): SqpResult {
  const started = performance.now();
  if (options.signal?.aborted) throw abortError();
  const run = startRun(problem, options, started);
  if (!("ctx" in run)) return run;
  const { ctx, state } = run;
  if (state.kkt <= ctx.tol) {
    recordIteration(ctx, state, 0, 0, 0, false);
    return buildResult(ctx, state, { kind: "optimal", tolerance: ctx.tol, maxViolation: maxViolation(state.pt.eqRaw, state.pt.ineqRaw), iterations: 0 }, 0);
  }

  for (;;) {
    throwIfAborted(ctx);
    const sub = subproblemWithScreen(ctx, state);
    if (typeof sub === "string") return failedAtIterate(ctx, state, sub);
    const { qp, elastic, rowsIn, merit, full } = sub;
    rememberActive(ctx, state, state.mult);
    const snap = { x: Float64Array.from(state.x), pt: state.pt, mult: state.mult, kkt: state.kkt, viol: maxViolation(state.pt.ce, state.pt.ci) };
    considerSnapshot(ctx, state, snap);
    recordIteration(ctx, state, state.iteration, state.lastStep, qp.active.length, elastic);

    const stop = stopReason(ctx, state, merit, elastic);
    if (stop) return buildResult(ctx, stop.atBest ? state.best : snap, stop.reason, state.iteration);
    recordKkt(state);
    const relaxation = elastic ? qp.s[ctx.n] : 0;
    if (elasticShowsInfeasible(state, elastic, relaxation, l1Violation(state.pt))) return infeasibleResult(ctx, state);

    const accepted = lineSearch(ctx, state, qp.s.subarray(0, ctx.n), merit as MeritStep, full, rowsIn, qp, elastic);
    if (typeof accepted === "string") return failedAtIterate(ctx, state, accepted);
    if (!accepted) {
      if (state.updatesSinceReset > 0) {
        // the quasi-Newton matrix may be poor: restart it and try this iteration again
        ctx.B.reset();
        state.updatesSinceReset = 0;
        continue;
      }
      // infeasible only when the relaxation itself could not reduce the violation
      if (elastic && relaxation > ELASTIC_INFEASIBLE_RELAXATION) return infeasibleResult(ctx, state);
      return buildResult(ctx, state.best, { kind: "no-progress", iterations: state.iteration, feasible: state.best.viol <= ctx.tol }, state.iteration);
    }
    const failed = takeStep(ctx, state, accepted, elastic);
    if (failed) return failedAtIterate(ctx, state, failed);
  }
}

/**
 * This iteration's subproblem with its multipliers set in the state. Unless the run stops here,
 * also the merit step and the full step's trial point; a row outside the screen that the full
 * step violates joins the screen and the subproblem is solved again (a few times at most).
 */
function subproblemWithScreen(ctx: SqpContext, state: SqpState):
  | { qp: QpOutput; elastic: boolean; rowsIn: Int32Array; merit: MeritStep | null; full: FullTrial | null }
  | string {
  const { sp, n, nIneq } = ctx;
  let rowsIn = screenedRows(state);
  for (let expansions = 0; ; ) {
    const solved = solveCompatibleSubproblem(ctx, state, rowsIn);
    if (typeof solved === "string") return solved;
    const { qp, elastic } = solved;
    const s = qp.s.subarray(0, n);
    setMultipliers(ctx, state, qpMultipliers(ctx, qp, rowsIn));
    const done = { qp, elastic, rowsIn, merit: null, full: null };
    if (shouldStopBeforeStep(ctx, state)) return done;
    const merit = meritStep(ctx, state, s, rowsIn, elastic);
    if (!elastic && atNoiseFloor(ctx, state, merit.D, merit.phi0)) return { ...done, merit };

    // full-step trial (also used to widen the screen)
    const xt = trialPoint(ctx, state.x, s, 1);
    throwIfAborted(ctx);
    const ev = evaluateTrial(ctx, xt);
    const full: FullTrial = { x: xt, pt: ev.ok ? ev.value : null };
    if (!ev.ok || expansions >= MAX_SCREEN_EXPANSIONS || !Number.isFinite(ctx.screening)) return { ...done, merit, full };
    const add: number[] = [];
    for (let i = 0; i < nIneq; i++) if (!state.inScreen[i] && ev.value.ci[i] > 0) add.push(i);
    if (add.length === 0) return { ...done, merit, full };
    expansions++;
    for (const i of add) state.inScreen[i] = 1;
    const extra = sp.derivatives(state.x, Int32Array.from(add));
    if (!extra.ok) return extra.message;
    for (const i of add) state.dv.ji[i] = extra.value.ji[i];
    rowsIn = screenedRows(state);
    rememberActive(ctx, state, state.mult); // the re-solve starts from this solve's active set
  }
}
