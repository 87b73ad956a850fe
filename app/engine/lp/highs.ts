// The HiGHS implementation of LpSolver (the `highs` npm package: HiGHS compiled to
// WebAssembly). The runtime is instantiated once per thread and reused, and warmed by two tiny
// solves as it loads: the WebAssembly functions are compiled on their first call, which made
// the first real solve in a thread cost 0.2 s where later ones cost a millisecond. The LP is
// handed over as sparse columns through HiGHS's structured model API rather than as LP text.
// Small LPs are solved by the simplex method (a millisecond on the ten-bar, and a vertex: exact
// zeros), large ones by the interior-point method without crossover: on ground structures of
// 2,500 members with two load cases it is ten times faster than the simplex method
// (bench/lp.bench.ts measures both, and the text form; decision 0012). When the first method
// ends without a verdict the other tries once more.
import type { LinearProgram, LpSolution, LpSolver } from "./solver";

type HighsRuntime = Awaited<ReturnType<(typeof import("highs"))["default"]>>;

let runtime: Promise<HighsRuntime> | null = null;

/** The thread's HiGHS solver, loaded on first use (every later call returns the same one). */
export async function loadHighsSolver(): Promise<LpSolver> {
  runtime ??= import("highs").then((m) => m.default()).then(warmed);
  try {
    return highsSolver(await runtime);
  } catch (e) {
    runtime = null; // a failed load is retried next time instead of being remembered
    throw e;
  }
}

function highsSolver(h: HighsRuntime): LpSolver {
  return {
    name: "HiGHS",
    version: h.version.string,
    solve(lp: LinearProgram, options = {}): LpSolution {
      if (lp.nCols === 0) return withoutColumns(lp);
      const [method, fallback] =
        lp.nCols < INTERIOR_FROM_COLUMNS
          ? [SIMPLEX, INTERIOR]
          : [INTERIOR, SIMPLEX];
      const first = run(h, lp, options, method);
      return first.status === "failed" ? run(h, lp, options, fallback) : first;
    },
  };
}

/** One HiGHS model per runtime, emptied after every solve: making one sets up every option afresh, a measurable share of a small solve. */
const threadModels = new WeakMap<
  HighsRuntime,
  ReturnType<HighsRuntime["createModel"]>
>();

function run(
  h: HighsRuntime,
  lp: LinearProgram,
  options: { timeLimitS?: number },
  method: Record<string, string>,
): LpSolution {
  let model = threadModels.get(h);
  if (!model) {
    model = h.createModel();
    threadModels.set(h, model);
  }
  try {
    // output_flag off: HiGHS then does not even format its log lines (the loader prints nothing anyway)
    model.options.set({
      ...method,
      output_flag: false,
      time_limit: options.timeLimitS ?? NO_TIME_LIMIT,
    });
    model.passModel({
      numCols: lp.nCols,
      numRows: lp.nRows,
      colCost: lp.cost,
      colLower: finite(h, lp.colLower),
      colUpper: finite(h, lp.colUpper),
      rowLower: finite(h, lp.rowLower),
      rowUpper: finite(h, lp.rowUpper),
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
    const outcome = readOutcome(h, model);
    // the LP's arrays are freed between solves; the next solve starts from no basis
    model.clearModel();
    model.clearSolver();
    return outcome;
  } catch (e) {
    // a model that failed mid-solve is not trusted again
    threadModels.delete(h);
    model.dispose();
    throw e;
  }
}

/** HiGHS's own infinity in place of +-Infinity. */
function finite(h: HighsRuntime, a: Float64Array): Float64Array {
  return Float64Array.from(a, (v) =>
    v === Infinity ? h.infinity : v === -Infinity ? -h.infinity : v,
  );
}

function readOutcome(
  h: HighsRuntime,
  model: ReturnType<HighsRuntime["createModel"]>,
): LpSolution {
  const codes = h.constants.modelStatus;
  const status = model.getModelStatus();
  const none = new Float64Array(0);
  if (status === codes.optimal) {
    return {
      status: "optimal",
      detail: "optimal",
      objective: model.getObjectiveValue(),
      x: Float64Array.from(model.getSolution().colValue),
    };
  }
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
}

/** HiGHS calls a model without columns "empty" without looking at its rows: each row must admit 0. */
function withoutColumns(lp: LinearProgram): LpSolution {
  for (let r = 0; r < lp.nRows; r++) {
    if (lp.rowLower[r] > 0 || lp.rowUpper[r] < 0)
      return {
        status: "infeasible",
        detail: "no variables, and a row that needs a non-zero value",
        objective: NaN,
        x: new Float64Array(0),
      };
  }
  return {
    status: "optimal",
    detail: "optimal",
    objective: 0,
    x: new Float64Array(0),
  };
}

const INTERIOR = { solver: "ipm", run_crossover: "off" };
const SIMPLEX = { solver: "simplex" };
/**
 * LPs with this many columns or more go to the interior-point method first. Measured (CPU time,
 * bench/lp.bench.ts's ground structures): below about a thousand columns the simplex method is
 * as fast or faster; at 7,700 columns (2,560 members, two cases) it is ten times slower.
 */
const INTERIOR_FROM_COLUMNS = 1000;

/**
 * The runtime after a few small solves by each method, so no real solve pays for compiling the
 * code they share (an LP like the ten-bar's: a few equilibrium rows, tension and compression
 * columns, one of them unused at the optimum).
 */
function warmed(h: HighsRuntime): HighsRuntime {
  // minimize x0 + x1 + 2 x2 + 3 x3 subject to x0 - x1 + x2 = 1, x1 + x3 = 0.5, 0 <= x2 <= 4, x >= 0
  const small: LinearProgram = {
    nCols: 4,
    nRows: 2,
    cost: Float64Array.of(1, 1, 2, 3),
    colLower: new Float64Array(4),
    colUpper: Float64Array.of(Infinity, Infinity, 4, Infinity),
    rowLower: Float64Array.of(1, 0.5),
    rowUpper: Float64Array.of(1, 0.5),
    matrix: {
      starts: Int32Array.of(0, 1, 3, 4, 5),
      rows: Int32Array.of(0, 0, 1, 0, 1),
      values: Float64Array.of(1, -1, 1, 1, 1),
    },
  };
  for (let k = 0; k < WARM_UP_SOLVES; k++)
    for (const method of [SIMPLEX, INTERIOR]) run(h, small, {}, method);
  return h;
}
const WARM_UP_SOLVES = 3;

function statusName(codes: Record<string, number>, status: number): string {
  return Object.entries(codes).find(([, v]) => v === status)?.[0] ?? "unknown";
}

/** No time limit: HiGHS's default is infinite, but the package accepts only finite option values. */
const NO_TIME_LIMIT = Number.MAX_VALUE;
