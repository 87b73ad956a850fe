// The small interface every LP solver behind the plastic-design bound implements, so the
// solver can be swapped without touching the truss code. Plain data in, plain data out.
//
//   minimize  cost . x   subject to  rowLower <= A x <= rowUpper,  colLower <= x <= colUpper
//
// A is given column by column (compressed sparse columns), the natural form for truss LPs where
// each column (a member force or an area) touches a handful of rows.

export interface LinearProgram {
  nCols: number;
  nRows: number;
  cost: Float64Array;
  colLower: Float64Array; // -Infinity allowed
  colUpper: Float64Array; // +Infinity allowed
  rowLower: Float64Array;
  rowUpper: Float64Array;
  /** compressed sparse columns: column j's entries are starts[j] .. starts[j+1]-1 */
  matrix: { starts: Int32Array; rows: Int32Array; values: Float64Array };
}

export type LpStatus = "optimal" | "infeasible" | "unbounded" | "failed";

export interface LpSolution {
  status: LpStatus;
  /** the solver's own words for the outcome (shown only on "failed") */
  detail: string;
  objective: number;
  x: Float64Array; // empty unless optimal
}

export interface LpSolver {
  name: string;
  version: string;
  solve(lp: LinearProgram, options?: { timeLimitS?: number }): LpSolution;
}
