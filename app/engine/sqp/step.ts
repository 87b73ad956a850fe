// Taking an accepted step: the screen at the new point, its derivatives, and the damped
// quasi-Newton update with the change of the Lagrangian gradient at the new multipliers
// (with state equations, the change of the reduced gradient Z'grad L between the two points).
import type { AcceptedStep } from "./merit";
import type { ScaledDerivatives } from "./scaled-problem";
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
      const reduced = reducedGradientChange(ctx, state, xNew, dNew.value);
      if (typeof reduced === "string") return reduced;
      pair = [step.subarray(0, nB), reduced];
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

/**
 * With state equations: Z(x+)' grad L(x+) - Z(x)' grad L(x), the change of the reduced gradient
 * at the new inequality multipliers, each point with its own null-space basis
 * Z = [I; -J_y^-1 J_d]. The equality rows drop out (Z' J_E' = 0 at either point), so their
 * multipliers need no weight. This is the nested formulation's own gradient change when both
 * points meet the state equations, as restored trial points do (restoration.ts). The earlier
 * pair Z(x)' (grad L(x+) - grad L(x)), one basis for both points, let the reduced Hessian lag
 * the design: the ten-bar took 63 iterations against the nested formulation's 29, its KKT
 * measure rising and falling in waves near the optimum.
 * The new point's factor is the one the next iteration uses, so the cost is two solves.
 */
function reducedGradientChange(ctx: SqpContext, state: SqpState, xNew: Float64Array, dNew: ScaledDerivatives): Float64Array | string {
  const { n, nB, nIneq } = ctx;
  const { x, dv, mult } = state;
  const lagrangianWithoutEqualities = (d: ScaledDerivatives): Float64Array => {
    const v = Float64Array.from(d.g);
    for (let i = 0; i < nIneq; i++) {
      const row = d.ji[i];
      if (mult.ineq[i] !== 0 && row) axpyRow(row, mult.ineq[i], v);
    }
    return v;
  };
  // the old point's factor first: it is the one at hand, and asking for the new one replaces it
  const before = ctx.stateFactorAt(x);
  if (typeof before === "string") return before;
  const old = reduceVector(before, dv.je, lagrangianWithoutEqualities(dv), nB, n);
  const after = ctx.stateFactorAt(xNew);
  if (typeof after === "string") return after;
  const now = reduceVector(after, dNew.je, lagrangianWithoutEqualities(dNew), nB, n);
  for (let j = 0; j < nB; j++) now[j] -= old[j];
  return now;
}
