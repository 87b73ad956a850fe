// A validated model turned into flat typed arrays: the form every numerical routine works on.
// Node i owns degrees of freedom 3i, 3i+1, 3i+2 (x, y, z); in 2D the z dof is always restrained.
import type { TrussModel } from "./schema";
import { ownWeightLoads, weightPerMass, type CombinationData } from "./loading";

export interface Structure {
  dim: 2 | 3;
  nodeIds: string[];
  memberIds: string[];
  loadCaseIds: string[];
  coords: Float64Array; // nNodes*3 (z = 0 in 2D)
  start: Int32Array;
  end: Int32Array;
  E: Float64Array;
  density: Float64Array;
  allowTension: Float64Array; // Infinity when the material gives none
  allowCompression: Float64Array;
  areas: Float64Array;
  fixed: Uint8Array; // nNodes*3, 1 = restrained
  loads: Float64Array[]; // per load case, nNodes*3: the point loads (own weight is separate)
  /** own-weight factor per load case (0 = none) */
  selfWeight: Float64Array;
  /** true when some load case carries own weight */
  hasSelfWeight: boolean;
  /** 1 (y) in 2D, 2 (z) in 3D: gravity acts along minus this axis */
  gravityAxis: 1 | 2;
  /** model force units per model mass unit */
  weightPerMass: number;
  combinations: CombinationData[];
  /** load case ids, then combination ids: the keys of every per-response array and map */
  responseIds: string[];
  /** group id per member (null = its own variable); kept for the design layer */
  memberGroups: (string | null)[];
  /** 1 for nodes that at least one member connects; the others take no part in the analysis */
  connected: Uint8Array;
}

export function buildStructure(model: TrussModel): Structure {
  const dim = model.dimension;
  const nNodes = model.nodes.length;
  const nodeIndex = new Map<string, number>();
  const coords = new Float64Array(nNodes * 3);
  const fixed = new Uint8Array(nNodes * 3);
  model.nodes.forEach((n, i) => {
    nodeIndex.set(n.id, i);
    coords[3 * i] = n.x;
    coords[3 * i + 1] = n.y;
    coords[3 * i + 2] = dim === 3 ? (n.z ?? 0) : 0;
    for (const a of n.fixed ?? []) fixed[3 * i + axisIndex(a)] = 1;
    if (dim === 2) fixed[3 * i + 2] = 1;
  });

  const materials = new Map(model.materials.map((m) => [m.id, m]));
  const nMembers = model.members.length;
  const start = new Int32Array(nMembers);
  const end = new Int32Array(nMembers);
  const E = new Float64Array(nMembers);
  const density = new Float64Array(nMembers);
  const allowTension = new Float64Array(nMembers);
  const allowCompression = new Float64Array(nMembers);
  const areas = new Float64Array(nMembers);
  const connected = new Uint8Array(nNodes);
  model.members.forEach((m, e) => {
    const a = nodeIndex.get(m.start);
    const b = nodeIndex.get(m.end);
    const mat = materials.get(m.material);
    if (a === undefined || b === undefined || !mat) {
      throw new Error(`member ${m.id} refers to an unknown node or material; validate the model with parseModel first`);
    }
    start[e] = a;
    end[e] = b;
    connected[a] = 1;
    connected[b] = 1;
    E[e] = mat.E;
    density[e] = mat.density;
    allowTension[e] = mat.allowableTension ?? Infinity;
    allowCompression[e] = mat.allowableCompression ?? Infinity;
    areas[e] = m.area;
  });

  const loads = model.loadCases.map((lc) => {
    const f = new Float64Array(nNodes * 3);
    for (const l of lc.loads) {
      const i = nodeIndex.get(l.node);
      if (i === undefined) throw new Error(`load case ${lc.id} loads unknown node ${l.node}; validate the model with parseModel first`);
      f[3 * i] += l.fx ?? 0;
      f[3 * i + 1] += l.fy ?? 0;
      if (dim === 3) f[3 * i + 2] += l.fz ?? 0;
    }
    return f;
  });

  const caseIndex = new Map(model.loadCases.map((lc, l) => [lc.id, l]));
  const combinations: CombinationData[] = (model.combinations ?? []).map((c) => {
    const factors = new Float64Array(model.loadCases.length);
    for (const [lc, f] of Object.entries(c.factors)) {
      const l = caseIndex.get(lc);
      if (l === undefined) throw new Error(`combination ${c.id} names unknown load case ${lc}; validate the model with parseModel first`);
      factors[l] += f;
    }
    return { id: c.id, ...(c.name ? { name: c.name } : {}), use: c.use, factors };
  });
  const selfWeight = Float64Array.from(model.loadCases.map((lc) => lc.selfWeight ?? 0));

  return {
    dim,
    selfWeight,
    hasSelfWeight: selfWeight.some((f) => f !== 0),
    gravityAxis: dim === 2 ? 1 : 2,
    weightPerMass: weightPerMass(model.units),
    combinations,
    responseIds: [...model.loadCases.map((l) => l.id), ...combinations.map((c) => c.id)],
    nodeIds: model.nodes.map((n) => n.id),
    memberIds: model.members.map((m) => m.id),
    loadCaseIds: model.loadCases.map((l) => l.id),
    coords,
    start,
    end,
    E,
    density,
    allowTension,
    allowCompression,
    areas,
    fixed,
    loads,
    memberGroups: model.members.map((m) => m.group ?? null),
    connected,
  };
}

/**
 * The applied load of every load case at these areas and lengths: the point loads plus the
 * case's share of own weight.
 */
export function caseLoads(s: Structure, areas: ArrayLike<number>, lengths: ArrayLike<number>): Float64Array[] {
  if (!s.hasSelfWeight) return s.loads;
  const w = ownWeightLoads(s, s.coords.length, areas, lengths);
  return s.loads.map((f, l) => {
    const k = s.selfWeight[l];
    if (k === 0) return f;
    const out = Float64Array.from(f);
    for (let q = 0; q < out.length; q++) out[q] += k * w[q];
    return out;
  });
}

export function axisIndex(a: "x" | "y" | "z"): 0 | 1 | 2 {
  return a === "x" ? 0 : a === "y" ? 1 : 2;
}

export const AXIS_NAMES = ["x", "y", "z"] as const;

/**
 * Degrees of freedom that enter the stiffness solve: not restrained and on a node that some
 * member connects. Returned ascending, as full-vector indices (node*3 + axis).
 */
export function freeDofs(s: Structure): Int32Array {
  const n = s.nodeIds.length;
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (!s.connected[i]) continue;
    for (let a = 0; a < 3; a++) if (!s.fixed[3 * i + a]) count++;
  }
  const out = new Int32Array(count);
  let k = 0;
  for (let i = 0; i < n; i++) {
    if (!s.connected[i]) continue;
    for (let a = 0; a < 3; a++) if (!s.fixed[3 * i + a]) out[k++] = 3 * i + a;
  }
  return out;
}

/** Member lengths for the given coordinates. */
export function memberLengths(s: Structure, coords: Float64Array = s.coords): Float64Array {
  const m = s.start.length;
  const L = new Float64Array(m);
  for (let e = 0; e < m; e++) {
    const i = 3 * s.start[e];
    const j = 3 * s.end[e];
    const dx = coords[j] - coords[i];
    const dy = coords[j + 1] - coords[i + 1];
    const dz = coords[j + 2] - coords[i + 2];
    L[e] = Math.sqrt(dx * dx + dy * dy + dz * dz);
  }
  return L;
}
