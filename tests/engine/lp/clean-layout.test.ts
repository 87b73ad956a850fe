// Clean layout: a dense candidate grid to a stable, buildable truss, and the refusals in words.
import { beforeAll, describe, expect, it } from "vitest";
import { optimizeModel } from "~/engine/design";
import { attachLowerBound, cleanLayout, loadHighsSolver, plasticInputFromModel, solvePlasticDesign, type LpSolver } from "~/engine/lp";
import { parseModel, trussModelSchema, type TrussModel } from "~/engine/truss";
import type { TrussResult } from "~/engine/design/result-types";
import { groundStructure } from "../design/ground-structure";

let solver: LpSolver;
beforeAll(async () => {
  solver = await loadHighsSolver();
});

/** A result that carries the model's own areas and the LP's areas, without running the SQP. */
function lpResult(model: TrussModel): TrussResult {
  const lp = solvePlasticDesign(plasticInputFromModel(model).input, solver);
  if (lp.status !== "optimal") throw new Error(lp.message);
  return {
    members: model.members.map((m, e) => ({ id: m.id, area: m.area, length: 0, force: {}, stress: {}, utilization: 0, plasticArea: lp.memberAreas[e] })),
    nodes: model.nodes.map((n) => ({ id: n.id, x: n.x, y: n.y, z: n.z ?? 0, displacement: {} })),
    variables: [],
  } as unknown as TrussResult;
}

describe("clean layout from the least-mass LP", () => {
  it("a 109-member ground structure becomes a small stable truss whose own bound is the same", () => {
    const model = trussModelSchema.parse(groundStructure({ nx: 6, ny: 4, reach: 2, objective: "mass" }));
    const cleaned = cleanLayout(model, lpResult(model), { source: "lp", threshold: 0.01 });
    if (!cleaned.ok) throw new Error(cleaned.reason);
    expect(cleaned.kept).toBeLessThan(30);
    expect(cleaned.kept + cleaned.dropped + cleaned.joined).toBe(model.members.length);
    const parsed = parseModel(cleaned.model);
    if (!parsed.ok) throw new Error(parsed.errors[0]!.message);
    expect(parsed.summary.stability.ok).toBe(true);
    // the members the LP used are all still there, so the least mass on the clean layout is the
    // same as on the whole grid (the LP optimum is a feasible point of the smaller LP)
    const full = solvePlasticDesign(plasticInputFromModel(model).input, solver);
    const small = solvePlasticDesign(plasticInputFromModel(parsed.model).input, solver);
    if (full.status !== "optimal" || small.status !== "optimal") throw new Error("LP failed");
    expect(small.mass / full.mass - 1).toBeLessThan(1e-5);
    expect(small.mass / full.mass - 1).toBeGreaterThan(-1e-6);
  });

  it("the clean layout optimizes to within a hair of its bound (single load case)", () => {
    const model = trussModelSchema.parse(groundStructure({ nx: 6, ny: 4, reach: 2, objective: "mass", deflection: 1e6 }));
    const cleaned = cleanLayout(model, lpResult(model), { source: "lp", threshold: 0.01 });
    if (!cleaned.ok) throw new Error(cleaned.reason);
    const m = trussModelSchema.parse(cleaned.model);
    const r = attachLowerBound(m, optimizeModel(m), {}, solver);
    expect(r.status).toBe("optimal");
    expect(r.lowerBound!.gap).toBeLessThan(1e-3);
  });

  it("refuses a threshold that leaves a mechanism, and says to lower it", () => {
    const model = trussModelSchema.parse(groundStructure({ nx: 6, ny: 4, reach: 2, objective: "mass" }));
    const cleaned = cleanLayout(model, lpResult(model), { source: "lp", threshold: 0.9 });
    expect(cleaned.ok).toBe(false);
    if (!cleaned.ok) expect(cleaned.reason).toMatch(/Lower the threshold to keep more members\.$/);
  });

  it("refuses the LP source on a result without LP areas, and a threshold outside (0, 1)", () => {
    const model = trussModelSchema.parse(groundStructure({ nx: 4, ny: 3, reach: 1, objective: "mass" }));
    const r = optimizeModel(model);
    expect(cleanLayout(model, r, { source: "lp", threshold: 0.01 })).toEqual({ ok: false, reason: expect.stringMatching(/no least-mass LP design/) });
    expect(cleanLayout(model, r, { source: "optimum", threshold: 1.5 })).toEqual({ ok: false, reason: expect.stringMatching(/between 0 and 1/) });
  });
});
