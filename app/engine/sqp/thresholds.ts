// Every iteration budget and tolerance of the SQP driver, in one place (all in the scaled space
// of scaled-problem.ts). The quadratic subproblem's own tolerances sit with it in dual-qp.ts.

// ---- budgets and defaults (SqpOptions) ----
/** options.tolerance: the scaled KKT tolerance. */
export const DEFAULT_TOLERANCE = 1e-8;
/** options.maxIterations: major (SQP) iterations. */
export const DEFAULT_MAX_ITERATIONS = 200;
/** Dense BFGS up to this many variables (of the Hessian's space), limited memory above. */
export const DENSE_BFGS_MAX_VARIABLES = 400;
/** options.memory: limited-memory BFGS pairs kept. */
export const DEFAULT_LBFGS_MEMORY = 10;
/** Times per iteration the screen may widen for rows the full step violates. */
export const MAX_SCREEN_EXPANSIONS = 5;

// ---- scaling (scaled-problem.ts) ----
/**
 * Largest scale of an inequality row (1/|scaled gradient| at the start otherwise). A limit far
 * from binding at the start has a small gradient, and amplified by its inverse (up to 1e8) its
 * violations outweighed every other row in the merit: on a 192-member ungrouped buckling grid
 * (seeded random truss 126, large) the line search cut every step to about 1e-3 and the run
 * stopped after 1,173 iterations above the optimum. Capped at 10: 60 iterations to the scipy
 * SLSQP optimum (capped at 1: 21, but one ten-bar re-solve of criterion-costs.test.ts, deflection
 * limit 0.1 % off, then ended at another local optimum). The Hock–Schittkowski table is unchanged.
 */
export const MAX_INEQUALITY_SCALE = 10;

// ---- first multipliers ----
/** A row or bound within max(tol, this) of its limit at the start joins the least-squares fit. */
export const START_ACTIVE_TOLERANCE = 1e-6;

// ---- KKT measure and termination ----
/** Stationarity is divided by max(1, mean |multiplier| / this) (relative to the multipliers' size). */
export const STATIONARITY_MULTIPLIER_SCALE = 100;
/**
 * Predicted merit decrease, relative to 1 + |merit|, below which no line search can verify
 * progress: with feasibility and complementarity to tol and stationarity to sqrt(tol) the point
 * is optimal to the precision rounding allows.
 */
export const NOISE_FLOOR_DECREASE = 1e-13;
/**
 * ... and only when the KKT measure is stuck: it has not fallen below NOISE_FLOOR_FALL times
 * its value NOISE_FLOOR_WINDOW iterations earlier (tests/engine/sqp/noise-floor.test.ts).
 */
export const NOISE_FLOOR_WINDOW = 3;
export const NOISE_FLOOR_FALL = 0.1;

// ---- merit function (l1 exact penalty) ----
/** rho_req is at least this multiple of the largest multiplier. */
export const PENALTY_MARGIN = 1.1;
/** Smallest penalty parameter. */
export const PENALTY_FLOOR = 1e-8;
/** The step must remove this share of the linearized violation before it sets the penalty. */
export const VIOLATION_REDUCTION_SHARE = 0.1;
/** Share of the linearized violation decrease the penalty must turn into merit descent. */
export const DESCENT_SHARE = 0.7;

// ---- line search ----
/** Armijo's sufficient-decrease factor on the merit's directional derivative. */
export const ARMIJO = 1e-4;
/** Scaled l1 violation below which a point counts as feasible to rounding. */
export const FEASIBLE_NOISE = 1e-11;
/** Relative rounding noise of a merit or objective value. */
export const MERIT_NOISE = 1e-14;
/** A predicted decrease within this many noise units is below what the merit can resolve. */
export const BELOW_NOISE_FACTOR = 10;
/** Backtracking ends below this step length. */
export const MIN_STEP_LENGTH = 1e-10;
/** A step of infinity norm below this is no step. */
export const MIN_STEP_NORM = 1e-15;
/** Safeguards of the quadratic interpolation: next alpha within [low, high] times the last. */
export const BACKTRACK_LOW = 0.1;
export const BACKTRACK_HIGH = 0.5;
/** Shrink factor after a trial point where the functions returned no finite value. */
export const NON_FINITE_SHRINK = 0.1;

// ---- elastic mode and infeasibility ----
/** Curvature of the relaxation variable, times a size estimate of B (elastic.ts). */
export const ELASTIC_WEIGHT = 1e6;
/** Relaxation variable at least this is "fully relaxed". */
export const ELASTIC_FULL_RELAXATION = 1 - 1e-6;
/** Fully relaxed this many iterations in a row: infeasible. */
export const ELASTIC_STUCK_ITERATIONS = 3;
/** Elastic iterations over which the violation must fall by the ratio below. */
export const ELASTIC_STALL_WINDOW = 30;
export const ELASTIC_STALL_RATIO = 0.99;
/** A failed line search in elastic mode relaxed by more than this: infeasible. */
export const ELASTIC_INFEASIBLE_RELAXATION = 0.5;

// ---- products with the dense quasi-Newton matrix (dense-bfgs.ts) ----
/**
 * B v for a v with at most this share of nonzero entries reads B's columns (contiguous for
 * each nonzero), above it B's rows. The BFGS update keeps B symmetric only to rounding, so the
 * two differ in the last bits, and chaotic runs follow them (with every product reading rows
 * and the reduced inverse rebuilt exactly symmetric, the buckling tower of single-start.test.ts
 * took 615 nested iterations, not 281, to a design 0.03 % heavier): the share is kept where it
 * has been.
 */
export const B_COLUMN_PRODUCT_SHARE = 0.25;
/**
 * Above the column share, a product with at most this share of nonzeros sums over them alone;
 * above it the plain dense loop is faster. Speed only: a skipped term is an exact zero, so the
 * bits are the dense loop's.
 */
export const SPARSE_PRODUCT_SHARE = 0.5;
