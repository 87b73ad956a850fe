// Both formulations reach the same optimum with own weight and combinations (to 1e-4): the
// nested one carries the load's derivative in the adjoint, the simultaneous one in the
// equilibrium rows, so agreement checks both against each other at the solution.
import { describe, expect, it } from "vitest";
import { parseModel } from "~/engine/truss";
import { optimizeModel } from "~/engine/design";
import { latticeTower } from "../../support/lattice-tower";

describe("nested and simultaneous agree with own weight and combinations", () => {
  it("3D lattice tower, 64 members, 8 groups, fitted I, own weight a hundredfold heavier", () => {
    const results = (["nested", "simultaneous"] as const).map((formulation) => {
      const m = latticeTower({ levels: 4, bands: 2, sections: 30, sizing: "continuous", formulation });
      m.materials[0].density = 7.85e-7; // own weight of the order of the wind load
      const parsed = parseModel(m);
      if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
      return optimizeModel(parsed.model, { tolerance: 1e-8 });
    });
    for (const r of results) {
      expect(r.status, r.message).toBe("optimal");
      expect(r.verification!.allLimitsMet).toBe(true);
    }
    const [a, b] = results;
    expect(Math.abs(a.objective.final / b.objective.final - 1)).toBeLessThan(1e-4);
    for (let e = 0; e < a.members.length; e++) expect(Math.abs(a.members[e].area - b.members[e].area) / a.members[e].area).toBeLessThan(1e-3);
    // own weight took part: the G case has forces, and the reactions carry it
    const g = a.reactionBalance!.find((x) => x.id === "G")!;
    expect(-g.applied[2]).toBeCloseTo(a.mass! * 9806.65, 6);
  });
});
