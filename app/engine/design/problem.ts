// A design problem read from a model's `design` block (docs/model-format.md) and the job options:
// the design variables with their scaling, and the catalogue of limits.
//
// Conditioning (what the SQP solver sees):
// - area variable  z = A / A_ref, A_ref = the group's starting area clamped into its bounds, so
//   every area variable starts at about 1 whatever the units;
// - shape variable s = offset / S_ref, S_ref = half the range max - min of the variable;
// - objective F = f / f_0, f_0 = the objective at the starting design;
// - every limit as a ratio that is 0 on the limit and -1 far away from it:
//     stress       sigma/sigma_t - 1,  -sigma/sigma_c - 1
//     buckling     (-sigma - sigma_E) / sigma_ref, sigma_E = pi^2 E I / ((k L)^2 A) (Euler; I see
//                  buckling.ts), sigma_ref = sigma_E of the member at its starting area and
//                  length (Limit.limit): a stress difference, not the ratio -sigma/sigma_E - 1,
//                  whose 1/A^3 curvature at small areas stalled the solver (buckling.ts)
//     displacement +-u/limit - 1
//     volume       V/V_max - 1
//     length       1 - L/L_min (shape only: L_min = 0.2 L_0 keeps members from collapsing or
//                  passing through zero length, the way a member would invert)
// Limits are checked per response (loadCase holds a response index: load cases first, then
// combinations, as Structure.responseIds): with combinations, stress and buckling on every
// strength combination and displacements on every service combination; without, every limit
// on every load case.
import type { Structure } from "../truss";
import type { JobOptions } from "./options";
import type { DesignBlock, DesignModel } from "./model-shape";
import { memberLengths } from "./element";
import { fitSecondMoment } from "../sections/fit";
import { eulerStress, type BucklingModel } from "./buckling";
import { maxOf } from "../util/extent";

export type Objective = "mass" | "compliance";
export type Formulation = "nested" | "simultaneous";

export interface AreaVariable {
  id: string; // group id, or the member id of an ungrouped member
  members: number[];
  min: number;
  max: number;
  initial: number;
  scale: number;
}

export interface ShapeVariable {
  id: string;
  min: number;
  max: number;
  scale: number;
  moves: { dof: number; factor: number }[]; // dof = node*3 + axis
}

export type LimitKind = "stress-tension" | "stress-compression" | "buckling" | "displacement" | "volume" | "length";

export interface Limit {
  kind: LimitKind;
  id: string; // public id of the result format, e.g. "stress:AB:LC1"
  member: number; // -1 when not a member limit
  dof: number; // displacement limits: node*3 + axis; else -1
  sign: 1 | -1; // displacement: which side of |u| <= limit
  loadCase: number; // response index (load case, then combination); -1 for volume and length
  limit: number; // in model units (stress, length, volume; buckling: the reference stress sigma_ref)
  /** displacement: index into displacementSpecs() of the deflection limit that sets it */
  spec?: number;
}

/** Share of the starting length below which a shape change may not shorten a member. */
export const MIN_LENGTH_RATIO = 0.2;
/** Solid round section: I = A^2 / (4 pi) (common practice), used when buckling gives no ratio. */
export const DEFAULT_SECTION_RATIO = 1 / (4 * Math.PI);

export interface DesignProblem {
  model: DesignModel;
  structure: Structure;
  objective: Objective;
  formulation: Formulation;
  areaVars: AreaVariable[];
  shapeVars: ShapeVariable[];
  memberVar: Int32Array; // member -> area variable
  /** coordinate dof -> list of (shape variable, d coord / d s) pairs */
  dofShape: Map<number, { v: number; c: number }[]>;
  /** members whose length can change with the shape variables */
  shapeMembers: Int32Array;
  limits: Limit[];
  /** the deflection limits as written (Limit.spec indexes them) */
  deflectionSpecs: DisplacementSpec[];
  buckling: BucklingModel | null;
  /** responses checked for stress and buckling, and for displacements */
  strengthResponses: number[];
  serviceResponses: number[];
  coords0: Float64Array;
  lengths0: Float64Array;
  nDesign: number; // areaVars.length + shapeVars.length
  x0: Float64Array; // scaled starting design
  lower: Float64Array;
  upper: Float64Array;
  maxIterations: number;
  tolerance: number;
}

export class DesignSetupError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "DesignSetupError";
  }
}

const AXES = { x: 0, y: 1, z: 2 } as const;
const AXIS_NAMES = ["x", "y", "z"];

export function buildDesignProblem(model: DesignModel, s: Structure, options: JobOptions = {}): DesignProblem {
  const design = model.design;
  if (!design) throw new DesignSetupError(`Model "${model.name}" has no design block: it can be analysed but not optimized.`);
  const objective: Objective = options.objective ?? design.objective ?? "mass";
  const formulation: Formulation = options.formulation ?? design.formulation ?? "nested";
  const m = s.memberIds.length;
  const nodeIndex = new Map(s.nodeIds.map((id, i) => [id, i]));

  // Area variables: one per group, one per ungrouped member; groups start from their first member.
  const boundsOf = areaBoundsRule(model);
  const areaVars: AreaVariable[] = [];
  const byGroup = new Map<string, number>();
  const memberVar = new Int32Array(m);
  model.members.forEach((mm, e) => {
    const key = mm.group ?? null;
    let v = key !== null ? byGroup.get(key) : undefined;
    if (v === undefined) {
      const { min, max } = boundsOf(key);
      if (!(min > 0) || !(max >= min)) {
        throw new DesignSetupError(`Area bounds of ${key !== null ? `group "${key}"` : `member "${mm.id}"`} are not usable: min ${min} must be positive and not above max ${max}.`);
      }
      const initial = Math.min(max, Math.max(min, mm.area));
      v = areaVars.length;
      areaVars.push({ id: key ?? mm.id, members: [], min, max, initial, scale: initial });
      if (key !== null) byGroup.set(key, v);
    }
    areaVars[v].members.push(e);
    memberVar[e] = v;
  });

  // Shape variables.
  const dofShape = new Map<number, { v: number; c: number }[]>();
  const shapeVars: ShapeVariable[] = (design.shape ?? []).map((sv, k) => {
    if (!(sv.max > sv.min)) throw new DesignSetupError(`Shape variable "${sv.id}" has min ${sv.min} not below max ${sv.max}.`);
    if (!(sv.min <= 0 && sv.max >= 0)) {
      throw new DesignSetupError(`Shape variable "${sv.id}" must allow the starting geometry: its range ${sv.min}..${sv.max} has to include 0.`);
    }
    const scale = (sv.max - sv.min) / 2;
    const moves = sv.moves.map((mv) => {
      const n = nodeIndex.get(mv.node);
      if (n === undefined) throw new DesignSetupError(`Shape variable "${sv.id}" moves unknown node "${mv.node}".`);
      if (model.dimension === 2 && mv.axis === "z") throw new DesignSetupError(`Shape variable "${sv.id}" moves node "${mv.node}" in z, but the model is 2D.`);
      return { dof: n * 3 + AXES[mv.axis], factor: mv.factor ?? 1 };
    });
    for (const mv of moves) {
      const list = dofShape.get(mv.dof) ?? [];
      list.push({ v: areaVars.length + k, c: mv.factor * scale });
      dofShape.set(mv.dof, list);
    }
    return { id: sv.id, min: sv.min, max: sv.max, scale, moves };
  });
  const shapeMemberList: number[] = [];
  for (let e = 0; e < m; e++) {
    const a = 3 * s.start[e], b = 3 * s.end[e];
    let moved = false;
    for (let c = 0; c < 3; c++) if (dofShape.has(a + c) || dofShape.has(b + c)) moved = true;
    if (moved) shapeMemberList.push(e);
  }

  // Limits.
  const c = design.constraints ?? {};
  const limits: Limit[] = [];
  const nLc = s.loadCaseIds.length;
  const useStress = options.stress ?? c.stress ?? false;
  const useBuckling = options.buckling ?? Boolean(c.buckling);
  const buckling = useBuckling ? bucklingModel(model, c.buckling) : null;
  const lengthsAtStart = memberLengths(s, s.coords);
  const bucklingReference = (e: number) => eulerStress(buckling!, e, s.E[e], areaVars[memberVar[e]].initial, lengthsAtStart[e]);
  const strengthResponses = responsesFor(s, "strength");
  const serviceResponses = responsesFor(s, "service");
  void nLc;
  for (const l of strengthResponses) {
    const lc = s.responseIds[l];
    for (let e = 0; e < m; e++) {
      const id = s.memberIds[e];
      if (useStress && Number.isFinite(s.allowTension[e])) {
        limits.push({ kind: "stress-tension", id: `stress:${id}:${lc}`, member: e, dof: -1, sign: 1, loadCase: l, limit: s.allowTension[e] });
      }
      if (useStress && Number.isFinite(s.allowCompression[e])) {
        limits.push({ kind: "stress-compression", id: `stress:${id}:${lc}`, member: e, dof: -1, sign: -1, loadCase: l, limit: s.allowCompression[e] });
      }
      if (buckling) limits.push({ kind: "buckling", id: `buckling:${id}:${lc}`, member: e, dof: -1, sign: -1, loadCase: l, limit: bucklingReference(e) });
    }
  }
  const deflectionSpecs = displacementSpecs(model, options);
  const dispLimit = displacementLimitMap(deflectionSpecs, s);
  const dispDofs = [...dispLimit.keys()].sort((a, b) => a - b);
  for (const l of serviceResponses) {
    for (const dof of dispDofs) {
      const id = `displacement:${s.nodeIds[Math.floor(dof / 3)]}:${AXIS_NAMES[dof % 3]}:${s.responseIds[l]}`;
      const { limit, spec } = dispLimit.get(dof)!;
      limits.push({ kind: "displacement", id, member: -1, dof, sign: 1, loadCase: l, limit, spec });
      limits.push({ kind: "displacement", id, member: -1, dof, sign: -1, loadCase: l, limit, spec });
    }
  }
  const volumeMax = options.volumeMax ?? c.volume?.max;
  if (volumeMax !== undefined) {
    if (!(volumeMax > 0)) throw new DesignSetupError(`Volume limit must be positive, got ${volumeMax}.`);
    limits.push({ kind: "volume", id: "volume", member: -1, dof: -1, sign: 1, loadCase: -1, limit: volumeMax });
  }
  const coords0 = Float64Array.from(s.coords);
  const lengths0 = memberLengths(s, coords0);
  for (const e of shapeMemberList) {
    limits.push({ kind: "length", id: `length:${s.memberIds[e]}`, member: e, dof: -1, sign: 1, loadCase: -1, limit: MIN_LENGTH_RATIO * lengths0[e] });
  }
  if (objective === "compliance" && volumeMax === undefined && limits.length === 0) {
    // Without a volume limit minimum compliance simply takes every area to its upper bound: legal,
    // but worth knowing; nothing to reject.
  }

  const nDesign = areaVars.length + shapeVars.length;
  const x0 = new Float64Array(nDesign);
  const lower = new Float64Array(nDesign);
  const upper = new Float64Array(nDesign);
  areaVars.forEach((v, k) => {
    x0[k] = v.initial / v.scale;
    lower[k] = v.min / v.scale;
    upper[k] = v.max / v.scale;
  });
  shapeVars.forEach((v, k) => {
    const i = areaVars.length + k;
    x0[i] = 0;
    lower[i] = v.min / v.scale;
    upper[i] = v.max / v.scale;
  });

  return {
    model, structure: s, objective, formulation, areaVars, shapeVars, memberVar, dofShape,
    shapeMembers: Int32Array.from(shapeMemberList), limits, deflectionSpecs, buckling, strengthResponses, serviceResponses, coords0, lengths0, nDesign,
    x0, lower, upper,
    // the active bound set of a ground structure settles a few members per iteration, so the
    // default budget grows with the design variable count
    maxIterations: options.maxIterations ?? design.solver?.maxIterations ?? Math.min(20000, Math.max(200, 4 * nDesign)),
    tolerance: options.tolerance ?? design.solver?.tolerance ?? 1e-6,
  };
}

export interface DisplacementSpec {
  node: string; // a node id, or "*" for every node
  axis: "x" | "y" | "z" | "all";
  limit: number;
}

/**
 * The deflection limits as the engineer wrote them (design.constraints.displacement), with the
 * job's displacementLimit option replacing every limit (or standing alone for every node).
 */
export function displacementSpecs(model: DesignModel, options: JobOptions = {}): DisplacementSpec[] {
  const specs: DisplacementSpec[] = (model.design?.constraints?.displacement ?? []).map((d) => ({ node: d.node, axis: d.axis, limit: d.limit }));
  const override = options.displacementLimit;
  if (override === undefined) return specs;
  return specs.length ? specs.map((d) => ({ ...d, limit: override })) : [{ node: "*", axis: "all", limit: override }];
}

/**
 * The limit of each checked free coordinate (dof = node*3 + axis): the tightest spec naming it,
 * and which spec that is (the first of equal ones).
 */
export function displacementLimitMap(specs: readonly DisplacementSpec[], s: Structure): Map<number, { limit: number; spec: number }> {
  const nodeIndex = new Map(s.nodeIds.map((id, i) => [id, i]));
  const out = new Map<number, { limit: number; spec: number }>();
  specs.forEach((spec, k) => {
    if (!(spec.limit > 0)) throw new DesignSetupError(`Displacement limit at node "${spec.node}" must be positive, got ${spec.limit}.`);
    const nodes = spec.node === "*" ? s.nodeIds.map((_, i) => i) : [nodeIndex.get(spec.node)];
    if (nodes[0] === undefined) throw new DesignSetupError(`Displacement limit names unknown node "${spec.node}".`);
    const axes = spec.axis === "all" ? [0, 1, 2] : [AXES[spec.axis]];
    for (const n of nodes as number[]) {
      for (const a of axes) {
        const dof = n * 3 + a;
        if (s.fixed[dof]) continue;
        const prev = out.get(dof);
        if (prev === undefined || spec.limit < prev.limit) out.set(dof, { limit: spec.limit, spec: k });
      }
    }
  });
  return out;
}

/**
 * The area bounds of an area variable (a group id, or null for an ungrouped member): the group's
 * own, else design.areaBounds, else 1e-4 and 1e2 times the largest starting area. The report
 * reads it too, to say which members sit at their minimum size.
 */
export function areaBoundsRule(model: { members: readonly { area: number }[]; design?: Pick<DesignBlock, "areaBounds" | "groups"> }): (group: string | null) => { min: number; max: number; own: { min: boolean; max: boolean } } {
  const maxInitial = maxOf(model.members.map((mm) => mm.area));
  const defMin = model.design?.areaBounds?.min ?? maxInitial * 1e-4;
  const defMax = model.design?.areaBounds?.max ?? maxInitial * 1e2;
  const groups = new Map((model.design?.groups ?? []).map((g) => [g.id, g]));
  return (group) => {
    const gb = group !== null ? groups.get(group) : undefined;
    return { min: gb?.min ?? defMin, max: gb?.max ?? defMax, own: { min: gb?.min !== undefined, max: gb?.max !== undefined } };
  };
}

/** Responses a limit use applies to: the combinations of that use, else every load case. */
export function responsesFor(s: Structure, use: "strength" | "service"): number[] {
  const nLc = s.loadCaseIds.length;
  if (s.combinations.length === 0) return s.loadCaseIds.map((_, l) => l);
  const out: number[] = [];
  s.combinations.forEach((c, k) => {
    if (c.use === use) out.push(nLc + k);
  });
  return out;
}

/**
 * The buckling model of a design: I from the model's sections (least-squares fit I = a A^b),
 * else I = sectionRatio A^2; k per member from members[].bucklingFactor, else the design's.
 */
export function bucklingModel(model: DesignModel, spec: { sectionRatio?: number; effectiveLengthFactor?: number } | undefined): BucklingModel {
  const kDefault = spec?.effectiveLengthFactor ?? 1;
  const k = Float64Array.from(model.members.map((mm) => mm.bucklingFactor ?? kDefault));
  if (model.sections && model.sections.length > 0) {
    const fit = fitSecondMoment(model.sections);
    return { a: fit.a, b: fit.b, k, memberI: null, source: "fit", fit };
  }
  return { a: spec?.sectionRatio ?? DEFAULT_SECTION_RATIO, b: 2, k, memberI: null, source: "sectionRatio" };
}

/** Areas and node coordinates of the scaled design vector z (first nDesign entries). */
export function designState(p: DesignProblem, z: ArrayLike<number>): { areas: Float64Array; coords: Float64Array } {
  const m = p.memberVar.length;
  const areas = new Float64Array(m);
  for (let e = 0; e < m; e++) {
    const v = p.memberVar[e];
    areas[e] = p.areaVars[v].scale * z[v];
  }
  const coords = Float64Array.from(p.coords0);
  const nA = p.areaVars.length;
  p.shapeVars.forEach((sv, k) => {
    const value = sv.scale * z[nA + k];
    for (const mv of sv.moves) coords[mv.dof] += mv.factor * value;
  });
  return { areas, coords };
}

/** Shape variable values in model units. */
export function shapeValues(p: DesignProblem, z: ArrayLike<number>): { id: string; value: number }[] {
  const nA = p.areaVars.length;
  return p.shapeVars.map((sv, k) => ({ id: sv.id, value: sv.scale * z[nA + k] }));
}
