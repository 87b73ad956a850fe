// Cases where no honest bound exists, or the LP has no solution: each comes back in words.
import { beforeAll, describe, expect, it } from "vitest";
import { optimizeModel } from "~/engine/design";
import { attachLowerBound, loadHighsSolver, lowerBoundForResult, plasticInputFromModel, solvePlasticDesign, type LpSolver } from "~/engine/lp";
import { fixture } from "../design/models";
import { bracket } from "./models";

let solver: LpSolver;
beforeAll(async () => {
  solver = await loadHighsSolver();
});

const model = () => bracket({ L: 3000, H: 2000, P: 80000, tension: 235, compression: 150 });

describe("an LP with no solution", () => {
  it("a load along a direction no member reaches names the node, the direction and the case", () => {
    const { input } = plasticInputFromModel(model());
    // both bars lie in the x-y plane; a z load at B (made free in z) cannot be carried
    const fixed = input.fixed.slice();
    fixed[3 * 2 + 2] = 0;
    const loads = input.cases[0].loads.slice();
    loads[3 * 2 + 2] = 1000;
    const r = solvePlasticDesign({ ...input, dim: 3, fixed, cases: [{ ...input.cases[0], loads }] }, solver);
    expect(r.status).toBe("infeasible");
    if (r.status === "optimal") return;
    expect(r.message).toBe("Case down loads node B along z, but no member reaches B in that direction, so no truss on these members can carry it.");
    expect(r.cases).toEqual(["down"]);
  });

  it("an allowable of zero on the side the load needs: infeasible, naming the case that fails", () => {
    const { input } = plasticInputFromModel(bracket({ L: 3000, H: 2000, P: 80000, tension: 235, compression: 150, sideLoad: 1000 }));
    // the diagonal may not take tension: the downward case needs it, the side case does not
    const allowTension = input.allowTension.slice();
    allowTension[1] = 0;
    const r = solvePlasticDesign({ ...input, allowTension }, solver);
    expect(r.status).toBe("infeasible");
    if (r.status === "optimal") return;
    expect(r.cases).toEqual(["down"]);
    expect(r.message).toMatch(/^No member forces within the allowable stresses balance case down, whatever the areas/);
  });

  it("zero allowables on both sides of every member: no forces at all, so any load is infeasible", () => {
    const { input } = plasticInputFromModel(model());
    const zero = new Float64Array(2);
    const r = solvePlasticDesign({ ...input, allowTension: zero, allowCompression: zero }, solver);
    expect(r.status).toBe("infeasible");
  });
});

describe("results that get no bound, with the reason", () => {
  it("a run that checks no stresses", () => {
    const m = model();
    const r = optimizeModel(m, { stress: false, displacementLimit: 5 });
    const out = lowerBoundForResult(m, r, { stress: false, displacementLimit: 5 }, solver);
    expect(out).toEqual({ kind: "withheld", reason: expect.stringMatching(/^This run checks no stresses/) });
  });

  it("materials without allowables: the bound would be zero and certifies nothing", () => {
    const m = model();
    const free = { ...m, materials: [{ ...m.materials[0], allowableTension: undefined, allowableCompression: undefined }] };
    const r = optimizeModel(m);
    const out = lowerBoundForResult(free, r, {}, solver);
    expect(out.kind).toBe("withheld");
    if (out.kind === "withheld") expect(out.reason).toMatch(/bound is zero/);
  });

  it("combinations without a strength one", () => {
    const m = { ...model(), combinations: [{ id: "SLS", use: "service" as const, factors: { down: 1 } }] };
    const out = lowerBoundForResult(m, optimizeModel(model()), {}, solver);
    expect(out).toEqual({ kind: "withheld", reason: expect.stringMatching(/none for strength/) });
  });

  it("compliance without a volume limit", () => {
    const m = model();
    const r = { ...optimizeModel(m), objective: { kind: "compliance" as const, initial: 1, final: 1 } };
    const out = lowerBoundForResult(m, r, {}, solver);
    expect(out).toEqual({ kind: "withheld", reason: "A compliance bound needs a volume limit, and this run has none." });
  });

  it("the withheld reason travels in the result, and nothing else changes", () => {
    const m = model();
    const r = optimizeModel(m, { stress: false, displacementLimit: 5 });
    const withReason = attachLowerBound(m, r, { stress: false, displacementLimit: 5 }, solver);
    expect(withReason.lowerBound).toBeUndefined();
    expect(withReason.lowerBoundWithheld).toMatch(/checks no stresses/);
    expect({ ...withReason, lowerBoundWithheld: undefined }).toEqual({ ...r, lowerBoundWithheld: undefined });
  });
});

describe("compliance objective: the compliance analogue", () => {
  // For one load case and one material, C >= (sum |N| L)^2 / (E V) and the least-compliance
  // truss of volume V reaches it; on the determinate fixture the forces are fixed, sum |N| L =
  // 3240 P (see tests/engine/design/benchmarks.test.ts: closed form, common practice).
  it("equals (W^2) / (E V) with W the least sum |N| L, below the SQP optimum by the minimum-area members' share", () => {
    const m = fixture("determinate-compliance.truss.json");
    const r = attachLowerBound(m, optimizeModel(m), {}, solver);
    const P = 100, E = 1e4, V = 20000;
    const bound = (3240 * P) ** 2 / (E * V);
    expect(r.lowerBound!.value).toBeCloseTo(bound, 6);
    // the SQP optimum spends 0.01 in2 x 720 in of the volume on two zero-force members
    const expected = (3240 * P) ** 2 / (E * (V - 0.01 * 720));
    expect(r.lowerBound!.gap).toBeCloseTo(expected / bound - 1, 6);
    expect(r.lowerBound!.basis).toMatch(/least compliance itself/);
  });
});
