// The HiGHS implementation of LpSolver (the `highs` npm package: HiGHS compiled to
// WebAssembly). The runtime is instantiated once per thread and reused: loading costs about
// 0.1-0.7 s, a small solve a few milliseconds. The LP is handed over as sparse columns through
// HiGHS's structured model API rather than as LP text, and solved by the interior-point method
// without crossover: on ground structures of 2,500 members it is several times faster than the
// simplex method (bench/lp.bench.ts measures both, and the text form; decision 0012). When the
// interior-point method ends without a verdict the simplex method tries once more.
import type { LinearProgram, LpSolution, LpSolver } from "./solver";

type HighsRuntime = Awaited<ReturnType<(typeof import("highs"))["default"]>>;

let runtime: Promise<HighsRuntime> | null = null;

/** The thread's HiGHS solver, loaded on first use (every later call returns the same one). */
export async function loadHighsSolver(): Promise<LpSolver> {
  runtime ??= import("highs").then((m) => m.default());
  try {
    return highsSolver(await runtime);
  } catch (e) {
    runtime = null; // a failed load is retried next time instead of being remembered
    throw e;
  }
}

function highsSolver(h: HighsRuntime): LpSolver {
  const codes = h.constants.modelStatus;
  const inf = (v: number) =>
    v === Infinity ? h.infinity : v === -Infinity ? -h.infinity : v;
  const mapInf = (a: Float64Array) => Float64Array.from(a, inf);
  return {
    name: "HiGHS",
    version: h.version.string,
    solve(lp: LinearProgram, options = {}): LpSolution {
      if (lp.nCols === 0) return withoutColumns(lp);
      const first = run(lp, options, INTERIOR);
      return first.status === "failed" ? run(lp, options, SIMPLEX) : first;
    },
  };

  function run(
    lp: LinearProgram,
    options: { timeLimitS?: number },
    method: Record<string, string>,
  ): LpSolution {
    const model = h.createModel();
    try {
      // native output is already silent (the loader is given no print function)
      model.options.set(method);
      if (options.timeLimitS !== undefined)
        model.options.set("time_limit", options.timeLimitS);
      model.passModel({
        numCols: lp.nCols,
        numRows: lp.nRows,
        colCost: lp.cost,
        colLower: mapInf(lp.colLower),
        colUpper: mapInf(lp.colUpper),
        rowLower: mapInf(lp.rowLower),
        rowUpper: mapInf(lp.rowUpper),
        matrix: {
          format: "csc",
          numRows: lp.nRows,
          numCols: lp.nCols,
          starts: lp.matrix.starts,
          indices: lp.matrix.rows,
          values: lp.matrix.values,
        },
      });
      model.run();
      const status = model.getModelStatus();
      if (status === codes.optimal) {
        return {
          status: "optimal",
          detail: "optimal",
          objective: model.getObjectiveValue(),
          x: Float64Array.from(model.getSolution().colValue),
        };
      }
      const none = new Float64Array(0);
      if (status === codes.infeasible)
        return {
          status: "infeasible",
          detail: "the constraints cannot all hold",
          objective: NaN,
          x: none,
        };
      if (status === codes.unbounded)
        return {
          status: "unbounded",
          detail: "the objective has no lower limit",
          objective: NaN,
          x: none,
        };
      if (status === codes.unboundedOrInfeasible) {
        return {
          status: "infeasible",
          detail:
            "the constraints cannot all hold, or the objective has no lower limit",
          objective: NaN,
          x: none,
        };
      }
      return {
        status: "failed",
        detail: `HiGHS stopped with model status ${status} (${statusName(codes, status)})`,
        objective: NaN,
        x: none,
      };
    } finally {
      model.dispose();
    }
  }
}

/** HiGHS calls a model without columns "empty" without looking at its rows: each row must admit 0. */
function withoutColumns(lp: LinearProgram): LpSolution {
  for (let r = 0; r < lp.nRows; r++) {
    if (lp.rowLower[r] > 0 || lp.rowUpper[r] < 0) return { status: "infeasible", detail: "no variables, and a row that needs a non-zero value", objective: NaN, x: new Float64Array(0) };
  }
  return { status: "optimal", detail: "optimal", objective: 0, x: new Float64Array(0) };
}

const INTERIOR = { solver: "ipm", run_crossover: "off" };
const SIMPLEX = { solver: "simplex" };

function statusName(codes: Record<string, number>, status: number): string {
  return Object.entries(codes).find(([, v]) => v === status)?.[0] ?? "unknown";
}
