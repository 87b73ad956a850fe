// The viewer's own picture of a truss: node positions (initial and optimized), members by
// node index with area, utilization and forces, supports, loads and displacements per load
// case. Built from the uploaded model file, optionally overlaid with a result; plain data,
// no three.js, so it is tested in node and shared by the scene, legend and tables.

export type Vec3 = [number, number, number];
export type AxisName = "x" | "y" | "z";

export interface ModelLike {
  dimension: 2 | 3;
  units?: { length: string; force: string; mass: string };
  nodes: { id: string; x: number; y: number; z?: number; fixed?: AxisName[] }[];
  members: { id: string; start: string; end: string; area: number; group?: string; material?: string }[];
  loadCases: { id: string; name?: string; loads: { node: string; fx?: number; fy?: number; fz?: number }[] }[];
  /** factored sums of load cases (docs/model-format.md) */
  combinations?: { id: string; name?: string; factors: Record<string, number> }[];
}

export interface ResultLike {
  members: { id: string; area: number; utilization: number; force: Record<string, number> }[];
  nodes: { id: string; x: number; y: number; z: number; displacement: Record<string, [number, number, number]> }[];
  /** support reactions per load case and combination */
  reactions?: { node: string; values: Record<string, [number, number, number]> }[];
}

export interface ViewNode {
  id: string;
  initial: Vec3;
  position: Vec3; // optimized when a result is given, else the initial
  fixed: AxisName[];
}

export interface ViewMember {
  id: string;
  a: number; // start node index
  b: number; // end node index
  initialArea: number;
  area: number;
  utilization: number | null;
  force: Record<string, number> | null;
}

export interface ViewLoadCase {
  id: string;
  name?: string;
  combination?: boolean;
  loads: { node: number; f: Vec3 }[]; // nodal loads as given (a combination: factored sum); own weight not included
  reactions: { node: number; f: Vec3 }[]; // support reactions of the result, none without one
  displacement: Vec3[] | null; // per node, null without a result
  maxDisplacement: number;
  maxAbsForce: number;
}

export interface Bounds {
  min: Vec3;
  max: Vec3;
  center: Vec3;
  span: number; // diagonal of the bounding box
}

export interface TrussView {
  dimension: 2 | 3;
  planar: boolean; // every node on one z plane: a 2D projection is shown
  units: { length: string; force: string; mass: string } | null;
  nodes: ViewNode[];
  members: ViewMember[];
  loadCases: ViewLoadCase[];
  hasResult: boolean;
  shapeChanged: boolean;
  bounds: Bounds;
  maxArea: number;
  medianLength: number;
}

const zero = (): Vec3 => [0, 0, 0];

export function buildTrussView(model: ModelLike, result?: ResultLike | null): TrussView {
  const index = new Map<string, number>();
  model.nodes.forEach((n, i) => index.set(n.id, i));
  const resNodes = new Map((result?.nodes ?? []).map((n) => [n.id, n]));
  const resMembers = new Map((result?.members ?? []).map((m) => [m.id, m]));

  let shapeChanged = false;
  const nodes: ViewNode[] = model.nodes.map((n) => {
    const initial: Vec3 = [n.x, n.y, n.z ?? 0];
    const r = resNodes.get(n.id);
    const position: Vec3 = r ? [r.x, r.y, r.z ?? 0] : [...initial];
    if (r && (position[0] !== initial[0] || position[1] !== initial[1] || position[2] !== initial[2])) shapeChanged = true;
    return { id: n.id, initial, position, fixed: uniqueAxes((n.fixed ?? []).filter((a) => model.dimension === 3 || a !== "z")) };
  });

  const members: ViewMember[] = [];
  for (const m of model.members) {
    const a = index.get(m.start);
    const b = index.get(m.end);
    if (a === undefined || b === undefined) continue; // a valid stored model never has this
    const r = resMembers.get(m.id);
    members.push({
      id: m.id,
      a,
      b,
      initialArea: m.area,
      area: r ? r.area : m.area,
      utilization: r && Number.isFinite(r.utilization) ? r.utilization : null,
      force: r ? r.force : null,
    });
  }

  const caseLoads = (lc: ModelLike["loadCases"][number]) =>
    lc.loads.filter((l) => index.has(l.node)).map((l) => ({ node: index.get(l.node)!, f: [l.fx ?? 0, l.fy ?? 0, l.fz ?? 0] as Vec3 }));
  const byCase = new Map(model.loadCases.map((lc) => [lc.id, caseLoads(lc)]));
  const combinationLoads = (factors: Record<string, number>) => {
    const sum = new Map<number, Vec3>();
    for (const [id, k] of Object.entries(factors))
      for (const l of byCase.get(id) ?? []) {
        const f = sum.get(l.node) ?? zero();
        sum.set(l.node, [f[0] + k * l.f[0], f[1] + k * l.f[1], f[2] + k * l.f[2]]);
      }
    return [...sum].map(([node, f]) => ({ node, f }));
  };
  const reactionsOf = (id: string) =>
    (result?.reactions ?? []).filter((r) => index.has(r.node) && r.values[id]).map((r) => ({ node: index.get(r.node)!, f: [...r.values[id]!] as Vec3 }));
  const sources = [
    ...model.loadCases.map((lc) => ({ id: lc.id, name: lc.name, combination: false, loads: byCase.get(lc.id)! })),
    ...(model.combinations ?? []).map((c) => ({ id: c.id, name: c.name, combination: true, loads: combinationLoads(c.factors) })),
  ];

  const loadCases: ViewLoadCase[] = sources.map((lc) => {
    const loads = lc.loads;
    let displacement: Vec3[] | null = null;
    let maxDisplacement = 0;
    if (result) {
      displacement = model.nodes.map((n) => {
        const d = resNodes.get(n.id)?.displacement?.[lc.id];
        const v: Vec3 = d ? [d[0] ?? 0, d[1] ?? 0, d[2] ?? 0] : zero();
        maxDisplacement = Math.max(maxDisplacement, Math.hypot(v[0], v[1], v[2]));
        return v;
      });
    }
    let maxAbsForce = 0;
    for (const m of members) maxAbsForce = Math.max(maxAbsForce, Math.abs(m.force?.[lc.id] ?? 0));
    return { id: lc.id, name: lc.name, ...(lc.combination ? { combination: true } : {}), loads, reactions: reactionsOf(lc.id), displacement, maxDisplacement, maxAbsForce };
  });

  const positions = nodes.flatMap((n) => [n.position, n.initial]);
  const bounds = boundsOf(positions);
  const planar = model.dimension === 2 || nodes.every((n) => n.position[2] === nodes[0]!.position[2] && n.initial[2] === nodes[0]!.initial[2]);
  const lengths = members.map((m) => dist(nodes[m.a]!.position, nodes[m.b]!.position)).sort((x, y) => x - y);

  return {
    dimension: model.dimension,
    planar,
    units: model.units ?? null,
    nodes,
    members,
    loadCases,
    hasResult: !!result,
    shapeChanged,
    bounds,
    maxArea: members.reduce((mx, m) => Math.max(mx, m.area, m.initialArea), 0),
    medianLength: lengths.length ? lengths[Math.floor(lengths.length / 2)]! : bounds.span,
  };
}

/** Which axis points up on screen: the one the loads mostly act along (gravity), y in 2D. */
export function upAxis(view: TrussView): "y" | "z" {
  if (view.planar) return "y";
  let fy = 0;
  let fz = 0;
  for (const lc of view.loadCases)
    for (const l of lc.loads) {
      fy += Math.abs(l.f[1]);
      fz += Math.abs(l.f[2]);
    }
  return fz > fy ? "z" : "y";
}

function uniqueAxes(axes: AxisName[]): AxisName[] {
  return [...new Set(axes)].sort() as AxisName[];
}

export function dist(p: Vec3, q: Vec3): number {
  return Math.hypot(q[0] - p[0], q[1] - p[1], q[2] - p[2]);
}

export function boundsOf(points: Vec3[]): Bounds {
  if (points.length === 0) return { min: zero(), max: zero(), center: zero(), span: 1 };
  const min: Vec3 = [Infinity, Infinity, Infinity];
  const max: Vec3 = [-Infinity, -Infinity, -Infinity];
  for (const p of points)
    for (let k = 0; k < 3; k++) {
      min[k] = Math.min(min[k]!, p[k]!);
      max[k] = Math.max(max[k]!, p[k]!);
    }
  const center: Vec3 = [(min[0] + max[0]) / 2, (min[1] + max[1]) / 2, (min[2] + max[2]) / 2];
  const span = Math.hypot(max[0] - min[0], max[1] - min[1], max[2] - min[2]) || 1;
  return { min, max, center, span };
}

/**
 * Drawn member radii: the drawn cross-section grows with the member's area (radius with its
 * square root), the largest as thick as a small share of the span or of a typical member,
 * the thinnest still visible.
 */
export function visualRadii(view: TrussView, which: "optimized" | "initial" = "optimized"): Float32Array {
  const rMax = Math.min(view.bounds.span * 0.008, view.medianLength * 0.07) || view.bounds.span * 0.008;
  const rMin = rMax * 0.12;
  const out = new Float32Array(view.members.length);
  const aMax = view.maxArea > 0 ? view.maxArea : 1;
  view.members.forEach((m, i) => {
    const area = which === "optimized" ? m.area : m.initialArea;
    out[i] = Math.max(rMin, rMax * Math.sqrt(Math.max(0, area) / aMax));
  });
  return out;
}

/** A "nice" deformation magnification that makes the largest displacement a few per cent of the span. */
export function defaultDeformationScale(view: TrussView, loadCase: number): number {
  const d = view.loadCases[loadCase]?.maxDisplacement ?? 0;
  if (!(d > 0)) return 1;
  const raw = (0.06 * view.bounds.span) / d;
  return niceNumber(raw);
}

/** Round down to 1, 2 or 5 times a power of ten. */
export function niceNumber(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return 1;
  const p = Math.pow(10, Math.floor(Math.log10(x)));
  const f = x / p;
  const m = f >= 5 ? 5 : f >= 2 ? 2 : 1;
  return m * p;
}

/** Node positions of the deformed shape: optimized position + scale × displacement. */
export function deformedPositions(view: TrussView, loadCase: number, scale: number): Vec3[] {
  const d = view.loadCases[loadCase]?.displacement;
  return view.nodes.map((n, i) => {
    const u = d?.[i] ?? [0, 0, 0];
    return [n.position[0] + scale * u[0], n.position[1] + scale * u[1], n.position[2] + scale * u[2]];
  });
}
