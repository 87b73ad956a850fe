// The design block as the editor's form fields (text as typed) and back. Empty fields leave a
// key out and numbers are read with Number(), so the engine's parser reports what is wrong
// with the same words an upload gets; keys the form does not show ride along in `extra`.
// Groups are not here: their bounds are the editor's groups table (model-rows.ts).
import type { GridRow } from "./EditableGrid";

type Obj = Record<string, unknown>;

export interface DesignFields {
  /** false: the model is only analysed (no design block) */
  enabled: boolean;
  objective: string;
  /** "" when the file leaves it to the default (nested) */
  formulation: string;
  /** "" when the file leaves it to the default (continuous) */
  sizing: string;
  areaMin: string;
  areaMax: string;
  /** null when the file does not say (no stress limit) */
  stress: boolean | null;
  /** rows { node, axis, limit }; node "*" is every node */
  displacement: GridRow[];
  volumeOn: boolean;
  volumeMax: string;
  bucklingOn: boolean;
  sectionRatio: string;
  /** "" when the file leaves it to the default (1) */
  effectiveLengthFactor: string;
  /** rows { id, min, max, moves }, moves as text "node axis factor; …" */
  shape: GridRow[];
  maxIterations: string;
  tolerance: string;
  /** keys of the design block and of its constraints the form does not show */
  extra: Obj;
  extraConstraints: Obj;
}

const s = (v: unknown) => (v === undefined || v === null ? "" : String(v));
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
/** A number as typed; text that is not one stays text, so the parser names it as an upload would. */
const num = (v: string): number | string | undefined => {
  const x = v.trim();
  if (x === "") return undefined;
  const n = Number(x);
  return Number.isFinite(n) ? n : x;
};
const clean = (o: Obj) => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined));
const blank = (r: GridRow) => Object.values(r).every((v) => !v || !v.trim());

const DESIGN_KEYS = new Set(["objective", "formulation", "sizing", "areaBounds", "groups", "shape", "constraints", "solver"]);
const CONSTRAINT_KEYS = new Set(["stress", "displacement", "volume", "buckling"]);

export function movesText(moves: unknown): string {
  if (!Array.isArray(moves)) return "";
  return moves.map((m: Obj) => [s(m.node), s(m.axis), m.factor === undefined ? "" : s(m.factor)].filter(Boolean).join(" ")).join("; ");
}

/** "n3 y 1; n4 y -0.5" → moves; a word that is not a number where a factor goes stays text so the parser names it. */
export function parseMoves(text: string): Obj[] {
  return text
    .split(/[;\n]/)
    .map((part) => part.trim())
    .filter(Boolean)
    .map((part) => {
      const [node = "", axis = "", factor] = part.split(/[\s,]+/);
      const f = factor === undefined ? undefined : Number.isFinite(Number(factor)) ? Number(factor) : factor;
      return clean({ node, axis, factor: f });
    });
}

export function toDesignFields(design: unknown): DesignFields {
  const d = isObj(design) ? design : {};
  const c = isObj(d.constraints) ? d.constraints : {};
  const bounds = isObj(d.areaBounds) ? d.areaBounds : {};
  const buckling = isObj(c.buckling) ? c.buckling : null;
  const volume = isObj(c.volume) ? c.volume : null;
  const solver = isObj(d.solver) ? d.solver : {};
  return {
    enabled: isObj(design),
    objective: s(d.objective) || "mass",
    formulation: s(d.formulation),
    sizing: s(d.sizing),
    areaMin: s(bounds.min),
    areaMax: s(bounds.max),
    stress: typeof c.stress === "boolean" ? c.stress : null,
    displacement: (Array.isArray(c.displacement) ? (c.displacement as Obj[]) : []).map((l) => ({ node: s(l.node), axis: s(l.axis), limit: s(l.limit) })),
    volumeOn: volume !== null,
    volumeMax: s(volume?.max),
    bucklingOn: buckling !== null,
    sectionRatio: s(buckling?.sectionRatio),
    effectiveLengthFactor: s(buckling?.effectiveLengthFactor),
    shape: (Array.isArray(d.shape) ? (d.shape as Obj[]) : []).map((v) => ({ id: s(v.id), min: s(v.min), max: s(v.max), moves: movesText(v.moves) })),
    maxIterations: s(solver.maxIterations),
    tolerance: s(solver.tolerance),
    extra: Object.fromEntries(Object.entries(d).filter(([k]) => !DESIGN_KEYS.has(k))),
    extraConstraints: Object.fromEntries(Object.entries(c).filter(([k]) => !CONSTRAINT_KEYS.has(k))),
  };
}

/**
 * The design block the fields describe, or undefined when the model is only analysed.
 * `original` is the block the fields were read from: a sub-object it had stays even when
 * the form leaves it empty, so opening and saving a model changes nothing.
 */
export function fromDesignFields(f: DesignFields, groups: Obj[], original?: unknown): Obj | undefined {
  if (!f.enabled) return undefined;
  const o = isObj(original) ? original : {};
  const areaBounds = f.areaMin.trim() || f.areaMax.trim() || isObj(o.areaBounds) ? clean({ min: num(f.areaMin), max: num(f.areaMax) }) : undefined;
  const displacement = f.displacement.filter((r) => !blank(r)).map((r) => clean({ node: (r.node ?? "").trim(), axis: (r.axis ?? "").trim(), limit: num(r.limit ?? "") }));
  const constraints = clean({
    ...f.extraConstraints,
    stress: f.stress ?? undefined,
    displacement: displacement.length || (isObj(o.constraints) && Array.isArray(o.constraints.displacement)) ? displacement : undefined,
    volume: f.volumeOn ? clean({ max: num(f.volumeMax) }) : undefined,
    buckling: f.bucklingOn ? clean({ sectionRatio: num(f.sectionRatio), effectiveLengthFactor: num(f.effectiveLengthFactor) }) : undefined,
  });
  const shape = f.shape.filter((r) => !blank(r)).map((r) => clean({ id: (r.id ?? "").trim(), min: num(r.min ?? ""), max: num(r.max ?? ""), moves: parseMoves(r.moves ?? "") }));
  const solver = f.maxIterations.trim() || f.tolerance.trim() || isObj(o.solver) ? clean({ maxIterations: num(f.maxIterations), tolerance: num(f.tolerance) }) : undefined;
  return clean({
    objective: f.objective,
    formulation: f.formulation || undefined,
    sizing: f.sizing || undefined,
    areaBounds,
    groups: groups.length || Array.isArray(o.groups) ? groups : undefined,
    shape: shape.length || Array.isArray(o.shape) ? shape : undefined,
    constraints: Object.keys(constraints).length || isObj(o.constraints) ? constraints : undefined,
    solver,
    ...f.extra,
  });
}

export type GravityAxis = "y" | "z";

/** Own weight acts along -y in a 2D model and -z in 3D (docs/model-format.md). */
export function gravityAxis(dimension: unknown): GravityAxis {
  return dimension === 3 ? "z" : "y";
}

/**
 * The length a deflection limit is a fraction of: for a limit along the gravity axis, the
 * span (the model's longest horizontal extent); for a sideways limit, the height (its extent
 * along the gravity axis), as a tower's sway is measured.
 */
export function referenceLength(nodes: { x: number; y: number; z?: number }[], axis: string, gravity: GravityAxis): { length: number; basis: "span" | "height" } {
  const extent = (k: "x" | "y" | "z") => {
    let lo = Infinity;
    let hi = -Infinity;
    for (const n of nodes) {
      const v = k === "z" ? (n.z ?? 0) : n[k];
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
    return hi > lo ? hi - lo : 0;
  };
  const horizontal = (["x", "y", "z"] as const).filter((k) => k !== gravity && (gravity === "z" || k !== "z"));
  const sideways = axis !== gravity && axis !== "all" && axis !== "";
  if (sideways && extent(gravity) > 0) return { length: extent(gravity), basis: "height" };
  return { length: Math.max(0, ...horizontal.map(extent)), basis: "span" };
}

/** Common practice for service deflection (not a code rule): span / 250. */
export const DEFAULT_DEFLECTION_RATIO = 250;

/** A limit for span (or height) / ratio, rounded to three significant figures. */
export function limitForRatio(length: number, ratio: number): string {
  if (!(length > 0) || !(ratio > 0)) return "";
  return String(Number((length / ratio).toPrecision(3)));
}

/** The ratio a limit stands for (span / limit), or null when it does not read as one. */
export function ratioOfLimit(length: number, limit: string): number | null {
  const l = Number(limit);
  if (!limit.trim() || !(l > 0) || !(length > 0)) return null;
  return length / l;
}

/**
 * Fields for a model that had no design block: least mass, stress on, span / 250 on every node
 * along gravity, and area bounds in the generators' proportions to the largest starting area
 * (1/40 to 10 times: 50 to 20,000 mm² around 2,000 mm²).
 */
export function startingDesign(model: { dimension: unknown; nodes: { x: number; y: number; z?: number }[]; members: { area?: number }[] }, current: DesignFields): DesignFields {
  const g = gravityAxis(model.dimension);
  const { length } = referenceLength(model.nodes, g, g);
  const largest = Math.max(0, ...model.members.map((m) => (typeof m.area === "number" && Number.isFinite(m.area) ? m.area : 0)));
  const sig3 = (v: number) => String(Number(v.toPrecision(3)));
  const bounds = largest > 0 && !current.areaMin.trim() && !current.areaMax.trim() ? { areaMin: sig3(largest / 40), areaMax: sig3(largest * 10) } : {};
  return {
    ...current,
    ...bounds,
    enabled: true,
    objective: current.objective || "mass",
    stress: current.stress ?? true,
    displacement: current.displacement.length ? current.displacement : [{ node: "*", axis: g, limit: limitForRatio(length, DEFAULT_DEFLECTION_RATIO) }],
  };
}
