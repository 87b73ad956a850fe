// The design engine: design problems from a model's `design` block, the nested and the
// simultaneous formulation, the result JSON with shadow prices and an independent re-analysis.
export { jobOptionsSchema, type JobOptions } from "./options";
export * from "./result-types";
export { optimizeModel } from "./optimize";
export { optimizeContinuous, summarizeResult, prepareRun, buildResult, type OptimizeOptions, type DesignProgress } from "./result";
export { buildDesignProblem, designState, DesignSetupError, type DesignProblem, type Limit } from "./problem";
export { nestedFormulation } from "./nested";
export { simultaneousFormulation } from "./simultaneous";
export { reanalyze } from "./verify";
export { analyseModel, type AnalysisResult } from "./analysis-result";
export { optimizeWithStarts, runStart, combineStarts, startCount, plannedStarts, startingDesigns, DEFAULT_STARTS } from "./multi-start";
