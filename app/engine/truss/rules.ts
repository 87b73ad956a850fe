// Cross-reference rules of docs/model-format.md that a per-field schema cannot express. They run on
// the raw input as well as it can be read, so they report alongside the schema's errors.
import type { IssueList } from "./issues";
import { checkMagnitudes } from "./magnitudes";

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const list = (v: unknown): Obj[] => (Array.isArray(v) ? v.map((x) => (isObj(x) ? x : {})) : []);
const str = (v: unknown): string | undefined => (typeof v === "string" && v.trim() ? v : undefined);
const num = (v: unknown): number | undefined => (typeof v === "number" && Number.isFinite(v) ? v : undefined);

function duplicates(errors: IssueList, items: Obj[], base: (string | number)[], kind: string): Map<string, number> {
  const seen = new Map<string, number>();
  items.forEach((it, i) => {
    const id = str(it.id);
    if (id === undefined) return;
    const prev = seen.get(id);
    if (prev !== undefined) errors.add([...base, i, "id"], `duplicate ${kind} id "${id}" (also used by ${base.join(".")}[${prev}])`);
    else seen.set(id, i);
  });
  return seen;
}

export function checkReferences(raw: unknown, errors: IssueList): void {
  if (!isObj(raw)) return;
  const dim = raw.dimension === 2 ? 2 : 3;
  const materials = list(raw.materials);
  const nodes = list(raw.nodes);
  const members = list(raw.members);
  const loadCases = list(raw.loadCases);

  const materialIds = duplicates(errors, materials, ["materials"], "material");
  const nodeIds = duplicates(errors, nodes, ["nodes"], "node");
  duplicates(errors, members, ["members"], "member");
  const caseIds = duplicates(errors, loadCases, ["loadCases"], "load case");
  const sections = list(raw.sections);
  const sectionIds = duplicates(errors, sections, ["sections"], "section");
  checkCombinations(list(raw.combinations), caseIds, errors);
  checkMagnitudes(raw, errors);

  members.forEach((m, e) => {
    const a = str(m.start);
    const b = str(m.end);
    if (a !== undefined && !nodeIds.has(a)) errors.add(["members", e, "start"], `starts at unknown node "${a}"`);
    if (b !== undefined && !nodeIds.has(b)) errors.add(["members", e, "end"], `ends at unknown node "${b}"`);
    if (a !== undefined && a === b) errors.add(["members", e, "end"], `starts and ends at the same node "${a}"`);
    else if (a !== undefined && b !== undefined && nodeIds.has(a) && nodeIds.has(b)) {
      const p = nodes[nodeIds.get(a)!];
      const q = nodes[nodeIds.get(b)!];
      const d = [num(q.x)! - num(p.x)!, num(q.y)! - num(p.y)!, dim === 3 ? (num(q.z) ?? 0) - (num(p.z) ?? 0) : 0];
      if (d.every((v) => Number.isFinite(v)) && Math.hypot(d[0], d[1], d[2]) === 0) {
        errors.add(["members", e], `has zero length: nodes "${a}" and "${b}" are at the same position`);
      }
    }
    const mat = str(m.material);
    if (mat !== undefined && !materialIds.has(mat)) errors.add(["members", e, "material"], `uses material "${mat}", which is not defined in materials`);
    const sec = str(m.section);
    if (sec === undefined && m.area === undefined) errors.add(["members", e, "area"], `"area" is missing: give the member an area or a section`);
    if (sec !== undefined && !sectionIds.has(sec)) {
      errors.add(["members", e, "section"], sections.length > 0
        ? `uses section "${sec}", which is not in the model's sections catalogue`
        : `uses section "${sec}", but the model lists no sections`);
    }
  });

  loadCases.forEach((lc, c) => {
    list(lc.loads).forEach((l, k) => {
      const n = str(l.node);
      if (n !== undefined && !nodeIds.has(n)) errors.add(["loadCases", c, "loads", k, "node"], `acts on unknown node "${n}"`);
    });
  });

  if (isObj(raw.design)) checkDesign(raw.design, { dim, nodes, nodeIds, members, materials, materialIds, sections }, errors);
}

/** Combinations: ids apart from the load cases' (results share one map), factors on known cases. */
function checkCombinations(combinations: Obj[], caseIds: Map<string, number>, errors: IssueList): void {
  const seen = new Map<string, number>();
  combinations.forEach((c, i) => {
    const id = str(c.id);
    if (id !== undefined) {
      if (caseIds.has(id)) errors.add(["combinations", i, "id"], `combination id "${id}" is also a load case id (loadCases[${caseIds.get(id)}]); results list both in one map, so the ids must differ`);
      const prev = seen.get(id);
      if (prev !== undefined) errors.add(["combinations", i, "id"], `duplicate combination id "${id}" (also used by combinations[${prev}])`);
      else seen.set(id, i);
    }
    if (!isObj(c.factors)) return;
    const keys = Object.keys(c.factors);
    if (keys.length === 0) errors.add(["combinations", i, "factors"], `combination "${id ?? i}" has no factors: name at least one load case`);
    for (const k of keys) {
      if (!caseIds.has(k)) errors.add(["combinations", i, "factors", k], `combination "${id ?? i}" puts a factor on unknown load case "${k}"`);
    }
  });
}

interface Context {
  dim: 2 | 3;
  nodes: Obj[];
  nodeIds: Map<string, number>;
  members: Obj[];
  materials: Obj[];
  materialIds: Map<string, number>;
  sections: Obj[];
}

function checkDesign(d: Obj, ctx: Context, errors: IssueList): void {
  const groups = list(d.groups);
  const shape = list(d.shape);
  duplicates(errors, groups, ["design", "groups"], "group");
  duplicates(errors, shape, ["design", "shape"], "shape variable");

  const used = new Set<string>();
  for (const m of ctx.members) {
    const g = str(m.group);
    if (g !== undefined) used.add(g);
  }
  const declared = new Map<string, Obj>();
  groups.forEach((g, i) => {
    const id = str(g.id);
    if (id !== undefined) {
      declared.set(id, g);
      if (!used.has(id)) errors.add(["design", "groups", i, "id"], `no member belongs to group "${id}" (check the members' "group" fields)`);
    }
    const lo = num(g.min);
    const hi = num(g.max);
    if (lo !== undefined && hi !== undefined && lo > hi) errors.add(["design", "groups", i], `min (${lo}) is greater than max (${hi})`);
  });

  const bounds = isObj(d.areaBounds) ? d.areaBounds : undefined;
  if (bounds) {
    const lo = num(bounds.min);
    const hi = num(bounds.max);
    if (lo !== undefined && hi !== undefined && lo > hi) errors.add(["design", "areaBounds"], `min (${lo}) is greater than max (${hi})`);
  }
  // members that take their bounds from areaBounds
  const needBounds = ctx.members.filter((m) => {
    const g = str(m.group);
    if (g === undefined) return true;
    const dg = declared.get(g);
    return !dg || num(dg.min) === undefined || num(dg.max) === undefined;
  });
  if (!bounds && needBounds.length > 0) {
    const names = needBounds.slice(0, 3).map((m) => str(m.id) ?? "?");
    errors.add(["design", "areaBounds"], `areaBounds { min, max } is required: member${needBounds.length > 1 ? "s" : ""} ${names.join(", ")}${needBounds.length > 3 ? ` and ${needBounds.length - 3} more` : ""} have no declared group bounds`);
  }

  shape.forEach((v, i) => {
    const lo = num(v.min);
    const hi = num(v.max);
    if (lo !== undefined && hi !== undefined && lo > hi) errors.add(["design", "shape", i], `min (${lo}) is greater than max (${hi})`);
    list(v.moves).forEach((mv, k) => {
      const n = str(mv.node);
      if (n !== undefined && !ctx.nodeIds.has(n)) errors.add(["design", "shape", i, "moves", k, "node"], `moves unknown node "${n}"`);
      if (ctx.dim === 2 && mv.axis === "z") errors.add(["design", "shape", i, "moves", k, "axis"], "moves a node in z, but the model is 2D (x, y only)");
      if (mv.factor === 0) errors.add(["design", "shape", i, "moves", k, "factor"], "factor 0 moves nothing; give a non-zero factor or remove the move");
    });
  });

  const cons = isObj(d.constraints) ? d.constraints : {};
  checkSizing(d, ctx, declared, bounds, errors);
  const buckling = isObj(cons.buckling) ? cons.buckling : undefined;
  if (buckling && ctx.sections.length === 0 && num(buckling.sectionRatio) === undefined) {
    errors.add(["design", "constraints", "buckling", "sectionRatio"], "sectionRatio is needed for the buckling check when the model lists no sections (I = sectionRatio * A^2)");
  }
  list(cons.displacement).forEach((lim, k) => {
    const n = str(lim.node);
    if (n !== undefined && n !== "*" && !ctx.nodeIds.has(n)) errors.add(["design", "constraints", "displacement", k, "node"], `limits unknown node "${n}" (use a node id or "*")`);
    if (ctx.dim === 2 && lim.axis === "z") errors.add(["design", "constraints", "displacement", k, "axis"], "limits z, but the model is 2D (use x, y or all)");
  });
  if (cons.stress === true) {
    ctx.materials.forEach((m, i) => {
      if (num(m.allowableTension) === undefined || num(m.allowableCompression) === undefined) {
        errors.add(["materials", i], "the stress constraint is on, so allowableTension and allowableCompression are both needed");
      }
    });
  }

  // a design block must leave something to optimize
  const areaVarsFree = areaVariables(ctx.members, declared, bounds).some((b) => b.min === undefined || b.max === undefined || b.min < b.max);
  const shapeFree = shape.some((v) => {
    const lo = num(v.min);
    const hi = num(v.max);
    return lo === undefined || hi === undefined || lo < hi;
  });
  if (!areaVarsFree && !shapeFree) {
    errors.add(["design"], "leaves nothing to optimize: every area variable has min equal to max and there are no shape variables with a range");
  }
}

/** Catalogue sizing needs sections, and every area variable at least one section within its bounds. */
function checkSizing(d: Obj, ctx: Context, declared: Map<string, Obj>, bounds: Obj | undefined, errors: IssueList): void {
  if (d.sizing !== "catalogue") return;
  if (ctx.sections.length === 0) {
    errors.add(["design", "sizing"], 'catalogue sizing needs a section catalogue: add "sections" to the model (or choose sizing "continuous")');
    return;
  }
  const areas = ctx.sections.map((s) => num(s.area)).filter((a): a is number => a !== undefined);
  for (const v of areaVariables(ctx.members, declared, bounds)) {
    if (v.min === undefined || v.max === undefined) continue;
    if (!areas.some((a) => a >= v.min! && a <= v.max!)) {
      errors.add(["design", "sizing"], `${v.label} has no section with an area within its bounds ${v.min}..${v.max}: widen the bounds or add sections`);
    }
  }
}

/** The bounds of each area variable (one per group, one per ungrouped member). */
function areaVariables(members: Obj[], declared: Map<string, Obj>, bounds: Obj | undefined): { label: string; min?: number; max?: number }[] {
  const seen = new Set<string>();
  const out: { label: string; min?: number; max?: number }[] = [];
  const def = { min: bounds ? num(bounds.min) : undefined, max: bounds ? num(bounds.max) : undefined };
  for (const m of members) {
    const g = str(m.group);
    if (g !== undefined) {
      if (seen.has(g)) continue;
      seen.add(g);
      const dg = declared.get(g);
      out.push({ label: `group "${g}"`, min: num(dg?.min) ?? def.min, max: num(dg?.max) ?? def.max });
    } else out.push({ label: `member "${str(m.id) ?? "?"}"`, ...def });
  }
  return out;
}
