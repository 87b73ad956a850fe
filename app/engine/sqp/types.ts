// Public types of the SQP solver (contract: docs/engine-api.md, "app/engine/sqp").

/** A sparse Jacobian row: value[k] is the derivative with respect to variable index[k]. */
export type SparseRow = { index: Int32Array; value: Float64Array };
/** A Jacobian row, dense (length n) or sparse. */
export type Row = Float64Array | SparseRow;

export interface SqpProblem {
  n: number;
  x0: ArrayLike<number>;
  /** Per-variable bounds; +-Infinity (or a missing array) means unbounded. */
  lower?: ArrayLike<number>;
  upper?: ArrayLike<number>;
  nEq?: number;
  nIneq?: number;
  /** Constraint convention: eq = 0, ineq <= 0. Values for ALL rows every call. */
  evaluate(x: Float64Array): { f: number; eq?: Float64Array; ineq?: Float64Array };
  /** Gradient, all equality rows, and the inequality rows listed in ineqRows (in that order). */
  derivatives(x: Float64Array, ineqRows: Int32Array): { grad: Float64Array; eq?: Row[]; ineq?: Row[] };
  names?: { variables?: string[]; eq?: (i: number) => string; ineq?: (i: number) => string };
  /**
   * Optional structure: the equalities are state equations c(d, y) = 0 with the states y the
   * last nEq variables (unbounded) and dc/dy square and nonsingular. The solver then takes
   * null-space steps (see reduced-space.ts): the quadratic subproblem is solved over the design
   * variables d only, and each iteration costs solves with dc/dy instead of dense work on y.
   */
  stateEquations?: StateEquations;
}

export interface StateEquations {
  /** Variables 0..nDesign-1 are the design; nDesign..n-1 the states (n - nDesign === nEq). */
  nDesign: number;
  /**
   * c is affine in the states for fixed design (equilibrium K(d) y = f(d) is): one solve with
   * dc/dy then meets c = 0 exactly, and the solver restores the states of every trial point
   * that way before reading it (restoration.ts). Default false.
   */
  linearInStates?: boolean;
  /**
   * Optional: c at x alone (user units, the values evaluate returns as eq), for the restoration
   * of a trial point, which needs c before its states are re-solved and everything after; a
   * problem whose inequality rows cost more than its equalities saves their evaluation there.
   */
  residual?(x: Float64Array): Float64Array;
  /** Factors dc/dy at x (user units): solves with it and with its transpose (length nEq). */
  factor(x: Float64Array): { solve(rhs: Float64Array): Float64Array; solveTransposed(rhs: Float64Array): Float64Array };
}

export interface SqpProgress {
  iteration: number;
  f: number;
  maxViolation: number;
  kktResidual: number;
  step: number;
  /** Current l1 penalty parameter of the merit function (scaled units). */
  penalty: number;
  /** Number of constraints (rows and bounds) active in the last quadratic subproblem. */
  active: number;
  evaluations: number;
  /** True when the last subproblem had to relax incompatible linearized constraints. */
  elastic: boolean;
}

export interface SqpOptions {
  /** Major (SQP) iterations; default 200. */
  maxIterations?: number;
  /** Scaled KKT tolerance; default 1e-8 (see termination.ts). */
  tolerance?: number;
  timeLimitMs?: number;
  /** Default: "bfgs" up to 400 variables, "lbfgs" above. */
  hessian?: "bfgs" | "lbfgs";
  /** L-BFGS pairs kept; default 10. */
  memory?: number;
  /** Scaled activity threshold for inequality rows; default Infinity (every row linearized). */
  screening?: number;
  /** With problem.stateEquations: null-space steps (default true); false solves the full QP. */
  reducedSpace?: boolean;
  /**
   * With problem.stateEquations declared linearInStates: every trial point's states are
   * re-solved from the state equations before the merit reads it (default true; restoration.ts).
   */
  restoreStates?: boolean;
  signal?: AbortSignal;
  /**
   * Asked between iterations: true ends the run like the iteration cap does, returning the
   * best point so far (a cancel that keeps the design; the AbortSignal throws it away).
   */
  stopRequested?: () => boolean;
  onProgress?: (p: SqpProgress) => void;
}

export type SqpStatus = "optimal" | "not-converged" | "infeasible" | "failed";

export interface SqpHistoryEntry {
  iteration: number;
  f: number;
  maxViolation: number;
  kktResidual: number;
  step: number;
}

export interface SqpResult {
  status: SqpStatus;
  message: string;
  hint: string;
  x: Float64Array;
  f: number;
  eq: Float64Array;
  ineq: Float64Array;
  /** Sign convention: grad f + J_eq' eq + J_ineq' ineq - lower + upper = 0, ineq/lower/upper >= 0. */
  multipliers: { eq: Float64Array; ineq: Float64Array; lower: Float64Array; upper: Float64Array };
  iterations: number;
  evaluations: number;
  derivativeEvaluations: number;
  kktResidual: number;
  maxViolation: number;
  history: SqpHistoryEntry[];
}
