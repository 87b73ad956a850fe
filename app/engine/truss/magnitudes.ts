// Sane ranges for the magnitudes of a model (docs/model-format.md, "Rules the gate enforces"). The schema
// refuses what is not a finite number; these refuse finite numbers no truss can have, such as
// a node at y = -1e300 or a modulus of 1e40, which would otherwise overflow the analysis into
// Infinity and NaN. The ranges hold in any of the model's units (mm or m, N or kN or kip):
// they are wide enough for every unit choice and still far from floating-point trouble.
import type { IssueList } from "./issues";

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const list = (v: unknown): Obj[] => (Array.isArray(v) ? v.map((x) => (isObj(x) ? x : {})) : []);

export interface SaneRange {
  what: string;
  /** largest allowed absolute value */
  maxAbs: number;
  /** smallest allowed absolute value other than zero (positive quantities) */
  minAbs?: number;
}

export const SANE: Record<string, SaneRange> = {
  coordinate: { what: "a coordinate", maxAbs: 1e8 },
  load: { what: "a load component", maxAbs: 1e12 },
  modulus: { what: "an elastic modulus", maxAbs: 1e13, minAbs: 1e-3 },
  stress: { what: "an allowable stress", maxAbs: 1e13, minAbs: 1e-6 },
  density: { what: "a density", maxAbs: 1e6, minAbs: 1e-15 },
  area: { what: "an area", maxAbs: 1e9, minAbs: 1e-12 },
  inertia: { what: "a second moment of area", maxAbs: 1e15, minAbs: 1e-24 },
  displacement: { what: "a displacement limit", maxAbs: 1e8, minAbs: 1e-12 },
  volume: { what: "a volume", maxAbs: 1e24, minAbs: 1e-30 },
  factor: { what: "a factor", maxAbs: 1e6 },
};

const fmt = (v: number) => (Math.abs(v) >= 1e6 || (v !== 0 && Math.abs(v) < 1e-3) ? v.toExponential() : String(v));

function check(errors: IssueList, path: (string | number)[], label: string, value: unknown, range: SaneRange): void {
  if (typeof value !== "number" || !Number.isFinite(value)) return; // the schema names those
  const abs = Math.abs(value);
  if (abs > range.maxAbs || (range.minAbs !== undefined && abs !== 0 && abs < range.minAbs)) {
    const bounds = range.minAbs !== undefined ? `between ${fmt(range.minAbs)} and ${fmt(range.maxAbs)}` : `at most ${fmt(range.maxAbs)} in size`;
    errors.add(path, `${label} is ${fmt(value)}, outside the sane range for ${range.what} (${bounds} in the model's units); check the value and its unit`);
  }
}

const name = (kind: string, it: Obj, i: number) => (typeof it.id === "string" && it.id ? `${kind} "${it.id}"` : `${kind} ${i + 1}`);

/** Adds an error for every magnitude outside its sane range, naming the item and the field. */
export function checkMagnitudes(raw: Obj, errors: IssueList): void {
  list(raw.nodes).forEach((n, i) => {
    for (const axis of ["x", "y", "z"]) check(errors, ["nodes", i, axis], `${name("node", n, i)}: ${axis}`, n[axis], SANE.coordinate!);
  });
  list(raw.materials).forEach((m, i) => {
    check(errors, ["materials", i, "E"], `${name("material", m, i)}: E`, m.E, SANE.modulus!);
    check(errors, ["materials", i, "density"], `${name("material", m, i)}: density`, m.density, SANE.density!);
    for (const f of ["allowableTension", "allowableCompression"]) check(errors, ["materials", i, f], `${name("material", m, i)}: ${f}`, m[f], SANE.stress!);
  });
  list(raw.members).forEach((m, i) => check(errors, ["members", i, "area"], `${name("member", m, i)}: area`, m.area, SANE.area!));
  list(raw.sections).forEach((s, i) => {
    check(errors, ["sections", i, "area"], `${name("section", s, i)}: area`, s.area, SANE.area!);
    check(errors, ["sections", i, "I"], `${name("section", s, i)}: I`, s.I, SANE.inertia!);
  });
  list(raw.loadCases).forEach((lc, c) => {
    check(errors, ["loadCases", c, "selfWeight"], `${name("load case", lc, c)}: selfWeight`, lc.selfWeight, SANE.factor!);
    list(lc.loads).forEach((l, j) => {
      for (const f of ["fx", "fy", "fz"]) check(errors, ["loadCases", c, "loads", j, f], `${name("load case", lc, c)}, load ${j + 1}${typeof l.node === "string" ? ` on node "${l.node}"` : ""}: ${f}`, l[f], SANE.load!);
    });
  });
  list(raw.combinations).forEach((cb, i) => {
    if (isObj(cb.factors)) for (const [k, v] of Object.entries(cb.factors)) check(errors, ["combinations", i, "factors", k], `${name("combination", cb, i)}: factor of "${k}"`, v, SANE.factor!);
  });
  const design = isObj(raw.design) ? raw.design : null;
  if (!design) return;
  if (isObj(design.areaBounds)) for (const b of ["min", "max"]) check(errors, ["design", "areaBounds", b], `design areaBounds: ${b}`, design.areaBounds[b], SANE.area!);
  list(design.groups).forEach((g, i) => {
    for (const b of ["min", "max"]) check(errors, ["design", "groups", i, b], `${name("group", g, i)}: ${b}`, g[b], SANE.area!);
  });
  list(design.shape).forEach((s, i) => {
    for (const b of ["min", "max"]) check(errors, ["design", "shape", i, b], `${name("shape variable", s, i)}: ${b}`, s[b], SANE.coordinate!);
    list(s.moves).forEach((mv, j) => check(errors, ["design", "shape", i, "moves", j, "factor"], `${name("shape variable", s, i)}, move ${j + 1}: factor`, mv.factor, SANE.factor!));
  });
  const cons = isObj(design.constraints) ? design.constraints : null;
  if (!cons) return;
  list(cons.displacement).forEach((d, i) =>
    check(errors, ["design", "constraints", "displacement", i, "limit"], `displacement limit ${i + 1}${typeof d.node === "string" ? ` at node "${d.node}"` : ""}: limit`, d.limit, SANE.displacement!),
  );
  if (isObj(cons.volume)) check(errors, ["design", "constraints", "volume", "max"], "volume limit: max", cons.volume.max, SANE.volume!);
  if (isObj(cons.buckling)) {
    check(errors, ["design", "constraints", "buckling", "sectionRatio"], "buckling: sectionRatio", cons.buckling.sectionRatio, SANE.factor!);
    check(errors, ["design", "constraints", "buckling", "effectiveLengthFactor"], "buckling: effectiveLengthFactor", cons.buckling.effectiveLengthFactor, SANE.factor!);
  }
}
