// The SQP solver: minimize(problem, options) -> SqpResult (contract: docs/engine-api.md).
export { minimize } from "./minimize";
export type { Row, SparseRow, SqpHistoryEntry, SqpOptions, SqpProblem, SqpProgress, SqpResult, SqpStatus } from "./types";
export { solveQp, qpKey, type QpInput, type QpOutput } from "./dual-qp";
export { GrowingCholesky } from "./growing-cholesky";
export { DenseBfgs } from "./dense-bfgs";
export { LimitedBfgs } from "./limited-bfgs";
export type { HessianApprox } from "./hessian";
export type { QpRow } from "./rows";
