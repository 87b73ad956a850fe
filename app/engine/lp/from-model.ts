// The plastic-design LP's input read from a validated model (docs/model-format.md): area variables
// from groups, the checked cases from load cases or strength combinations (format additions),
// own weight in model units.
import { buildStructure, type TrussModel } from "../truss";
import { FORCE_IN_N, MASS_IN_KG } from "../truss/units";
import type { PlasticCase, PlasticDesignInput } from "./plastic-input";

/** Standard gravity in m/s^2 (exact by definition, NIST SP 811). */
const STANDARD_GRAVITY = 9.80665;

export interface CheckedCases {
  cases: PlasticCase[];
  /** "load cases" or "strength combinations": what the stress limits apply to */
  kind: "load cases" | "strength combinations";
}

/** Weight of one model mass unit in the model force unit (1 t weighs 9.80665 kN, 1 lb weighs 1 lbf). */
export function weightPerMass(units: { force: string; mass: string }): number {
  const kg = MASS_IN_KG[units.mass as keyof typeof MASS_IN_KG];
  const newton = FORCE_IN_N[units.force as keyof typeof FORCE_IN_N];
  return (kg * STANDARD_GRAVITY) / newton;
}

/**
 * The cases stress limits apply to: every strength combination when the model has
 * combinations (their loads and own-weight factors summed), else every load case.
 */
export function checkedCases(model: TrussModel, loads: Float64Array[]): CheckedCases {
  const loadCases = model.loadCases;
  const combinations = model.combinations ?? [];
  if (combinations.length === 0) {
    return { kind: "load cases", cases: loadCases.map((lc, l) => ({ id: lc.id, loads: loads[l], selfWeight: lc.selfWeight ?? 0 })) };
  }
  const index = new Map(loadCases.map((lc, l) => [lc.id, l]));
  const cases = combinations
    .filter((c) => c.use === "strength")
    .map((c) => {
      const f = new Float64Array(loads[0].length);
      let selfWeight = 0;
      for (const [id, factor] of Object.entries(c.factors)) {
        const l = index.get(id);
        if (l === undefined) continue; // validation names unknown ids; nothing to add here
        for (let d = 0; d < f.length; d++) f[d] += factor * loads[l][d];
        selfWeight += factor * (loadCases[l].selfWeight ?? 0);
      }
      return { id: c.id, loads: f, selfWeight };
    });
  return { kind: "strength combinations", cases };
}

/** The LP input of a model, at its own geometry or at the given node coordinates (nNodes*3). */
export function plasticInputFromModel(
  model: TrussModel,
  coords?: Float64Array,
): { input: PlasticDesignInput; checked: CheckedCases; loadCaseLoads: Float64Array[] } {
  const s = buildStructure(model);
  const varIndex = new Map<string, number>();
  const varIds: string[] = [];
  const memberVar = new Int32Array(s.memberIds.length);
  s.memberIds.forEach((id, e) => {
    const key = s.memberGroups[e] ?? `member:${id}`;
    let v = varIndex.get(key);
    if (v === undefined) {
      v = varIds.length;
      varIndex.set(key, v);
      varIds.push(s.memberGroups[e] ?? id);
    }
    memberVar[e] = v;
  });
  const checked = checkedCases(model, s.loads);
  return {
    checked,
    loadCaseLoads: s.loads,
    input: {
      dim: s.dim,
      nodeIds: s.nodeIds,
      memberIds: s.memberIds,
      coords: coords ?? s.coords,
      fixed: s.fixed,
      start: s.start,
      end: s.end,
      density: s.density,
      allowTension: s.allowTension,
      allowCompression: s.allowCompression,
      memberVar,
      varIds,
      cases: checked.cases,
      weightPerMass: weightPerMass(model.units),
    },
  };
}

/** Node coordinates (nNodes*3) of a result, in the model's node order: the final geometry of a shape run. */
export function resultCoords(model: TrussModel, result: { nodes: readonly { id: string; x: number; y: number; z: number }[] }): Float64Array {
  const byId = new Map(result.nodes.map((n) => [n.id, n]));
  const c = new Float64Array(model.nodes.length * 3);
  model.nodes.forEach((n, i) => {
    const r = byId.get(n.id);
    c[3 * i] = r?.x ?? n.x;
    c[3 * i + 1] = r?.y ?? n.y;
    c[3 * i + 2] = model.dimension === 3 ? (r?.z ?? n.z ?? 0) : 0;
  });
  return c;
}
