// Constraint screening: only near-active limits enter each subproblem, yet the final design must
// meet every limit, and it must be the optimum found without screening.
import { describe, expect, it } from "vitest";
import { minimize } from "~/engine/sqp";
import { buildResult, prepareRun, type OptimizeOptions } from "~/engine/design/result";
import { groundStructure } from "./ground-structure";
import { parse } from "./models";

function solveCounting(options: OptimizeOptions, formulation: "nested" | "simultaneous") {
  const model = parse(groundStructure({ nx: 7, ny: 3, reach: 2, objective: "mass", loadCases: 1, formulation, deflection: 8 }));
  const run = prepareRun(model, options);
  let requested = 0, calls = 0;
  const inner = run.sqp.derivatives.bind(run.sqp);
  run.sqp.derivatives = (x, rows) => {
    requested += rows.length;
    calls++;
    return inner(x, rows);
  };
  const r = buildResult(run, minimize(run.sqp, run.sqpOptions), 0);
  return { r, meanRows: requested / calls, total: run.design.limits.length };
}

describe("constraint screening", () => {
  for (const formulation of ["nested", "simultaneous"] as const) {
    it(`never leaves a violated limit and finds the unscreened optimum (${formulation})`, () => {
      const full = solveCounting({ screening: null }, formulation);
      const tight = solveCounting({ screening: 0.05 }, formulation);
      expect(full.total).toBeGreaterThan(150);
      expect(full.meanRows).toBe(full.total);
      expect(tight.meanRows).toBeLessThan(0.5 * tight.total);
      for (const { r } of [full, tight]) {
        expect(r.verification!.allLimitsMet).toBe(true);
        expect(r.verification!.failures).toEqual([]);
        expect(r.maxViolation).toBeLessThan(1e-6);
      }
      expect(full.r.status).toBe("optimal");
      expect(tight.r.status).toBe("optimal");
      expect(Math.abs(tight.r.objective.final - full.r.objective.final) / full.r.objective.final).toBeLessThan(1e-5);
    });
  }
});
