// The analytic derivatives of both formulations against central finite differences of their
// own function values (the standard check of an adjoint implementation, common practice).
import { describe, expect, it } from "vitest";
import { buildStructure } from "~/engine/truss";
import { buildDesignProblem } from "~/engine/design/problem";
import { nestedFormulation } from "~/engine/design/nested";
import { simultaneousFormulation } from "~/engine/design/simultaneous";
import { checkProblem, rng } from "./fd-check";
import { fixture, mast3d, parse } from "./models";
import type { TrussModel } from "~/engine/truss";

const cases: [string, () => TrussModel][] = [
  ["ten-bar (stress, displacement)", () => fixture("ten-bar.truss.json")],
  ["two-bar with apex height", () => fixture("two-bar-shape.truss.json")],
  ["three-bar, two load cases", () => fixture("three-bar.truss.json")],
  ["determinate compliance", () => fixture("determinate-compliance.truss.json")],
  ["3D mast: shape, buckling, volume, two load cases", () => parse(mast3d())],
  ["3D mast, compliance objective", () => { const m = mast3d(); m.design!.objective = "compliance"; return parse(m); }],
];

describe("design derivatives match central differences", () => {
  for (const [name, make] of cases) {
    for (const formulation of ["nested", "simultaneous"] as const) {
      it(`${name} (${formulation})`, () => {
        const model = make();
        const p = buildDesignProblem(model, buildStructure(model), { formulation, buckling: true });
        const f = formulation === "nested" ? nestedFormulation(p) : simultaneousFormulation(p);
        const rand = rng(7);
        const x = Float64Array.from(f.problem.x0);
        // move away from the symmetric start so that no derivative vanishes by accident
        for (let k = 0; k < p.areaVars.length; k++) x[k] *= 0.7 + 0.6 * rand();
        for (let k = p.areaVars.length; k < p.nDesign; k++) x[k] = 0.3 * (rand() - 0.5);
        for (let k = p.nDesign; k < x.length; k++) x[k] *= 0.9 + 0.2 * rand();
        expect(checkProblem(f.problem, x, 1e-6)).toBeLessThan(1e-5);
      });
    }
  }
});
