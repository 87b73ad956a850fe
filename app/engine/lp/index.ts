// The LP module: a small solver interface, its HiGHS implementation, the plastic-design LP of a
// truss (a proven lower bound on the least mass, and a near-optimal layout for ground
// structures), the bound beside a result, and the clean layout built from it.
export type { LinearProgram, LpSolution, LpSolver, LpStatus } from "./solver";
export { loadHighsSolver } from "./highs";
export { solvePlasticDesign, type PlasticDesign, type PlasticDesignInput, type PlasticCase } from "./plastic";
export { plasticInputFromModel, checkedCases, weightPerMass, resultCoords } from "./from-model";
export { lowerBoundForResult, withLowerBound, attachLowerBound, plasticDesignBeforeRun, runUsesLp, boundWithheldWithoutLp, type BoundOutcome } from "./lower-bound";
export { predictVanishingMembers, vanishingMembers, type VanishingPrediction } from "./predict";
export { cleanLayout, type CleanLayout, type CleanLayoutOptions } from "./clean-layout";
