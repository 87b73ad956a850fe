// The simultaneous formulation on a small girder with Euler buckling and deflection limits
// (seeded random truss 10 of tests/support/random-trusses.ts: 17 members, each its own
// variable, ft-lbf-lb). It used to stop at its start ("no step could reduce the objective"):
// the first multipliers counted every unbounded displacement variable as sitting on its bound
// (Infinity <= tol * Infinity), the least-squares system went degenerate, the penalty took
// ~1e16 from it and no step could be a descent direction. Reference: scipy.optimize SLSQP
// (Debian's python3-scipy) on the same problem through tests/python/slsqp_design.py; loud skip
// without scipy.
import { describe, expect, it } from "vitest";
import { buildStructure } from "~/engine/truss";
import { optimizeModel } from "~/engine/design";
import { buildDesignProblem } from "~/engine/design/problem";
import { nestedFormulation } from "~/engine/design/nested";
import { findScipy, loudSkip } from "../../support/scipy";
import { randomTruss } from "../../support/random-trusses";
import { runSlsqpDesigns } from "./slsqp-design-reference";

const hasScipy = findScipy() !== null;
if (!hasScipy) loudSkip("the simultaneous formulation's start on a small buckling-limited girder (tests/engine/design/simultaneous-start.test.ts)");

describe.skipIf(!hasScipy)("simultaneous formulation from its start", () => {
  it("a 17-member girder with buckling and deflection limits reaches the SLSQP optimum with both formulations", () => {
    const t = randomTruss(10);
    expect(t.label).toBe("seed 10: girder, 17 members, ungrouped, buckling, sizing only, ft-lbf-lb");
    const p = buildDesignProblem(t.model, buildStructure(t.model), {});
    expect(p.limits.some((l) => l.kind === "displacement") && p.limits.some((l) => l.kind === "buckling")).toBe(true);
    const ref = runSlsqpDesigns([{ p, f0: nestedFormulation(p).objectiveScale }])![0];
    expect(ref.success, ref.message).toBe(true);
    for (const formulation of ["nested", "simultaneous"] as const) {
      const r = optimizeModel(t.model, { formulation });
      expect(r.status, `${formulation}: ${r.message}`).toBe("optimal");
      expect(r.iterations).toBeGreaterThan(0);
      expect(r.verification!.allLimitsMet).toBe(true);
      expect(Math.abs(r.objective.final - ref.f) / ref.f, `${formulation}: ${r.objective.final} vs SLSQP ${ref.f}`).toBeLessThan(1e-4);
    }
  }, 60_000);
});
