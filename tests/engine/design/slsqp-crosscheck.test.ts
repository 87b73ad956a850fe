// Cross-check against scipy.optimize SLSQP (Debian's python3-scipy, a general-purpose reference
// library) on generated trusses: same variables, same ratio limits, same analytic gradients,
// solved by tests/python/slsqp_truss.py. Without scipy the check is skipped with a loud message.
import { describe, expect, it } from "vitest";
import { buildStructure } from "~/engine/truss";
import { optimizeModel } from "~/engine/design";
import { buildDesignProblem } from "~/engine/design/problem";
import { nestedFormulation } from "~/engine/design/nested";
import { groundStructure, type GroundOptions } from "./ground-structure";
import { parse } from "./models";
import { runSlsqp, scipyPython } from "./slsqp-reference";

const hasScipy = scipyPython() !== null;
if (!hasScipy) {
  console.warn("\n!!!!!!!! python3-scipy NOT FOUND: the SLSQP cross-check of the truss design is SKIPPED !!!!!!!!\n" +
    "!!!!!!!! install it with: apt-get install -y python3-scipy                                     !!!!!!!!\n");
}

const cases: [string, GroundOptions][] = [
  ["36-member grid, mass with stress and tip deflection", { nx: 5, ny: 3, reach: 1, objective: "mass", deflection: 6 }],
  ["86-member ground structure, minimum compliance", { nx: 7, ny: 3, reach: 2, objective: "compliance" }],
  ["86-member ground structure, mass with tip deflection only", { nx: 7, ny: 3, reach: 2, objective: "mass", stress: false, deflection: 8 }],
];

describe.skipIf(!hasScipy)("design optimum equals scipy SLSQP on generated trusses", () => {
  for (const [name, opts] of cases) {
    it(name, () => {
      const model = parse(groundStructure(opts));
      const p = buildDesignProblem(model, buildStructure(model), {});
      const ref = runSlsqp(p, nestedFormulation(p).objectiveScale, { maxiter: 1000 })!;
      expect(ref.success, ref.message).toBe(true);
      for (const formulation of ["nested", "simultaneous"] as const) {
        const r = optimizeModel(model, { formulation });
        expect(r.verification!.allLimitsMet).toBe(true);
        if (formulation === "nested") expect(r.status).toBe("optimal");
        expect(Math.abs(r.objective.final - ref.f) / ref.f, `${formulation}: ${r.objective.final} vs SLSQP ${ref.f}`).toBeLessThan(1e-4);
      }
    });
  }
});
