// What each design criterion costs, against re-solves with that criterion relaxed by 1 %: the
// model file itself is edited the way the engineer would (a material's allowable, a deflection
// limit, the volume cap, the minimum area, the buckling factor of a group) and solved again.
// First-order prediction (sensitivity theorem, common practice): the re-solve relaxed by 1 %
// agrees to the second-order term (a few per cent), the central difference of +-0.1 % closely.
// Only small steps are taken both ways: tightening the ten-bar's deflection limit by 1 % already
// changes which members sit at the minimum area, and the first-order figure holds up to such a
// change.
import { describe, expect, it } from "vitest";
import { optimizeContinuous } from "~/engine/design/result";
import type { CriterionCost, TrussResult } from "~/engine/design/result-types";
import type { TrussModel } from "~/engine/truss";
import type { JobOptions } from "~/engine/design/options";
import { fixture, parse } from "./models";

type Edit = (m: Record<string, any>, factor: number) => void; // factor 1.01 relaxes, 0.99 tightens

function solveEdited(model: TrussModel, edit: Edit | null, factor: number, options: JobOptions): TrussResult {
  const raw = JSON.parse(JSON.stringify(model));
  if (edit) edit(raw, factor);
  return optimizeContinuous(parse(raw), { ...options, maxIterations: 400 });
}

// closedShare: the saving as a share of the objective where a closed form gives it
const cases: { name: string; file: string; options?: JobOptions; criterion: string; edit: Edit; closedShare?: number }[] = [
  {
    // three-bar truss of constrained-optimization test sets (optimum 263.9, from memory): the
    // outer bars and the middle bar are stress-governed in tension
    name: "three-bar: allowable tension stress of the material",
    file: "three-bar.truss.json",
    criterion: "allowable-tension:unit",
    // only stress limits bind, so every area scales with 1 / allowable: 1 % of the mass
    closedShare: 0.01,
    edit: (m, f) => (m.materials[0].allowableTension *= f),
  },
  {
    // ten-bar cantilever (Haftka & Gurdal, optimum near 5060.8 lb, from memory): the 2 in tip
    // deflection limit governs
    name: "ten-bar: the deflection limit as written (2 in at every node)",
    file: "ten-bar.truss.json",
    criterion: "deflection:0",
    edit: (m, f) => (m.design.constraints.displacement[0].limit *= f),
  },
  {
    // ten-bar: several members end at the 0.1 in2 minimum area
    name: "ten-bar: the minimum area",
    file: "ten-bar.truss.json",
    criterion: "min-size:*",
    edit: (m, f) => (m.design.areaBounds.min /= f), // relaxing a minimum lowers it
  },
  {
    // minimum compliance under a volume cap, statically determinate: C = (sum |N| L)^2 / (E V)
    // (common practice), so 1 % more volume saves 1/1.01 of C, first order 1 %
    name: "determinate cantilever: the volume cap (compliance objective)",
    file: "determinate-compliance.truss.json",
    criterion: "volume",
    closedShare: 0.01,
    edit: (m, f) => (m.design.constraints.volume.max *= f),
  },
  {
    // two bars in compression with Euler buckling of a solid round section (I = A^2 / (4 pi),
    // common practice): A grows with k L, so a 1 % shorter buckling length saves about 1 %
    name: "two-bar with apex height, buckling on: the buckling length of the bars",
    file: "two-bar-shape.truss.json",
    options: { buckling: true },
    criterion: "buckling-length:bars",
    closedShare: 0.01,
    edit: (m, f) => {
      for (const mm of m.members) if (mm.group === "bars") mm.bucklingFactor = 1 / f; // shorter when relaxed
    },
  },
];

describe("criterion costs match re-solves with the criterion relaxed by 1 %", () => {
  for (const c of cases) {
    it(c.name, () => {
      const model = fixture(c.file);
      const options = { formulation: "nested" as const, ...c.options };
      const base = solveEdited(model, null, 1, options);
      expect(base.status).toBe("optimal");
      const cost = base.criterionCosts!.find((k) => k.id === c.criterion) as CriterionCost;
      expect(cost, `${c.criterion} among ${base.criterionCosts!.map((k) => k.id).join(", ")}`).toBeDefined();
      expect(cost.saving).toBeGreaterThan(0);
      expect(cost.share).toBeCloseTo(cost.saving / base.objective.final, 12);
      if (c.closedShare !== undefined) expect(Math.abs(cost.share / c.closedShare - 1)).toBeLessThan(1e-3);
      const relaxed = solveEdited(model, c.edit, 1.01, options);
      const up = solveEdited(model, c.edit, 1.001, options);
      const down = solveEdited(model, c.edit, 0.999, options);
      for (const r of [relaxed, up, down]) {
        expect(r.status).toBe("optimal");
        expect(r.verification!.allLimitsMet).toBe(true);
      }
      const oneSided = base.objective.final - relaxed.objective.final;
      const central = (10 * (down.objective.final - up.objective.final)) / 2; // per 1 %
      expect(Math.abs(oneSided - cost.saving) / cost.saving, `one-sided ${oneSided} against ${cost.saving}`).toBeLessThan(0.03);
      expect(Math.abs(central - cost.saving) / cost.saving, `central ${central} against ${cost.saving}`).toBeLessThan(5e-3);
    });
  }
});
