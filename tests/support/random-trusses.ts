// Seeded random trusses for the solver's robustness checks: girders, roof trusses, 3- and
// 4-legged towers and double-layer space grids from the workbench's own generators, then
// varied the way engineers' models vary: grouped or every member its own variable, Euler
// buckling limits (section ratio and effective-length factor drawn), shape variables (a
// girder's rise and sag, a tower's taper, a grid's depth) and odd unit systems (the same
// physical truss in m/kN/t, in/kip/lb, ft/lbf/lb, cm/kN/kg or mm/N/t).
// The same seed gives the same model, so a failing case can be rerun by its seed alone.
import { generateModel } from "~/engine/generators";
import { trussModelSchema, type TrussModel, type TrussModelInput } from "~/engine/truss";
import { seededRandom } from "~/engine/util/seeded-random";

export type RandomKind = "girder" | "roof" | "tower3" | "tower4" | "grid";
export const RANDOM_KINDS: readonly RandomKind[] = ["girder", "roof", "tower3", "tower4", "grid"];

export interface RandomTrussOptions {
  kind?: RandomKind;
  /** "moderate": 10-130 members (cross-checks); "large": up to ~340 members */
  size?: "moderate" | "large";
  /** force the choices the generator would otherwise draw */
  buckling?: boolean;
  shape?: boolean;
  grouped?: boolean;
  units?: UnitSystem["name"];
}

interface UnitSystem {
  name: "mm-N-t" | "m-kN-t" | "in-kip-lb" | "ft-lbf-lb" | "cm-kN-kg";
  units: TrussModelInput["units"];
  /** model unit per mm, per N, per t */
  length: number;
  force: number;
  mass: number;
}

// conversion factors: 1 in = 25.4 mm, 1 lbf = 4.4482216 N, 1 lb = 0.45359237 kg (exact definitions)
const UNIT_SYSTEMS: UnitSystem[] = [
  { name: "mm-N-t", units: { length: "mm", force: "N", mass: "t" }, length: 1, force: 1, mass: 1 },
  { name: "m-kN-t", units: { length: "m", force: "kN", mass: "t" }, length: 1e-3, force: 1e-3, mass: 1 },
  { name: "in-kip-lb", units: { length: "in", force: "kip", mass: "lb" }, length: 1 / 25.4, force: 1 / 4448.2216152605, mass: 1000 / 0.45359237 },
  { name: "ft-lbf-lb", units: { length: "ft", force: "lbf", mass: "lb" }, length: 1 / 304.8, force: 1 / 4.4482216152605, mass: 1000 / 0.45359237 },
  { name: "cm-kN-kg", units: { length: "cm", force: "kN", mass: "kg" }, length: 0.1, force: 1e-3, mass: 1000 },
];

export interface RandomTruss {
  seed: number;
  kind: RandomKind;
  units: UnitSystem["name"];
  buckling: boolean;
  shape: boolean;
  grouped: boolean;
  model: TrussModel;
  /** one line naming what was drawn, for failure messages */
  label: string;
}

export function randomTruss(seed: number, opts: RandomTrussOptions = {}): RandomTruss {
  const rnd = seededRandom(seed * 7919 + 13);
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)]!;
  const between = (lo: number, hi: number) => lo + (hi - lo) * rnd();
  const int = (lo: number, hi: number) => Math.floor(between(lo, hi + 1));
  const large = opts.size === "large";
  const kind = opts.kind ?? pick(RANDOM_KINDS);
  const common = {
    area: Math.round(between(400, 4000)),
    deflectionRatio: Math.round(between(150, 500)),
    minArea: Math.round(between(10, 80)),
    maxArea: Math.round(between(20000, 60000)),
    allowableStress: Math.round(between(140, 355)),
  };
  let generated;
  if (kind === "girder" || kind === "roof") {
    const span = between(6, 36);
    let panels = large ? int(10, 40) : int(4, 10);
    const pattern = pick(["pratt", "howe", "warren", "warren-verticals"] as const);
    const chord = kind === "girder" ? "flat" : pick(["duo-pitch", "mono-pitch"] as const);
    // a duo-pitch Pratt or Howe truss needs a node at the ridge
    if (chord === "duo-pitch" && (pattern === "pratt" || pattern === "howe") && panels % 2 === 1) panels++;
    generated = generateModel("planar-truss", {
      ...common,
      pattern,
      chord,
      span,
      panels,
      depth: kind === "girder" ? span / between(7, 14) : span / between(20, 40),
      ridgeDepth: span / between(4, 8),
      supports: pick(["pinned-roller", "pinned-pinned"] as const),
      lineLoad: between(5, 40),
    });
  } else if (kind === "tower3" || kind === "tower4") {
    const baseWidth = between(2, 6);
    generated = generateModel("lattice-tower", {
      ...common,
      legs: kind === "tower3" ? 3 : 4,
      height: between(6, 40),
      panels: large ? int(6, 14) : int(2, 5),
      baseWidth,
      topWidth: baseWidth * between(0.35, 1),
      bracing: pick(["single", "x", "k"] as const),
      planBracingEvery: int(0, 3),
      tipLoad: between(5, 60),
      tipVertical: between(0, 40),
    });
  } else {
    generated = generateModel("space-grid", {
      ...common,
      layout: pick(["offset", "aligned"] as const),
      modulesX: large ? int(4, 8) : int(2, 4),
      modulesY: large ? int(3, 6) : int(2, 3),
      moduleX: between(1.5, 4),
      moduleY: between(1.5, 4),
      depth: between(1, 3),
      supports: pick(["edges", "corners"] as const),
      areaLoad: between(0.5, 4),
    });
  }
  if (!generated || !generated.ok) throw new Error(`random truss ${seed}: the generator refused its parameters: ${JSON.stringify(generated && !generated.ok ? generated.errors : kind)}`);
  const model = structuredClone(generated.model);
  const design = model.design!;

  const buckling = opts.buckling ?? rnd() < 0.7;
  const shape = opts.shape ?? rnd() < 0.6;
  const grouped = opts.grouped ?? rnd() < 0.4;
  if (buckling) {
    // I = ratio A^2: 1/(4 pi) = 0.08 is a solid round bar, about 0.3-1.5 a tube of D/t 8-40
    design.constraints = { ...design.constraints, buckling: { sectionRatio: between(0.1, 1.2), effectiveLengthFactor: pick([0.7, 0.85, 1]) } };
  }
  if (!grouped) {
    for (const m of model.members) delete m.group;
    delete design.groups;
  }
  if (shape) design.shape = shapeVariables(kind, model, rnd);
  design.solver = { maxIterations: 1500 };

  const system = opts.units ? UNIT_SYSTEMS.find((u) => u.name === opts.units)! : pick(UNIT_SYSTEMS);
  convertUnits(model, system);
  const parsed = trussModelSchema.parse(model);
  const label = `seed ${seed}: ${kind}, ${parsed.members.length} members, ${grouped ? "grouped" : "ungrouped"}, ${buckling ? "buckling" : "no buckling"}, ${shape ? `${design.shape!.length} shape variables` : "sizing only"}, ${system.name}`;
  return { seed, kind, units: system.name, buckling, shape, grouped, model: parsed, label };
}

type Shape = NonNullable<NonNullable<TrussModelInput["design"]>["shape"]>[number];

/** Shape variables in mm (converted with the rest of the model). */
function shapeVariables(kind: RandomKind, model: TrussModelInput, rnd: () => number): Shape[] {
  const nodes = model.nodes;
  const fixed = (n: (typeof nodes)[number]) => Boolean(n.fixed?.length);
  if (kind === "girder" || kind === "roof") {
    // rise: the top chord's interior nodes move up or down along a parabola over the span
    const xs = nodes.map((n) => n.x);
    const x0 = Math.min(...xs), x1 = Math.max(...xs), span = x1 - x0;
    const tops = nodes.filter((n) => /^T/.test(n.id) && !fixed(n));
    const depth = Math.max(...nodes.map((n) => n.y)) || span / 10;
    const parabola = (x: number) => (4 * (x - x0) * (x1 - x)) / (span * span);
    const out: Shape[] = [];
    const riseMoves = tops.filter((n) => parabola(n.x) > 0.05).map((n) => ({ node: n.id, axis: "y" as const, factor: Math.round(parabola(n.x) * 1000) / 1000 }));
    if (riseMoves.length) out.push({ id: "rise", min: -0.35 * depth, max: 0.8 * depth, moves: riseMoves });
    // sag: the bottom chord's interior nodes (a second variable on some girders)
    const bottoms = nodes.filter((n) => /^[BM]/.test(n.id) && !fixed(n) && parabola(n.x) > 0.05);
    if (kind === "girder" && rnd() < 0.5 && bottoms.length) {
      out.push({ id: "sag", min: -0.4 * depth, max: 0.25 * depth, moves: bottoms.map((n) => ({ node: n.id, axis: "y" as const, factor: Math.round(parabola(n.x) * 1000) / 1000 })) });
    }
    return out;
  }
  if (kind === "tower3" || kind === "tower4") {
    // taper: every level above the base moves outwards (or inwards) in proportion to its height
    const H = Math.max(...nodes.map((n) => n.z ?? 0));
    const moves: Shape["moves"] = [];
    let reach = Infinity;
    for (const n of nodes) {
      const z = n.z ?? 0;
      if (fixed(n) || z <= 0) continue;
      const r = Math.hypot(n.x, n.y);
      if (r < 1e-9) continue;
      reach = Math.min(reach, r);
      const f = z / H;
      moves.push({ node: n.id, axis: "x", factor: Math.round((f * n.x) / r * 1000) / 1000 }, { node: n.id, axis: "y", factor: Math.round((f * n.y) / r * 1000) / 1000 });
    }
    return [{ id: "taper", min: -0.5 * reach, max: 0.8 * reach, moves: moves.filter((m) => m.factor !== 0) }];
  }
  // grid: the bottom layer moves down (deeper) or up (shallower) as one
  const zTop = Math.max(...nodes.map((n) => n.z ?? 0));
  const bottoms = nodes.filter((n) => /^B/.test(n.id) && !fixed(n));
  return [{ id: "depth", min: -0.8 * zTop, max: 0.4 * zTop, moves: bottoms.map((n) => ({ node: n.id, axis: "z" as const, factor: 1 })) }];
}

/** Rewrites a model generated in mm, N and t into another unit system, in place. */
function convertUnits(model: TrussModelInput, u: UnitSystem): void {
  if (u.name === "mm-N-t") return;
  const L = u.length, F = u.force, M = u.mass;
  const stress = F / (L * L);
  model.units = u.units;
  for (const n of model.nodes) {
    n.x *= L;
    n.y *= L;
    if (n.z !== undefined) n.z *= L;
  }
  for (const mat of model.materials) {
    mat.E *= stress;
    mat.density *= M / (L * L * L);
    if (mat.allowableTension !== undefined) mat.allowableTension *= stress;
    if (mat.allowableCompression !== undefined) mat.allowableCompression *= stress;
  }
  for (const m of model.members) if (m.area !== undefined) m.area *= L * L;
  for (const lc of model.loadCases) for (const l of lc.loads) for (const k of ["fx", "fy", "fz"] as const) if (l[k] !== undefined) l[k]! *= F;
  const d = model.design!;
  if (d.areaBounds) d.areaBounds = { min: d.areaBounds.min! * L * L, max: d.areaBounds.max! * L * L };
  for (const lim of d.constraints?.displacement ?? []) lim.limit *= L;
  for (const s of d.shape ?? []) {
    s.min *= L;
    s.max *= L;
  }
}
