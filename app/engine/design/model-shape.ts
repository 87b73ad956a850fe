// The parts of a parsed model (docs/model-format.md) the design engine reads. Kept structural so
// that the validated TrussModel of app/engine/truss fits it without a cast.

export interface DesignModelNode {
  id: string;
  x: number;
  y: number;
  z?: number;
  fixed?: readonly string[];
}

export interface DesignModelMember {
  id: string;
  start: string;
  end: string;
  material: string;
  area: number;
  group?: string;
  bucklingFactor?: number;
  section?: string;
}

export interface DesignSection {
  id: string;
  area: number;
  I: number;
  family?: string;
}

export interface DesignBlock {
  objective?: "mass" | "compliance";
  formulation?: "nested" | "simultaneous";
  sizing?: "continuous" | "catalogue";
  areaBounds?: { min: number; max: number };
  groups?: readonly { id: string; min?: number; max?: number }[];
  shape?: readonly {
    id: string;
    min: number;
    max: number;
    moves: readonly { node: string; axis: "x" | "y" | "z"; factor?: number }[];
  }[];
  constraints?: {
    stress?: boolean;
    displacement?: readonly { node: string; axis: "x" | "y" | "z" | "all"; limit: number }[];
    volume?: { max: number };
    buckling?: { sectionRatio?: number; effectiveLengthFactor?: number };
  };
  solver?: { maxIterations?: number; tolerance?: number };
}

export interface DesignModel {
  name: string;
  units: { length: string; force: string; mass: string };
  dimension: 2 | 3;
  nodes: readonly DesignModelNode[];
  members: readonly DesignModelMember[];
  materials: readonly { id: string }[];
  loadCases: readonly { id: string; name?: string; selfWeight?: number }[];
  sections?: readonly DesignSection[];
  combinations?: readonly { id: string; name?: string; use: "strength" | "service"; factors: Readonly<Record<string, number>> }[];
  design?: DesignBlock;
}
