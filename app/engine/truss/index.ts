// The truss model and analysis engine: pure functions on plain data (see docs/engine-api.md).
export * from "./schema";
export { buildStructure, caseLoads, freeDofs, memberLengths, axisIndex, type Structure } from "./structure";
export { combineVectors, ownWeightAdjoint, ownWeightLoads, responseFactors, responseSelfWeight, weightPerMass, STANDARD_GRAVITY, type CombinationData } from "./loading";
export { analyze, factorStiffness, memberForces, internalForces, type Analysis, type AnalyzeOptions, type StiffnessFactor } from "./analysis";
export { assembleStiffness, findMechanisms } from "./stiffness";
export { MechanismError, type MechanismInfo } from "./mechanism";
export { csrMultiply, csrGet, type CsrMatrix } from "./sparse/csr";
export { complianceGradient, displacementGradient, stressGradient, volumeGradient, massGradient, type Gradient } from "./sensitivities";
export { parseModel, parseModelText, type ParseResult, type ParseOptions } from "./validate";
export { type ModelIssue } from "./issues";
export { type ModelSummary } from "./summary";
export * as units from "./units";
export { convertUnit, unitLabel, type Quantity } from "./units";
export { analyzeModelToJson, type AnalysisReport } from "./report";
