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

/** What the engineer can change about a design, as criterionCosts groups the multipliers. */
export type CriterionKind =
  | "allowable-tension" // a material's allowableTension
  | "allowable-compression" // a material's allowableCompression
  | "deflection" // one entry of design.constraints.displacement
  | "volume" // design.constraints.volume.max
  | "buckling-length" // the bucklingFactor of one area variable's members (group, or ungrouped member)
  | "min-size" // a minimum area: areaBounds.min, or a group's own min
  | "max-size" // a maximum area: areaBounds.max, or a group's own max
  | "shape-range"; // the range min..max of one shape variable

/** One limit or bound that binds inside a criterion: where, and what relaxing only it would save. */
export interface CriterionPlace {
  member?: string;
  node?: string;
  axis?: "x" | "y" | "z";
  /** load case or combination of the limit */
  case?: string;
  /** area variable (group id, or the member id of an ungrouped member) of a size bound */
  variable?: string;
  saving: number;
}

/**
 * The first-order objective saving of relaxing one design criterion by 1 % (sensitivity theorem:
 * the sum over its binding limits of multiplier times the change of the limit), the form
 * "relaxing the allowable stress of S355 by 1 % would save about 3.1 kg, 0.5 %".
 */
export interface CriterionCost {
  /** e.g. "allowable-tension:S355", "deflection:0", "volume", "buckling-length:top-chord", "min-size:*", "min-size:diagonals" */
  id: string;
  kind: CriterionKind;
  /** material name (or id), group or member id, shape variable id; "*" for the model-wide area bound */
  subject: string;
  /** the criterion's value in model units: stress, length, volume, area, or the bucklingFactor (1 = the member length) */
  value: number;
  /** unit of value, e.g. "MPa" (stress as app/engine/truss/units.ts spells it), "mm", "mm³", "mm²", "" */
  unit: string;
  /** a deflection criterion: the node ("*" every node) and axis as written */
  node?: string;
  axis?: "x" | "y" | "z" | "all";
  /** objective units saved by relaxing it 1 % (raising a limit, lowering a minimum, shortening a buckling length, widening a shape range by 1 % of itself); 0 when it does not bind */
  saving: number;
  /** saving / objective.final */
  share: number;
  /** binding limits or bounds it holds */
  count: number;
  /** the binding places, largest saving first, at most CRITERION_PLACES of them */
  places: CriterionPlace[];
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

/** The worst displacement of one load case or combination, against its deflection limit. */
export interface DeflectionSummary {
  /** load case or combination id */
  case: string;
  /** whether the deflection limits apply to it (service combinations, else every load case) */
  checked: boolean;
  /** the largest displacement component over the free nodes */
  largest: { node: string; axis: "x" | "y" | "z"; value: number };
  /** the limited coordinate closest to its limit (checked responses of a model with deflection limits) */
  governing?: { node: string; axis: "x" | "y" | "z"; value: number; limit: number; ratio: number; spec: number };
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
  /** what each design criterion costs, largest saving first (criterion-costs.ts) */
  criterionCosts?: CriterionCost[];
  /** catalogue sizing: the criterion costs are those of the continuous optimum it started from */
  criterionCostsOf?: "continuous optimum";
  /** per load case and combination: the worst displacement against its limit (deflection-summary.ts) */
  deflections?: DeflectionSummary[];
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
  /**
   * Limits the run checks that the bound leaves out (mass objective): they can only add mass,
   * so with them the bound is looser and a large gap is expected.
   */
  leftOut?: ("displacement" | "buckling" | "volume")[];
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
