// The result JSON against docs/model-format.md ("Result"), progress, cancellation and the job summary.
import { describe, expect, it } from "vitest";
import { optimizeModel, summarizeResult, DesignSetupError, type DesignProgress } from "~/engine/design";
import { fixture, mast3d, parse } from "./models";

describe("result JSON", () => {
  it("carries every field of the format, in model units", () => {
    const seen: DesignProgress[] = [];
    const r = optimizeModel(fixture("ten-bar.truss.json"), { onProgress: (p) => seen.push(p) });
    expect(r.format).toBe("strutwise.result");
    expect(r.version).toBe(1);
    expect(r.units).toEqual({ length: "in", force: "kip", mass: "lb" });
    expect(r.objective.kind).toBe("mass");
    // starting design: 5 in2 everywhere, density 0.1 lb/in3, 6 x 360 in + 4 x 509.1 in of members
    expect(r.objective.initial).toBeCloseTo(0.1 * 5 * (6 * 360 + 4 * 360 * Math.SQRT2), 6);
    expect(r.members).toHaveLength(10);
    expect(r.nodes).toHaveLength(6);
    for (const m of r.members) {
      expect(m.stress.LC1).toBeCloseTo(m.force.LC1 / m.area, 9); // stress = force / area
      expect(m.utilization).toBeLessThanOrEqual(1 + 1e-6);
    }
    const tip = r.nodes.find((n) => n.id === "1")!;
    expect(Math.abs(tip.displacement.LC1[1])).toBeCloseTo(2, 5); // the governing deflection limit
    expect(r.history.length).toBe(r.iterations + 1);
    expect(r.history[0].objective).toBeCloseTo(r.objective.initial, 6);
    expect(seen.length).toBeGreaterThan(0);
    expect(seen.at(-1)!.objective).toBeCloseTo(r.objective.final, 3);
    expect(r.mass).toBeCloseTo(r.objective.final, 9);
    expect(r.volume).toBeCloseTo(r.objective.final / 0.1, 6);
    expect(r.verification!.worst[0].ratio).toBeCloseTo(1, 5);
    expect(JSON.parse(JSON.stringify(r))).toEqual(r); // plain JSON, no NaN or typed arrays
    expect(summarizeResult(r)).toEqual({
      objectiveKind: "mass", objectiveInitial: r.objective.initial, objectiveFinal: r.objective.final,
      iterations: r.iterations, maxUtilization: r.verification!.maxUtilization, status: "optimal",
    });
  });

  it("solves a 3D shape problem with buckling to a verified optimum with both formulations", () => {
    const results = (["nested", "simultaneous"] as const).map((formulation) => optimizeModel(parse(mast3d()), { formulation }));
    for (const r of results) {
      expect(r.verification!.allLimitsMet).toBe(true);
      expect(r.variables.map((v) => v.id)).toEqual(["height", "waist"]);
    }
    expect(results[0].status).toBe("optimal");
    expect(Math.abs(results[1].objective.final - results[0].objective.final) / results[0].objective.final).toBeLessThan(1e-5);
  });

  it("stops with an AbortError when cancelled", () => {
    const ac = new AbortController();
    ac.abort();
    expect(() => optimizeModel(fixture("ten-bar.truss.json"), { signal: ac.signal })).toThrow(expect.objectContaining({ name: "AbortError" }));
  });

  it("names a design block it cannot use", () => {
    const m = mast3d();
    m.design!.shape![0].min = 100;
    expect(() => optimizeModel(parse(m))).toThrow(DesignSetupError);
    expect(() => optimizeModel(parse(m))).toThrow(/Shape variable "height" must allow the starting geometry/);
  });
});

describe("infeasible designs", () => {
  // The bracket's tie cannot carry its load within the allowable stress at the largest area
  // allowed (see the fixture): both formulations must say so in terms of that limit, never
  // in terms of an equilibrium row of the displacement variables.
  for (const formulation of ["nested", "simultaneous"] as const) {
    it(`names the broken limit (${formulation})`, () => {
      const r = optimizeModel(fixture("infeasible-bracket.truss.json"), { formulation });
      expect(r.status).toBe("infeasible");
      // in words, with the tie's nodes and the load case's name (app/engine/design/constraint-words.ts), no raw id
      expect(r.message).toMatch(/the stress limit of member tie \(nodes W2–T\) under Sign weight \(sign\) is at \d+\.\d % of its limit/);
      expect(r.message).not.toMatch(/stress:tie/);
      expect(r.message).not.toMatch(/equilibrium/);
      expect(r.verification!.allLimitsMet).toBe(false);
    });
  }
});
