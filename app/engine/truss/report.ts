// The analysis of a model as plain JSON, with the field names of the result format
// (docs/model-format.md): what `npm run analyze` prints.
import { analyze, internalForces, type Analysis } from "./analysis";
import type { TrussModel, Units } from "./schema";
import { AXIS_NAMES, buildStructure, type Structure } from "./structure";

export interface AnalysisReport {
  format: "strutwise.analysis";
  version: 1;
  model: string;
  units: Units;
  dimension: 2 | 3;
  volume: number;
  mass: number;
  compliance: Record<string, number>;
  equilibriumResidual: number;
  loadCases: { id: string; name?: string; compliance: number; equilibriumResidual: number; totalLoad: [number, number, number]; totalReaction: [number, number, number] }[];
  members: { id: string; start: string; end: string; area: number; length: number; force: Record<string, number>; stress: Record<string, number> }[];
  nodes: { id: string; x: number; y: number; z: number; displacement: Record<string, [number, number, number]> }[];
  reactions: { node: string; fixed: ("x" | "y" | "z")[]; force: Record<string, [number, number, number]> }[];
}

const triple = (v: Float64Array, i: number): [number, number, number] => [v[3 * i], v[3 * i + 1], v[3 * i + 2]];

/** Analyses a validated model (see parseModel); throws MechanismError for an unstable one. */
export function analyzeModelToJson(model: TrussModel): AnalysisReport {
  const s = buildStructure(model);
  const a = analyze(s);
  const lcIds = s.loadCaseIds;
  const perLc = <T>(f: (k: number) => T): Record<string, T> => Object.fromEntries(lcIds.map((id, k) => [id, f(k)]));
  // forces, stresses, displacements and reactions list the combinations too
  const perResponse = <T>(f: (k: number) => T): Record<string, T> => Object.fromEntries(s.responseIds.map((id, k) => [id, f(k)]));

  const loadCases = model.loadCases.map((lc, k) => {
    const load: [number, number, number] = [0, 0, 0];
    const reaction: [number, number, number] = [0, 0, 0];
    for (let i = 0; i < s.nodeIds.length; i++) {
      for (let c = 0; c < 3; c++) {
        load[c] += a.loads[k][3 * i + c];
        reaction[c] += a.reactions[k][3 * i + c];
      }
    }
    return { id: lc.id, ...(lc.name ? { name: lc.name } : {}), compliance: a.compliance[k], equilibriumResidual: NaN, totalLoad: load, totalReaction: reaction };
  });
  // each case's own residual; analyze reports the maximum over all of them
  loadCases.forEach((lc, k) => (lc.equilibriumResidual = caseResidual(s, a, k)));

  const reactions: AnalysisReport["reactions"] = [];
  for (let i = 0; i < s.nodeIds.length; i++) {
    const fixed = AXIS_NAMES.slice(0, s.dim).filter((_, c) => s.fixed[3 * i + c] === 1);
    if (fixed.length === 0) continue;
    reactions.push({ node: s.nodeIds[i], fixed: [...fixed], force: perResponse((k) => triple(a.reactions[k], i)) });
  }

  return {
    format: "strutwise.analysis",
    version: 1,
    model: model.name,
    units: model.units,
    dimension: model.dimension,
    volume: a.volume,
    mass: a.mass,
    compliance: perLc((k) => a.compliance[k]),
    equilibriumResidual: a.equilibriumResidual,
    loadCases,
    members: model.members.map((m, e) => ({
      id: m.id,
      start: m.start,
      end: m.end,
      area: a.areas[e],
      length: a.lengths[e],
      force: perResponse((k) => a.forces[k][e]),
      stress: perResponse((k) => a.stresses[k][e]),
    })),
    nodes: model.nodes.map((n, i) => ({
      id: n.id,
      x: s.coords[3 * i],
      y: s.coords[3 * i + 1],
      z: s.coords[3 * i + 2],
      displacement: perResponse((k) => triple(a.displacements[k], i)),
    })),
    reactions,
  };
}

function caseResidual(s: Structure, a: Analysis, k: number): number {
  const f = a.loads[k];
  const internal = internalForces(s, a.coords, a.lengths, a.forces[k]);
  let fMax = 0;
  let rMax = 0;
  for (let d = 0; d < f.length; d++) {
    fMax = Math.max(fMax, Math.abs(f[d]));
    if (!s.fixed[d] && s.connected[Math.floor(d / 3)]) rMax = Math.max(rMax, Math.abs(internal[d] - f[d]));
  }
  return fMax > 0 ? rMax / fMax : rMax;
}
