// Trial points with their states restored (problems that declare state equations).
//
// A step satisfies the state equations c(d, y) = 0 only to first order. Where they are bilinear
// in design and states (equilibrium K(A) u = f), a step that thins members leaves a residual
// c(d + s_d, y + s_y) = dK s_u that, relative to the loads, looks small although the
// displacements it stands for are far from those of the thinner structure. The merit then
// weighs that residual with a penalty set from the start's multipliers (about 1), accepts a step
// that removes most of the material while every limit, read at the stale states, still looks
// met, and the next subproblem has no feasible point (seeded random trusses 0, 16, 17, 23, 30
// and 31 of tests/support/random-trusses.ts in the simultaneous formulation).
//
// So before the merit reads a trial point its states are re-solved at the trial design: one
// Newton step y <- y - J_y^-1 c with J_y factored there, exact when c is linear in y (as
// equilibrium is in the displacements). The limits are then read at states that belong to the
// trial design, as the nested formulation reads them, and the penalty weighs true violations.
// The factor is the one the next iterate needs when the point is accepted, so a full step
// costs no extra factorization; each backtracking trial costs one.
import type { Checked, ScaledPoint } from "./scaled-problem";
import type { SqpContext } from "./state";

/** The functions at the trial point xt (scaled), its states re-solved in place first when the run restores states. */
export function evaluateTrial(ctx: SqpContext, xt: Float64Array): Checked<ScaledPoint> {
  if (!ctx.restoreStates) return ctx.sp.evaluate(xt);
  // the residual alone where the problem gives it (the limits are read once, after the
  // re-solve); else from a full evaluation, which is then returned when nothing is re-solved
  let ev: Checked<ScaledPoint> | null = null;
  let ce = ctx.sp.stateResidual(xt);
  if (!ce) {
    ev = ctx.sp.evaluate(xt);
    if (!ev.ok) return ev;
    ce = ev.value.ce;
  }
  const asIs = () => ev ?? ctx.sp.evaluate(xt);
  let residual = 0;
  for (let i = 0; i < ce.length; i++) residual = Math.max(residual, Math.abs(ce[i]));
  // not skipped below the feasibility tolerance: a residual of 1e-8 of the largest load can
  // still move a thin member's stress by 1e-4 of its limit, which the re-analysis then rejects
  if (residual === 0) return asIs();
  const factor = ctx.stateFactorAt(xt, true);
  // no factor at this design (a singular stiffness): the merit reads the point as it is
  if (typeof factor === "string") return asIs();
  const dy = factor.solve(Float64Array.from(ce, (v) => -v));
  const nD = ctx.n - ctx.nEq;
  for (let k = 0; k < dy.length; k++) xt[nD + k] += dy[k];
  return ctx.sp.evaluate(xt);
}
