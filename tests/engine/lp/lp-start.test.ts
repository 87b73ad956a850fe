// The least-mass LP's design as a starting point for the solver (multi-start.ts): on a ground
// structure the start made from it reaches the same or a lighter optimum than the engineer's own
// start. The LP design itself is checked against scipy.optimize.linprog (method "highs", through
// tests/python/plastic_lp.py, the LP built again from the model file in Python); that check
// skips loudly without python3-scipy, the rest does not need it.
import { spawnSync } from "node:child_process";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { prepareRun, reanalyze, runStart, startingDesigns } from "~/engine/design";
import { plasticStart } from "~/engine/design/multi-start";
import { designState } from "~/engine/design/problem";
import { loadHighsSolver, plasticDesignBeforeRun, vanishingMembers, type PlasticDesign } from "~/engine/lp";
import { trussModelSchema, type TrussModel } from "~/engine/truss";
import { groundStructure } from "../design/ground-structure";
import { findScipy, loudSkip } from "../../support/scipy";

const here = path.dirname(fileURLToPath(import.meta.url));
const scipy = findScipy();
if (!scipy) loudSkip("the LP start's design against scipy.optimize.linprog (tests/engine/lp/lp-start.test.ts)");

// 6 x 4 nodes, every pair within 2 grid steps: 109 members, stress limits and a tip deflection
// of span / 250 (few enough variables for several starts)
const model: TrussModel = trussModelSchema.parse(groundStructure({ nx: 6, ny: 4, reach: 2, objective: "mass" }));
let plastic: Extract<PlasticDesign, { status: "optimal" }>;

beforeAll(async () => {
  const lp = plasticDesignBeforeRun(model, {}, await loadHighsSolver());
  if (lp?.status !== "optimal") throw new Error(`the LP has no design: ${lp ? lp.message : "not applicable"}`);
  plastic = lp;
});

describe.skipIf(!scipy)("the LP design the start is made from", () => {
  it("has the least mass scipy's linprog finds for the same model", () => {
    const r = spawnSync(scipy!.python, [path.join(here, "../../python/plastic_lp.py")], { input: JSON.stringify(model), encoding: "utf8" });
    if (r.status !== 0) throw new Error(r.stderr);
    const reference = (JSON.parse(r.stdout) as { mass: number }).mass;
    expect(Math.abs(plastic.mass / reference - 1)).toBeLessThan(1e-6);
  });
});

describe("the least-mass LP as a start", () => {
  it("is the second start when the LP design is given, and elastic-feasible after the fully stressed passes", () => {
    const p = prepareRun(model).design;
    expect(startingDesigns(p, 6, plastic.memberAreas).map((s) => s.label)).toEqual(["your start", "least-mass LP", "fully stressed", "your areas × 2", "your areas × 0.5", "perturbed 1"]);
    expect(startingDesigns(p, 6).map((s) => s.label)).not.toContain("least-mass LP");
    const z = plasticStart(p, plastic.memberAreas)!;
    const { areas, coords } = designState(p, z);
    expect(reanalyze(p, areas, coords, 1e-9).verification.allLimitsMet).toBe(true);
  });

  it("reaches the same or a lighter optimum than the engineer's start, above the LP bound", () => {
    const options = { plasticStart: plastic.memberAreas };
    const own = runStart(model, options, 0, 6).result;
    const fromLp = runStart(model, options, 1, 6);
    expect(fromLp.label).toBe("least-mass LP");
    for (const r of [own, fromLp.result]) {
      expect(r.status).toBe("optimal");
      expect(r.verification!.allLimitsMet).toBe(true);
    }
    expect(fromLp.result.objective.final).toBeLessThanOrEqual(own.objective.final * (1 + 1e-4));
    // the bound holds for every design on these members (plastic design LP; Hemp, Optimum Structures, 1973; from memory)
    expect(fromLp.result.objective.final).toBeGreaterThanOrEqual(plastic.mass * (1 - 1e-6));
  }, 120_000);

  it("no LP start for a mass design with shape variables, or a compliance objective", () => {
    const p = prepareRun(model).design;
    expect(plasticStart({ ...p, objective: "compliance" }, plastic.memberAreas)).toBeNull();
    expect(plasticStart(p, plastic.memberAreas.subarray(1))).toBeNull(); // areas of another model
  });

  it("predicts the members that vanish from the LP areas at hand", () => {
    const vanishing = vanishingMembers(plastic.memberAreas);
    expect(vanishing).toHaveLength(model.members.length);
    // a layout LP keeps few of the candidates (at a vertex: at most one per equilibrium row)
    const kept = vanishing.filter((v) => !v).length;
    expect(kept).toBeGreaterThan(3);
    expect(kept).toBeLessThanOrEqual(2 * 6 * 4);
  });
});
