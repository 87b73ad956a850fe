// The result JSON (truss-format.md, "Result"), plus the fields Strutwise adds.
export type SolverStatus = "optimal" | "not-converged" | "infeasible" | "failed";

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
  length: number;
  force: Record<string, number>; // per load case, tension positive
  stress: Record<string, number>;
  utilization: number; // worst ratio over its checks and load cases
  governing?: string; // which check gives that utilization, e.g. "stress:LC1"
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
  loadCases?: { id: string; name?: string }[];
  variables: { id: string; value: number }[];
  activeConstraints: ActiveConstraint[];
  shadowPrices?: ShadowPrice[];
  verification?: Verification;
  history: HistoryEntry[];
  solver?: { name: string; version: string; elapsedMs?: number };
}

export interface JobSummary {
  objectiveKind: "mass" | "compliance";
  objectiveInitial: number;
  objectiveFinal: number;
  iterations: number;
  maxUtilization: number;
  status: SolverStatus;
}
