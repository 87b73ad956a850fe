// Generated-truss cross-check against scipy.optimize SLSQP (Debian's python3-scipy, a
// general-purpose reference library; tests/python/slsqp_design.py analyses and differentiates
// each truss with its own numpy code). 32 seeded random girders, roof trusses, 3- and 4-legged
// towers and space grids (tests/support/random-trusses.ts), every one with Euler buckling
// limits and shape variables, grouped or every member its own variable, in five unit systems.
// Every run must end "optimal", pass the independent re-analysis, and be within 0.2 % of the
// SLSQP optimum from the same start, or lighter. Shape variables make these problems non-convex
// (a tower's taper has a local optimum at each end of its range), so a run here is what the
// product runs by default, several starts (multi-start.ts), cut to the first three (the
// engineer's start, a fully stressed one, the engineer's areas x 2) to keep the file short;
// SLSQP gets the engineer's start only. Without scipy the file skips loudly.
import { afterAll, describe, expect, it } from "vitest";
import { buildStructure } from "~/engine/truss";
import { optimizeWithStarts } from "~/engine/design";
import { buildDesignProblem } from "~/engine/design/problem";
import { nestedFormulation } from "~/engine/design/nested";
import { findScipy, loudSkip } from "../../support/scipy";
import { RANDOM_KINDS, randomTruss } from "../../support/random-trusses";
import { startSlsqpDesigns, type SlsqpDesignOutcome } from "./slsqp-design-reference";

/** "within 0.2 % of SLSQP or better" */
const MASS_TOLERANCE = 2e-3;
const COUNT = 32;
/** starts per run (the product's default is 6 on models of this size) */
const STARTS = 3;

const hasScipy = findScipy() !== null;
if (!hasScipy) loudSkip("the generated-truss cross-check against scipy SLSQP (tests/engine/design/random-trusses.test.ts)");

const trusses = Array.from({ length: COUNT }, (_, i) =>
  randomTruss(1000 + i, { kind: RANDOM_KINDS[i % RANDOM_KINDS.length], size: "moderate", buckling: true, shape: true }),
);

describe.skipIf(!hasScipy)("generated trusses with buckling and shape variables: optimal, and as light as scipy SLSQP", () => {
  // the reference solves in its own process while the tests below solve with ours
  const reference = hasScipy
    ? startSlsqpDesigns(trusses.map((t) => {
        const p = buildDesignProblem(t.model, buildStructure(t.model), {});
        return { p, f0: nestedFormulation(p).objectiveScale };
      }))!
    : Promise.resolve([] as SlsqpDesignOutcome[]);
  const ratios: string[] = [];
  afterAll(() => console.log(`mass / SLSQP mass:\n${ratios.join("\n")}`));

  trusses.forEach((t, k) => {
    it(t.label, async () => {
      const r = optimizeWithStarts(t.model, { starts: STARTS });
      const ref = (await reference)[k];
      ratios.push(`  ${t.label}: ${(r.objective.final / ref.f).toFixed(5)} (${r.status}; ${r.starts!.summary} SLSQP ${ref.success ? "converged" : ref.message} in ${ref.nit} iterations)`);
      expect(r.status, r.message).toBe("optimal");
      expect(r.verification!.allLimitsMet).toBe(true);
      // the reference must itself have ended at a feasible point for the comparison to mean anything
      expect(ref.success, ref.message).toBe(true);
      expect(ref.maxViolation).toBeLessThan(1e-6);
      expect(r.objective.final, `ours ${r.objective.final} vs SLSQP ${ref.f}`).toBeLessThanOrEqual(ref.f * (1 + MASS_TOLERANCE));
    }, 120_000);
  });
});
