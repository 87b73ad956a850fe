// One sentence for the engineer and one hint of what to try, per way the solver can end.
export type StopReason =
  | { kind: "optimal"; tolerance: number; maxViolation: number; iterations: number; stationarity?: number }
  | { kind: "iteration-limit"; iterations: number; feasible: boolean }
  | { kind: "time-limit"; iterations: number; limitMs: number; feasible: boolean }
  | { kind: "no-progress"; iterations: number; feasible: boolean }
  | { kind: "stopped"; iterations: number; feasible: boolean }
  | { kind: "infeasible"; worst: string; violation: number }
  | { kind: "failed"; what: string };

function fmt(v: number): string {
  return v === 0 ? "0" : Math.abs(v) < 1e-3 ? v.toExponential(2) : v.toPrecision(3);
}

export function describeStop(r: StopReason): { message: string; hint: string } {
  const bestPoint = (feasible: boolean) =>
    feasible ? "the best feasible point found is returned" : "no point meeting every constraint was found yet; the least-violating point is returned";
  switch (r.kind) {
    case "optimal":
      if (r.stationarity !== undefined)
        return {
          message: `Converged in ${r.iterations} iterations to the precision rounding allows: every constraint is met (largest violation ${fmt(r.maxViolation)}) and the optimality conditions hold to ${fmt(r.stationarity)}; no further step can measurably improve the objective.`,
          hint: "Nothing to do; the last digits of the objective are at the level of its rounding.",
        };
      return {
        message: `Converged in ${r.iterations} iterations: the optimality conditions hold to ${fmt(r.tolerance)} and every constraint is met (largest violation ${fmt(r.maxViolation)}).`,
        hint: "Nothing to do; lower the tolerance if more digits are needed.",
      };
    case "iteration-limit":
      return {
        message: `Stopped at the limit of ${r.iterations} iterations before the optimality conditions were met; ${bestPoint(r.feasible)}.`,
        hint: "Allow more iterations, start from a better point, or check that the gradients match the functions.",
      };
    case "time-limit":
      return {
        message: `Stopped at the time limit of ${r.limitMs} ms after ${r.iterations} iterations; ${bestPoint(r.feasible)}.`,
        hint: "Allow more time, or use hessian: \"lbfgs\" and constraint screening for large problems.",
      };
    case "stopped":
      return {
        message: `Stopped on request after ${r.iterations} iterations, before the optimality conditions were met; ${bestPoint(r.feasible)}.`,
        hint: "Queue the run again to let it finish; start it from this design's areas to save the iterations already done.",
      };
    case "no-progress":
      return {
        message: `Stopped after ${r.iterations} iterations: no step could reduce the objective and constraint violation further, yet the optimality conditions are not met; ${bestPoint(r.feasible)}.`,
        hint: "This usually means inaccurate gradients or noisy functions: compare the derivatives with finite differences.",
      };
    case "infeasible":
      return {
        message: `The constraints cannot be met together near this point: the least violation reached leaves ${r.worst} off by ${fmt(r.violation)}.`,
        hint: "Relax that limit or widen the variable bounds, or start from another point if the problem may be feasible elsewhere.",
      };
    case "failed":
      return {
        message: r.what,
        hint: "Make the functions defined everywhere inside the bounds (or tighten the bounds to keep away from where they are not), and check the problem's declared sizes.",
      };
  }
}
