// What every generator shares: the parameter fields engineers set on each of them (material,
// design block, deflection ratio), the model header in mm, N and t, and small builders.
// Parameters are in the units engineers speak (m, kN, kN/m, kN/m², MPa, mm²); the model the
// generators write is in mm, N and t, so areas and stresses read in mm² and MPa.
import { z } from "zod";
import type { TrussModelInput } from "../truss";

export const M_TO_MM = 1000;
export const KN_TO_N = 1000;

/** A number parameter with its unit and a sentence, shown by the generator form and the JSON Schema. */
export function num(opts: { default: number; unit: string; description: string; min?: number; max?: number; positive?: boolean; int?: boolean }) {
  let s = z.number({ error: `must be a number (${opts.unit})` });
  if (opts.int) s = s.int({ error: "must be a whole number" });
  if (opts.positive) s = s.gt(0, { error: `must be greater than 0 ${opts.unit}` });
  if (opts.min !== undefined) s = s.min(opts.min, { error: `must be at least ${opts.min}${opts.unit === "count" ? "" : ` ${opts.unit}`}` });
  if (opts.max !== undefined) s = s.max(opts.max, { error: `must be at most ${opts.max}${opts.unit === "count" ? "" : ` ${opts.unit}`}` });
  return s.default(opts.default).meta({ description: opts.description, unit: opts.unit });
}

export function choice<T extends readonly [string, ...string[]]>(values: T, def: T[number], description: string) {
  return z.enum(values, { error: `must be one of ${values.join(", ")}` }).default(def as never).meta({ description });
}

/**
 * Fields every generator takes. The deflection ratio of 250 (limit = span / 250) is a common
 * practice default for members under service loads, not a code rule: the engineer sets theirs.
 */
export const commonFields = {
  name: z.string({ error: "must be text" }).trim().min(1, { error: "must not be empty" }).max(200, { error: "must be at most 200 characters" }).optional().meta({ description: "Model name (a generated one when empty)" }),
  E: num({ default: 210000, unit: "MPa", description: "Elastic modulus of the material (structural steel: 210000 MPa)", positive: true }),
  density: num({ default: 7850, unit: "kg/m³", description: "Density of the material (structural steel: 7850 kg/m³)", positive: true }),
  allowableStress: num({ default: 235, unit: "MPa", description: "Allowable stress in tension and compression", positive: true }),
  area: num({ default: 2000, unit: "mm²", description: "Starting area of every member", positive: true }),
  design: z.boolean({ error: "must be true or false" }).default(true).meta({ description: "Add a design block (least mass, stress and deflection limits, member groups)" }),
  deflectionRatio: num({
    default: 250,
    unit: "count",
    description: "Deflection limit as span / this ratio (250: common practice for service loads, not a code rule; set your own)",
    min: 10,
    max: 10000,
  }),
  minArea: num({ default: 50, unit: "mm²", description: "Smallest area the design may choose", positive: true }),
  maxArea: num({ default: 20000, unit: "mm²", description: "Largest area the design may choose", positive: true }),
};

export type CommonParams = {
  name?: string;
  E: number;
  density: number;
  allowableStress: number;
  area: number;
  design: boolean;
  deflectionRatio: number;
  minArea: number;
  maxArea: number;
};

type Node = TrussModelInput["nodes"][number];
type Member = TrussModelInput["members"][number];
type Load = TrussModelInput["loadCases"][number]["loads"][number];
type DisplacementLimit = NonNullable<NonNullable<NonNullable<TrussModelInput["design"]>["constraints"]>["displacement"]>[number];

/** Nodes and members collected while a generator walks its geometry; ids are kept unique. */
export class ModelBuilder {
  readonly nodes: Node[] = [];
  readonly members: Member[] = [];
  readonly loads: Load[] = [];
  private readonly ids = new Set<string>();
  constructor(private readonly area: number) {}

  node(id: string, x: number, y: number, z?: number, fixed?: ("x" | "y" | "z")[]): string {
    if (this.ids.has(id)) return id;
    this.ids.add(id);
    const r = (v: number) => Math.round(v * 1e6) / 1e6; // whole micrometres: files stay readable
    this.nodes.push({ id, x: r(x), y: r(y), ...(z === undefined ? {} : { z: r(z) }), ...(fixed?.length ? { fixed } : {}) });
    return id;
  }

  fix(id: string, axes: ("x" | "y" | "z")[]): void {
    const n = this.nodes.find((q) => q.id === id);
    if (n) n.fixed = axes;
  }

  member(id: string, start: string, end: string, group: string): void {
    this.members.push({ id, start, end, material: "steel", area: this.area, group });
  }

  load(node: string, f: { fx?: number; fy?: number; fz?: number }): void {
    const r = (v: number) => Math.round(v * 1e6) / 1e6;
    this.loads.push({ node, ...Object.fromEntries(Object.entries(f).map(([k, v]) => [k, r(v)])) });
  }
}

/** The model around a builder's nodes and members: header, material, one load case, design block. */
export function assemble(
  b: ModelBuilder,
  p: CommonParams,
  opts: {
    name: string;
    description: string;
    dimension: 2 | 3;
    loadCase: { id: string; name: string };
    groups: string[];
    deflection: DisplacementLimit;
  },
): TrussModelInput {
  const used = new Set(b.members.map((m) => m.group));
  const model: TrussModelInput = {
    format: "strutwise.truss",
    version: 1,
    name: p.name?.trim() || opts.name,
    description: opts.description,
    units: { length: "mm", force: "N", mass: "t" },
    dimension: opts.dimension,
    // density in t/mm³ from kg/m³: 1 kg/m³ = 1e-3 t / 1e9 mm³
    materials: [{ id: "steel", name: "Steel", E: p.E, density: p.density * 1e-12, allowableTension: p.allowableStress, allowableCompression: p.allowableStress }],
    nodes: b.nodes,
    members: b.members,
    loadCases: [{ id: opts.loadCase.id, name: opts.loadCase.name, loads: b.loads }],
  };
  if (p.design) {
    model.design = {
      objective: "mass",
      formulation: "nested",
      areaBounds: { min: p.minArea, max: p.maxArea },
      groups: opts.groups.filter((g) => used.has(g)).map((id) => ({ id })),
      constraints: { stress: true, displacement: [opts.deflection] },
    };
  }
  return model;
}

/**
 * Tributary shares of a line load over points along one axis between `from` and `to`: each
 * point takes from the midpoint with its left neighbour (or `from`) to the midpoint with its
 * right neighbour (or `to`). The shares add up to (to - from).
 */
export function tributaryLengths(xs: number[], from: number, to: number): number[] {
  const order = xs.map((x, i) => [x, i] as const).sort((a, b) => a[0] - b[0]);
  const out = new Array<number>(xs.length).fill(0);
  order.forEach(([x, i], k) => {
    const left = k === 0 ? from : (order[k - 1]![0] + x) / 2;
    const right = k === order.length - 1 ? to : (x + order[k + 1]![0]) / 2;
    out[i] = right - left;
  });
  return out;
}
