// Exact derivatives with own weight and load combinations in both formulations, against
// central finite differences of the formulations' own values (common practice for adjoint
// code). The density is raised a thousandfold so that own weight is of the order of the point
// loads and an error in its derivative cannot hide below the tolerance.
import { describe, expect, it } from "vitest";
import { analyze, buildStructure, type TrussModel } from "~/engine/truss";
import { buildDesignProblem } from "~/engine/design/problem";
import { nestedFormulation } from "~/engine/design/nested";
import { simultaneousFormulation } from "~/engine/design/simultaneous";
import { checkProblem, rng } from "../design/fd-check";
import { mast3d, parse } from "../design/models";

function heavyMast(objective: "mass" | "compliance", sections: boolean): TrussModel {
  const m = mast3d();
  m.materials[0].density = 7.85e-6;
  m.loadCases = [
    { id: "G", name: "Own weight", selfWeight: 1, loads: [] },
    ...m.loadCases.map((lc) => ({ ...lc, selfWeight: lc.id === "side" ? 0.5 : undefined })),
  ];
  m.combinations = [
    { id: "STR-1", use: "strength", factors: { G: 1.35, wind: 1.5 } },
    { id: "STR-2", use: "strength", factors: { G: 1.0, wind: 0.6, side: 1.5 } },
    { id: "SRV-1", use: "service", factors: { G: 1, wind: 1, side: 1 } },
  ];
  m.members[0].bucklingFactor = 0.7;
  if (sections) {
    m.sections = [
      { id: "s1", area: 300, I: 4.1e4, family: "CHS" },
      { id: "s2", area: 700, I: 2.6e5, family: "CHS" },
      { id: "s3", area: 1500, I: 1.5e6, family: "CHS" },
    ];
  }
  m.design!.objective = objective;
  return parse(m);
}

describe("own weight and combinations: derivatives match central differences", () => {
  for (const [name, make] of [
    ["3D mast, mass, shape, sections fit", () => heavyMast("mass", true)],
    ["3D mast, mass, sectionRatio", () => heavyMast("mass", false)],
    ["3D mast, compliance", () => heavyMast("compliance", false)],
  ] as const) {
    for (const formulation of ["nested", "simultaneous"] as const) {
      it(`${name} (${formulation})`, () => {
        const model = make();
        const p = buildDesignProblem(model, buildStructure(model), { formulation, buckling: true });
        // the combinations carry the limits: strength limits name STR-*, deflection SRV-1
        expect(p.limits.some((l) => l.id === "stress:B0-M0:STR-2")).toBe(true);
        expect(p.limits.some((l) => l.id === "displacement:T:x:SRV-1")).toBe(true);
        expect(p.limits.some((l) => l.id.endsWith(":wind"))).toBe(false);
        const f = formulation === "nested" ? nestedFormulation(p) : simultaneousFormulation(p);
        const rand = rng(11);
        const x = Float64Array.from(f.problem.x0);
        for (let k = 0; k < p.areaVars.length; k++) x[k] *= 0.7 + 0.6 * rand();
        for (let k = p.areaVars.length; k < p.nDesign; k++) x[k] = 0.3 * (rand() - 0.5);
        for (let k = p.nDesign; k < x.length; k++) x[k] *= 0.9 + 0.2 * rand();
        expect(checkProblem(f.problem, x, 1e-6)).toBeLessThan(1e-5);
      });
    }
  }

  it("own weight is a real share of the load in these models", () => {
    const model = heavyMast("mass", false);
    const a = analyze(buildStructure(model));
    const own = -a.loads[0].reduce((t, v, q) => (q % 3 === 2 ? t + v : t), 0);
    expect(own).toBeGreaterThan(0.1 * 50000);
  });
});
