// Taking an accepted step: the screen at the new point, its derivatives, and the damped
// quasi-Newton update with the change of the Lagrangian gradient at the new multipliers
// (the reduced pair (s_d, Z'y) with state equations).
import type { AcceptedStep } from "./merit";
import { reduceVector } from "./reduced-space";
import { type SqpContext, type SqpState, axpyRow } from "./state";
import { rescreen, screenedRows } from "./subproblem";

/** Moves the state to the accepted point; a sentence when the derivatives there failed. */
export function takeStep(ctx: SqpContext, state: SqpState, accepted: AcceptedStep, elastic: boolean): string | null {
  const { sp, n, nB, nEq, nIneq, B, stateEq } = ctx;
  const { x, dv, mult } = state;
  const xNew = accepted.x;
  rescreen(ctx, state, accepted.pt, mult.ineq);
  const dNew = sp.derivatives(xNew, screenedRows(state));
  if (!dNew.ok) return dNew.message;
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
      const fac = ctx.stateFactorAt(x);
      if (typeof fac === "string") return fac;
      pair = [step.subarray(0, nB), reduceVector(fac, dv.je, y, nB, n)];
    }
    if (B.update(pair[0], pair[1]) !== "skipped") state.updatesSinceReset++;
  }
  state.x = xNew;
  state.pt = accepted.pt;
  state.dv = dNew.value;
  state.lastStep = accepted.alpha;
  state.iteration++;
  return null;
}
