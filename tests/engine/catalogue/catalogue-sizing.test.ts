// Catalogue sizing: the discrete designs of the ten-bar cantilever and of a 3D lattice tower
// are never heavier than rounding up and repairing, never lighter than the continuous optimum,
// and meet every limit when the test re-checks them itself (a fresh analysis here, stresses
// and Euler buckling by the textbook formulas).
import { describe, expect, it } from "vitest";
import { analyze, buildStructure, parseModel, type TrussModel } from "~/engine/truss";
import { optimizeModel, type TrussResult } from "~/engine/design";
import { genericCatalogue } from "~/engine/sections";
import { fixture } from "../design/models";
import { latticeTower } from "../../support/lattice-tower";

/** Independent check: areas and I of the chosen sections, every stress and buckling limit. */
function recheck(model: TrussModel, r: TrussResult): number {
  const byId = new Map((model.sections ?? []).map((s) => [s.id, s]));
  const areas = Float64Array.from(r.members, (m) => byId.get(m.section!)!.area);
  const s = buildStructure(model);
  const a = analyze(s, { areas });
  const c = model.design!.constraints!;
  const k0 = c.buckling?.effectiveLengthFactor ?? 1;
  const responses = s.combinations.length ? s.combinations.map((cb, k) => (cb.use === "strength" ? s.loadCaseIds.length + k : -1)).filter((x) => x >= 0) : s.loadCaseIds.map((_, l) => l);
  let worst = 0;
  for (const rr of responses) {
    for (let e = 0; e < areas.length; e++) {
      const sigma = a.stresses[rr][e];
      worst = Math.max(worst, sigma >= 0 ? sigma / s.allowTension[e] : -sigma / s.allowCompression[e]);
      if (c.buckling && sigma < 0) {
        const I = byId.get(r.members[e].section!)!.I;
        const kL = (model.members[e].bucklingFactor ?? k0) * a.lengths[e];
        worst = Math.max(worst, -sigma / ((Math.PI ** 2 * s.E[e] * I) / (kL * kL * areas[e])));
      }
    }
  }
  return worst;
}

describe("catalogue sizing: ten-bar cantilever with the generic catalogue in inches", () => {
  // continuous optimum 5060.8 lb (Haftka & Gurdal, Elements of Structural Optimization, the
  // ten-bar truss; also tests/engine/design/benchmarks.test.ts)
  const base = fixture("ten-bar.truss.json");
  const sections = genericCatalogue("in").map((s) => ({ id: s.id, area: s.area, I: s.I, family: s.family }));
  const model: TrussModel = { ...base, sections, design: { ...base.design!, sizing: "catalogue", areaBounds: { min: 0.1, max: 40 } } };

  it("is feasible, between the continuous optimum and round-up-and-repair", () => {
    const r = optimizeModel(model);
    expect(r.status, r.message).toBe("optimal");
    expect(r.continuousObjective!).toBeCloseTo(5060.8, -1);
    expect(r.objective.final).toBeGreaterThanOrEqual(r.continuousObjective! * (1 - 1e-9));
    expect(r.objective.final).toBeLessThanOrEqual(r.catalogue!.roundedObjective);
    expect(r.verification!.allLimitsMet).toBe(true);
    expect(recheck(model, r)).toBeLessThanOrEqual(1 + 1e-9);
    // the displacement limit is re-checked too
    const u = Math.max(...r.nodes.flatMap((n) => n.displacement.LC1.map(Math.abs)));
    expect(u).toBeLessThanOrEqual(2 * (1 + 1e-9));
    for (const m of r.members) expect(sections.find((s) => s.id === m.section)!.area).toBe(m.area);
    expect(r.catalogue!.choices.every((c) => c.steppedBy.length > 0)).toBe(true);
    // a discrete design has no multipliers: the continuous optimum's criterion costs stand in, named so
    expect(r.criterionCostsOf).toBe("continuous optimum");
    expect(r.criterionCosts!.find((c) => c.id === "deflection:0")!.saving).toBeGreaterThan(0);
  });
});

describe("catalogue sizing: 3D lattice tower with own weight and combinations", () => {
  const parsed = parseModel(latticeTower({ levels: 6, bands: 3, sections: 40 }));
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
  const model = parsed.model;

  it("is feasible, between the continuous optimum and round-up-and-repair, and names the governing limits", () => {
    const r = optimizeModel(model);
    expect(r.status, r.message).toBe("optimal");
    expect(r.objective.final).toBeGreaterThanOrEqual(r.continuousObjective! * (1 - 1e-9));
    expect(r.objective.final).toBeLessThanOrEqual(r.catalogue!.roundedObjective);
    expect(r.verification!.allLimitsMet).toBe(true);
    expect(recheck(model, r)).toBeLessThanOrEqual(1 + 1e-9);
    const top = r.nodes.find((n) => n.id === "N6-0")!;
    expect(Math.abs(top.displacement["SRV-1"][0])).toBeLessThanOrEqual(12000 / 150 * (1 + 1e-9));
    // every member of a group shares one section
    const byGroup = new Map<string, Set<string>>();
    for (const m of r.members) byGroup.set(m.group!, (byGroup.get(m.group!) ?? new Set()).add(m.section!));
    for (const set of byGroup.values()) expect(set.size).toBe(1);
    // a group above the lightest section names the limit a lighter one breaks, on a strength or service combination
    for (const c of r.catalogue!.choices) expect(c.steppedBy).toMatch(/^(lightest|objective|(stress|buckling):.+:STR-\d|displacement:.+:SRV-1)$/);
    expect(r.reactions!.length).toBe(4);
    expect(r.sectionFit!.count).toBe(40);
    expect(r.sectionFit!.maxRelativeError).toBeGreaterThan(0);
  });
});
