// The upload preview's facts about a valid model.
import type { TrussModel, Units } from "./schema";
import { memberLengths, type Structure } from "./structure";

export interface ModelSummary {
  name: string;
  dimension: 2 | 3;
  units: Units;
  counts: { nodes: number; members: number; materials: number; loadCases: number; groups: number; restrainedDofs: number; freeDofs: number };
  totalLength: number;
  initialVolume: number;
  initialMass: number;
  design: {
    objective: "mass" | "compliance";
    formulation: "nested" | "simultaneous";
    areaVariables: number;
    shapeVariables: number;
    constraints: string[]; // kinds switched on: stress, displacement, volume, buckling
  } | null;
  stability: { ok: boolean; message: string; node?: string; axis?: "x" | "y" | "z" };
}

export function summarize(model: TrussModel, s: Structure, stability: ModelSummary["stability"]): ModelSummary {
  const L = memberLengths(s);
  let totalLength = 0;
  let volume = 0;
  let mass = 0;
  for (let e = 0; e < L.length; e++) {
    totalLength += L[e];
    volume += s.areas[e] * L[e];
    mass += s.density[e] * s.areas[e] * L[e];
  }
  let restrained = 0;
  let free = 0;
  for (let i = 0; i < s.nodeIds.length; i++) {
    for (let a = 0; a < s.dim; a++) {
      if (s.fixed[3 * i + a]) restrained++;
      else if (s.connected[i]) free++;
    }
  }
  const groupIds = new Set(model.members.map((m) => m.group).filter((g): g is string => g !== undefined));
  const ungrouped = model.members.filter((m) => m.group === undefined).length;
  const d = model.design;
  const c = d?.constraints;
  return {
    name: model.name,
    dimension: model.dimension,
    units: model.units,
    counts: {
      nodes: model.nodes.length,
      members: model.members.length,
      materials: model.materials.length,
      loadCases: model.loadCases.length,
      groups: groupIds.size,
      restrainedDofs: restrained,
      freeDofs: free,
    },
    totalLength,
    initialVolume: volume,
    initialMass: mass,
    design: d
      ? {
          objective: d.objective,
          formulation: d.formulation,
          areaVariables: groupIds.size + ungrouped,
          shapeVariables: d.shape?.length ?? 0,
          constraints: [
            ...(c?.stress ? ["stress"] : []),
            ...((c?.displacement?.length ?? 0) > 0 ? ["displacement"] : []),
            ...(c?.volume ? ["volume"] : []),
            ...(c?.buckling ? ["buckling"] : []),
          ],
        }
      : null,
    stability,
  };
}
