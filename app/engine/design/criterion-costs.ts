// What each design criterion costs: the solver's multipliers summed by what the engineer can
// change (a material's allowable stresses, a deflection limit as written, the volume cap, a
// group's buckling length, the minimum and maximum sizes, a shape range), as the first-order
// objective saving of relaxing that criterion by 1 %.
//
// Sensitivity theorem of nonlinear programming (common practice): at a regular optimum
// dF*/dp = sum_k mu_k dg_k/dp over the binding limits g_k <= 0 and bounds. With the ratio forms
// of problem.ts and F = f / f0:
//   a limit value b (stress, deflection, volume), g = r / b - 1:  b -> 1.01 b changes g by -0.01 (1 + g)
//   a buckling length k L, g = (-sigma - sigma_E) / sigma_ref, sigma_E proportional to 1 / k^2:
//                                                                  k -> 0.99 k changes g by -0.02 sigma_E / sigma_ref
//   an area bound z >= l (z = A / A_ref):                          l -> 0.99 l moves the bound by 0.01 l
//   a shape range min..max, scaled to width 2:                     each end moves out by 0.01 * 2
// so the saving is f0 * sum mu_k * (that change). Only a run proved optimal (and accepted by the
// re-analysis) has multipliers that mean this: result.ts gives other results none.
import type { SqpResult } from "../sqp";
import type { CriterionCost, CriterionKind, CriterionPlace } from "./result-types";
import { designState, type DesignProblem } from "./problem";
import { eulerStress } from "./buckling";
import { memberLengths } from "./element";
import { unitLabel } from "../truss/units";
import type { Units } from "../truss/schema";

/** the relaxation every saving is quoted for */
export const RELAXATION = 0.01;
/** binding places kept per criterion (the result stays small on ground structures) */
export const CRITERION_PLACES = 8;
/** multipliers below this (scaled, dimensionless) count as zero, as in shadow-prices.ts */
const MULTIPLIER_FLOOR = 1e-9;
const AXES = ["x", "y", "z"] as const;

interface Draft extends Omit<CriterionCost, "share" | "places"> {
  places: Map<string, CriterionPlace>;
}

export function criterionCosts(p: DesignProblem, r: SqpResult, objectiveScale: number, objectiveFinal: number): CriterionCost[] {
  const s = p.structure;
  const u = p.model.units;
  const stressUnit = unitLabel("stress", u as Units);
  const drafts = new Map<string, Draft>();
  const open = (id: string, kind: CriterionKind, subject: string, value: number, unit: string, extra: Partial<Draft> = {}): Draft => {
    let d = drafts.get(id);
    if (!d) {
      d = { id, kind, subject, value, unit, saving: 0, count: 0, places: new Map(), ...extra };
      drafts.set(id, d);
    }
    return d;
  };
  const charge = (d: Draft, saving: number, place: Omit<CriterionPlace, "saving">) => {
    d.saving += saving;
    d.count += 1;
    const key = JSON.stringify(place);
    const prev = d.places.get(key);
    if (prev) prev.saving += saving;
    else d.places.set(key, { ...place, saving });
  };

  // criteria the model states are listed even when they cost nothing at this design
  const materials = new Map(p.model.materials.map((m) => [m.id, m as { id: string; name?: string }]));
  const materialName = (id: string) => materials.get(id)?.name ?? id;
  const stressMaterials = new Set<string>();
  for (const lim of p.limits) if (lim.kind === "stress-tension" || lim.kind === "stress-compression") stressMaterials.add(`${lim.kind}|${p.model.members[lim.member].material}`);
  for (const key of [...stressMaterials].sort()) {
    const [kind, mat] = key.split("|");
    const e = p.model.members.findIndex((m) => m.material === mat);
    const tension = kind === "stress-tension";
    open(`allowable-${tension ? "tension" : "compression"}:${mat}`, tension ? "allowable-tension" : "allowable-compression", materialName(mat), tension ? s.allowTension[e] : s.allowCompression[e], stressUnit);
  }
  const specs = p.deflectionSpecs;
  const usedSpecs = new Set(p.limits.filter((l) => l.kind === "displacement").map((l) => l.spec));
  specs.forEach((spec, k) => {
    if (usedSpecs.has(k)) open(`deflection:${k}`, "deflection", spec.node === "*" ? "every node" : spec.node, spec.limit, u.length, { node: spec.node, axis: spec.axis });
  });
  const volume = p.limits.find((l) => l.kind === "volume");
  if (volume) open("volume", "volume", "the design", volume.limit, `${u.length}³`);

  let final: { areas: Float64Array; lengths: Float64Array } | null = null;
  const finalState = () => {
    if (!final) {
      const { areas, coords } = designState(p, r.x);
      final = { areas, lengths: memberLengths(s, coords) };
    }
    return final;
  };
  p.limits.forEach((lim, k) => {
    const mu = Math.max(0, r.multipliers.ineq[k] ?? 0);
    if (!(mu > MULTIPLIER_FLOOR)) return;
    const base = objectiveScale * mu * (1 + r.ineq[k]);
    const lc = lim.loadCase >= 0 ? s.responseIds[lim.loadCase] : undefined;
    switch (lim.kind) {
      case "stress-tension":
      case "stress-compression": {
        const tension = lim.kind === "stress-tension";
        const mat = p.model.members[lim.member].material;
        const d = open(`allowable-${tension ? "tension" : "compression"}:${mat}`, tension ? "allowable-tension" : "allowable-compression", materialName(mat), lim.limit, stressUnit);
        charge(d, RELAXATION * base, { member: s.memberIds[lim.member], case: lc });
        return;
      }
      case "displacement": {
        const spec = specs[lim.spec ?? 0];
        const d = open(`deflection:${lim.spec ?? 0}`, "deflection", spec.node === "*" ? "every node" : spec.node, spec.limit, u.length, { node: spec.node, axis: spec.axis });
        charge(d, RELAXATION * base, { node: s.nodeIds[Math.floor(lim.dof / 3)], axis: AXES[lim.dof % 3], case: lc });
        return;
      }
      case "volume":
        charge(open("volume", "volume", "the design", lim.limit, `${u.length}³`), RELAXATION * base, {});
        return;
      case "buckling": {
        const v = p.areaVars[p.memberVar[lim.member]];
        const d = open(`buckling-length:${v.id}`, "buckling-length", v.id, p.buckling!.k[lim.member], "");
        // sigma_E goes with 1 / (k L)^2: a 1 % shorter buckling length raises it by about 2 %,
        // which lowers g by 2 % of sigma_E / sigma_ref (sigma_E of the final member)
        const e = lim.member;
        const euler = eulerStress(p.buckling!, e, s.E[e], finalState().areas[e], finalState().lengths[e]);
        charge(d, 2 * RELAXATION * objectiveScale * mu * (euler / lim.limit), { member: s.memberIds[e], case: lc });
        return;
      }
      case "length":
        return; // the shortest-length guard of shape runs is the engine's, not a criterion to relax
    }
  });

  const groups = new Map((p.model.design?.groups ?? []).map((g) => [g.id, g]));
  p.areaVars.forEach((v, k) => {
    const lo = Math.max(0, r.multipliers.lower[k] ?? 0);
    const hi = Math.max(0, r.multipliers.upper[k] ?? 0);
    const own = groups.get(v.id);
    if (lo > MULTIPLIER_FLOOR) {
      const subject = own?.min !== undefined ? v.id : "*";
      charge(open(`min-size:${subject}`, "min-size", subject, v.min, `${u.length}²`), objectiveScale * lo * RELAXATION * (v.min / v.scale), { variable: v.id });
    }
    if (hi > MULTIPLIER_FLOOR) {
      const subject = own?.max !== undefined ? v.id : "*";
      charge(open(`max-size:${subject}`, "max-size", subject, v.max, `${u.length}²`), objectiveScale * hi * RELAXATION * (v.max / v.scale), { variable: v.id });
    }
  });
  const nA = p.areaVars.length;
  p.shapeVars.forEach((v, k) => {
    const mu = Math.max(0, r.multipliers.lower[nA + k] ?? 0) + Math.max(0, r.multipliers.upper[nA + k] ?? 0);
    if (mu > MULTIPLIER_FLOOR) {
      const d = open(`shape-range:${v.id}`, "shape-range", v.id, v.max - v.min, u.length);
      charge(d, objectiveScale * mu * RELAXATION * ((v.max - v.min) / v.scale), { variable: v.id });
    }
  });

  return [...drafts.values()]
    .map(({ places, ...d }) => ({
      ...d,
      share: objectiveFinal > 0 ? d.saving / objectiveFinal : 0,
      places: [...places.values()].sort((a, b) => b.saving - a.saving).slice(0, CRITERION_PLACES),
    }))
    .sort((a, b) => b.saving - a.saving || a.id.localeCompare(b.id));
}
