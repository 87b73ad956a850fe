// The result JSON (docs/model-format.md, "Result files"), plus the fields Strutwise adds.
export type SolverStatus = "optimal" | "not-converged" | "infeasible" | "failed" | "analysed"; // analysed: an analysis-only run

export interface Units {
  length: string;
  force: string;
  mass: string;
}

export interface ResultMember {
  id: string;
  start?: string;
  end?: string;
  group?: string;
  area: number;
  /** catalogue sizing (or a model member with a section): the section's id */
  section?: string;
  length: number;
  force: Record<string, number>; // per load case and combination, tension positive
  stress: Record<string, number>;
  utilization: number; // worst ratio over its checks and load cases
  governing?: string; // which check gives that utilization, e.g. "stress:LC1" or "buckling:ULS-1"
  /** the load case or combination of that governing check */
  governingCase?: string;
  /** effective-length factor k of the buckling check */
  bucklingFactor?: number;
  plasticArea?: number; // the member's area in the least-mass LP design (lowerBound), model units
}

/** Support reactions of one supported node: x, y, z per load case and combination (0 on free axes). */
export interface ResultReaction {
  node: string;
  values: Record<string, [number, number, number]>;
}

/** The check that reactions balance the applied loads and own weight, per case or combination. */
export interface ReactionBalance {
  id: string; // load case or combination
  applied: [number, number, number]; // total applied load including own weight
  reactions: [number, number, number]; // total of the reactions
  /** |applied + reactions| / max(|applied|), largest component */
  residual: number;
}

export interface ResultCombination {
  id: string;
  name?: string;
  use: "strength" | "service";
  factors: Record<string, number>;
}

/** One area variable of a catalogue design and why it ended where it did. */
export interface CatalogueChoice {
  id: string; // group id, or the member id of an ungrouped member
  members: number;
  continuousArea: number;
  section: string;
  area: number;
  /**
   * the limit, checked by a full analysis, that a one-step lighter section would break, e.g.
   * "stress:AB:ULS-1"; "lightest" when no lighter section lies within the variable's bounds
   */
  steppedBy: string;
}

export interface CatalogueSizing {
  continuousObjective: number;
  /** status of the continuous optimization the search started from */
  continuousStatus: SolverStatus;
  /** objective of rounding every variable up and then repairing by stepping up (the floor) */
  roundedObjective: number;
  /** relative gap objective / continuousObjective - 1 */
  gap: number;
  /** full analyses the discrete search ran */
  analyses: number;
  choices: CatalogueChoice[];
}

export interface ResultNode {
  id: string;
  x: number;
  y: number;
  z: number;
  initial?: { x: number; y: number; z: number };
  fixed?: string[];
  displacement: Record<string, [number, number, number]>;
}

export interface ActiveConstraint {
  id: string; // e.g. "stress:AB:LC1", "displacement:C:y:LC2", "volume", "buckling:AB:LC1", "area-min:bottom-chord"
  multiplier: number; // objective change per unit relaxation of that limit, model units
}

export interface ShadowPrice {
  constraint: string;
  multiplier: number;
  unit: string; // e.g. "t per mm"
  sentence: string; // plain words for the engineer
}

export interface VerificationCheck {
  id: string;
  kind: "stress" | "displacement" | "buckling" | "volume" | "bounds" | "equilibrium";
  value: number;
  limit: number;
  ratio: number;
  ok: boolean;
}

export interface Verification {
  equilibriumResidual: number;
  maxUtilization: number;
  allLimitsMet: boolean;
  checked: number;
  failures: VerificationCheck[];
  worst: VerificationCheck[];
}

export interface HistoryEntry {
  iteration: number;
  objective: number;
  maxViolation: number;
  kktResidual: number;
}

export interface TrussResult {
  format: "strutwise.result";
  version: 1;
  model: string;
  units: Units;
  status: SolverStatus;
  message: string;
  hint?: string;
  formulation?: "nested" | "simultaneous";
  objective: { kind: "mass" | "compliance"; initial: number; final: number };
  iterations: number;
  analyses: number;
  kktResidual: number;
  maxViolation: number;
  volume: number;
  mass?: number;
  members: ResultMember[];
  nodes: ResultNode[];
  loadCases?: { id: string; name?: string; selfWeight?: number }[];
  combinations?: ResultCombination[];
  /** every supported node; always three components (z is 0 in 2D) */
  reactions?: ResultReaction[];
  reactionBalance?: ReactionBalance[];
  /** catalogue sizing: the continuous optimum it started from */
  continuousObjective?: number;
  catalogue?: CatalogueSizing;
  /** buckling with a model catalogue: the least-squares fit I = a A^b and its error over the sections */
  sectionFit?: { a: number; b: number; count: number; maxRelativeError: number; worstSection: string; rmsLogError: number };
  variables: { id: string; value: number }[];
  activeConstraints: ActiveConstraint[];
  shadowPrices?: ShadowPrice[];
  verification?: Verification;
  history: HistoryEntry[];
  solver?: { name: string; version: string; elapsedMs?: number };
  /** docs/model-format.md: a proven lower bound on the objective (app/engine/lp) */
  lowerBound?: LowerBound;
  /** why a result carries no lowerBound, in words (compliance without a volume limit, no stress checks, ...) */
  lowerBoundWithheld?: string;
  /** a run from several starting designs (multi-start.ts): which reached the design above */
  starts?: StartsSummary;
}

export interface LowerBound {
  value: number; // model mass units (compliance: force x length)
  gap: number; // objective / value - 1
  basis: string; // what the bound assumes, in words
  /** "final": taken at the final node positions of a shape run, valid for that geometry only */
  geometry?: "model" | "final";
}

export interface StartsSummary {
  tried: number;
  /** starts that ended, proved optimal, within 1e-4 of this design's objective */
  reachedBest: number;
  /** label of the start this design came from */
  best: string;
  /** e.g. "4 of 6 starts reached this design; the others stopped at 5,076.7 lb." */
  summary: string;
  runs: { label: string; status: SolverStatus; objective: number; iterations: number }[];
}

export interface JobSummary {
  objectiveKind: "mass" | "compliance";
  objectiveInitial: number;
  objectiveFinal: number;
  iterations: number;
  maxUtilization: number;
  status: SolverStatus;
  /** lowerBound.gap of the result (objective / bound - 1), when it has one */
  lowerBoundGap?: number;
}
