// Suspicious but legal input: reported as warnings, the model still loads.
import type { IssueList } from "./issues";
import { KNOWN_KEYS, type TrussModel } from "./schema";
import { memberLengths, type Structure } from "./structure";

/** Slenderness L / r above which a member is flagged (common practice: 300 is a usual cap for tension members). */
export const SLENDERNESS_WARNING = 300;
/** Without a declared section ratio, L / sqrt(A) above this is flagged as extreme. */
export const LENGTH_TO_SIZE_WARNING = 1000;

export function unknownFieldWarnings(raw: unknown, warnings: IssueList): void {
  if (typeof raw !== "object" || raw === null) return;
  const r = raw as Record<string, unknown>;
  const check = (obj: unknown, known: readonly string[], path: (string | number)[]) => {
    if (typeof obj !== "object" || obj === null || Array.isArray(obj)) return;
    for (const k of Object.keys(obj)) if (!known.includes(k)) warnings.add([...path, k], `unknown field "${k}" is ignored`);
  };
  check(r, KNOWN_KEYS.root, []);
  const each = (arr: unknown, known: readonly string[], base: string) => {
    if (Array.isArray(arr)) arr.forEach((it, i) => check(it, known, [base, i]));
  };
  each(r.materials, KNOWN_KEYS.material, "materials");
  each(r.nodes, KNOWN_KEYS.node, "nodes");
  each(r.members, KNOWN_KEYS.member, "members");
  if (Array.isArray(r.members)) {
    r.members.forEach((m, e) => {
      const mm = (typeof m === "object" && m !== null ? m : {}) as Record<string, unknown>;
      if (typeof mm.section === "string" && mm.area !== undefined) {
        warnings.add(["members", e, "area"], `area ${String(mm.area)} is ignored: the member starts from section "${mm.section}"`);
      }
    });
  }
  each(r.loadCases, KNOWN_KEYS.loadCase, "loadCases");
  each(r.sections, KNOWN_KEYS.section, "sections");
  each(r.combinations, KNOWN_KEYS.combination, "combinations");
  if (Array.isArray(r.loadCases)) {
    r.loadCases.forEach((lc, c) => {
      if (lc && typeof lc === "object" && Array.isArray((lc as { loads?: unknown }).loads)) {
        (lc as { loads: unknown[] }).loads.forEach((l, k) => check(l, KNOWN_KEYS.load, ["loadCases", c, "loads", k]));
      }
    });
  }
  check(r.design, KNOWN_KEYS.design, ["design"]);
}

export function modelWarnings(model: TrussModel, s: Structure, warnings: IssueList): void {
  const dim = model.dimension;
  const axes = ["x", "y", "z"] as const;

  model.nodes.forEach((n, i) => {
    if (!s.connected[i]) warnings.add(["nodes", i], "no member connects this node; the analysis ignores it");
    if (dim === 2 && n.z !== undefined && n.z !== 0) warnings.add(["nodes", i, "z"], `z = ${n.z} is ignored in a 2D model`);
    const f = n.fixed ?? [];
    if (new Set(f).size !== f.length) warnings.add(["nodes", i, "fixed"], "an axis is listed more than once");
  });

  // coincident nodes
  const at = new Map<string, number>();
  model.nodes.forEach((n, i) => {
    const key = `${n.x},${n.y},${dim === 3 ? (n.z ?? 0) : 0}`;
    const prev = at.get(key);
    if (prev !== undefined) warnings.add(["nodes", i], `is at the same position as node ${model.nodes[prev].id}`);
    else at.set(key, i);
  });

  const nodeIndex = new Map(s.nodeIds.map((id, i) => [id, i]));
  model.loadCases.forEach((lc, c) => {
    const f = s.loads[c];
    if (!f.some((v) => v !== 0) && !lc.selfWeight) warnings.add(["loadCases", c], "has no non-zero loads");
    lc.loads.forEach((l, k) => {
      const i = nodeIndex.get(l.node) ?? -1;
      const comps = [l.fx, l.fy, l.fz] as const;
      for (let a = 0; a < 3; a++) {
        const v = comps[a];
        if (v === undefined || v === 0) continue;
        if (dim === 2 && a === 2) {
          warnings.add(["loadCases", c, "loads", k, "fz"], "fz is ignored in a 2D model");
          continue;
        }
        if (i >= 0 && s.fixed[3 * i + a]) {
          warnings.add(["loadCases", c, "loads", k, `f${axes[a]}`], `acts on node ${l.node} in ${axes[a]}, a supported direction: it goes straight into the support`);
        }
      }
    });
  });

  // slender members, duplicate members, stiffness contrast
  const lengths = memberLengths(s);
  const ratio = model.design?.constraints?.buckling?.sectionRatio;
  const k = model.design?.constraints?.buckling?.effectiveLengthFactor ?? 1;
  const pairs = new Map<string, number>();
  let kMin = Infinity;
  let kMax = 0;
  model.members.forEach((m, e) => {
    const L = lengths[e];
    if (!(L > 0)) return;
    if (ratio !== undefined) {
      const r = Math.sqrt(ratio * m.area);
      const lambda = (k * L) / r;
      if (lambda > SLENDERNESS_WARNING) warnings.add(["members", e], `is very slender: kL/r = ${lambda.toFixed(0)} (r from the buckling sectionRatio) exceeds ${SLENDERNESS_WARNING}`);
    } else {
      const q = L / Math.sqrt(m.area);
      if (q > LENGTH_TO_SIZE_WARNING) warnings.add(["members", e], `is very slender: length / sqrt(area) = ${q.toFixed(0)}; check the area and the units`);
    }
    const key = s.start[e] < s.end[e] ? `${s.start[e]}-${s.end[e]}` : `${s.end[e]}-${s.start[e]}`;
    const prev = pairs.get(key);
    if (prev !== undefined) warnings.add(["members", e], `joins the same two nodes as member ${model.members[prev].id}`);
    else pairs.set(key, e);
    const stiff = (s.E[e] * m.area) / L;
    kMin = Math.min(kMin, stiff);
    kMax = Math.max(kMax, stiff);
  });
  if (kMax / kMin > 1e10) warnings.add(["members"], `axial stiffnesses E A / L span ${(kMax / kMin).toExponential(1)}: results may lose accuracy; check units and areas`);

  const d = model.design;
  if (d) {
    const lo = d.areaBounds?.min;
    const hi = d.areaBounds?.max;
    const groups = new Map((d.groups ?? []).map((g) => [g.id, g]));
    model.members.forEach((m, e) => {
      const g = m.group ? groups.get(m.group) : undefined;
      const min = g?.min ?? lo;
      const max = g?.max ?? hi;
      if ((min !== undefined && m.area < min) || (max !== undefined && m.area > max)) {
        warnings.add(["members", e, "area"], `starting area ${m.area} is outside its bounds [${min}, ${max}]; the optimizer starts from the nearest bound`);
      }
    });
    (d.shape ?? []).forEach((v, i) => {
      if (v.min > 0 || v.max < 0) warnings.add(["design", "shape", i], `range [${v.min}, ${v.max}] excludes 0, the geometry as given`);
    });
    const c = d.constraints ?? {};
    const anyLimit = c.stress === true || (c.displacement?.length ?? 0) > 0 || c.volume !== undefined || c.buckling !== undefined;
    if (d.objective === "mass" && !anyLimit) warnings.add(["design", "constraints"], "minimum mass without any limit puts every area at its lower bound; switch on stress, displacement, buckling or volume limits (here or in the job options)");
    if (d.objective === "compliance" && c.volume === undefined) warnings.add(["design", "constraints"], "minimum compliance without a volume limit puts every area at its upper bound; add constraints.volume (here or in the job options)");
  }
}
