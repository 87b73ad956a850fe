// Published benchmarks and closed-form designs, solved with both formulations.
import { describe, expect, it } from "vitest";
import { optimizeModel } from "~/engine/design";
import type { TrussResult } from "~/engine/design";
import { groundStructure } from "./ground-structure";
import { fixture, parse } from "./models";

const formulations = ["nested", "simultaneous"] as const;
// the simultaneous formulation once more with null-space steps forced (by default they start
// above 400 variables, see design/result.ts)
type Run = { label: string; options: { formulation: "nested" | "simultaneous"; reducedSpace?: boolean } };
const runs: Run[] = [
  ...formulations.map((formulation) => ({ label: formulation, options: { formulation } })),
  { label: "simultaneous, null-space steps", options: { formulation: "simultaneous", reducedSpace: true } },
];
const byId = (r: TrussResult, id: string) => r.members.find((m) => m.id === id)!;

function expectTrustworthy(r: TrussResult) {
  expect(r.status).toBe("optimal");
  expect(r.verification!.allLimitsMet).toBe(true);
  expect(r.verification!.equilibriumResidual).toBeLessThan(1e-9);
  expect(r.maxViolation).toBeLessThan(1e-6);
}

describe("ten-bar planar cantilever, stress +-25 ksi and displacement +-2 in", () => {
  // Published optimum 5060.8 lb with areas (in2) 30.52, 0.1, 23.20, 15.22, 0.1, 0.551, 7.457,
  // 21.04, 21.53, 0.1 (Haftka & Gurdal, 'Elements of Structural Optimization', ten-bar truss;
  // from memory). Non-convex: a second local optimum near 5076.7 lb exists; the fixture starts
  // at 5 in2 everywhere.
  const published = [30.52, 0.1, 23.2, 15.22, 0.1, 0.551, 7.457, 21.04, 21.53, 0.1];
  for (const formulation of formulations) {
    it(`reaches about 5060.8 lb (${formulation})`, () => {
      const r = optimizeModel(fixture("ten-bar.truss.json"), { formulation });
      expectTrustworthy(r);
      expect(r.objective.final).toBeGreaterThan(5060.8 * (1 - 2e-4));
      expect(r.objective.final).toBeLessThan(5060.8 * (1 + 2e-4));
      published.forEach((a, k) => expect(Math.abs(byId(r, `m${k + 1}`).area - a)).toBeLessThan(0.01 * a + 0.01));
      // the vertical deflection limit at the upper tip node governs
      expect(r.activeConstraints.map((c) => c.id)).toContain("displacement:1:y:LC1");
    });
  }
  it("with null-space steps forced, ends at a verified KKT point of one of the two local optima", () => {
    // Known limit: the null-space steps follow a different path from the 5 in2 start and stop
    // at the second local optimum (about 5076.7 lb, see above), a genuine KKT point that the
    // re-analysis accepts. This is why small models keep the full subproblem by default.
    const r = optimizeModel(fixture("ten-bar.truss.json"), { formulation: "simultaneous", reducedSpace: true });
    expectTrustworthy(r);
    const nearest = [5060.8, 5076.7].map((f) => Math.abs(r.objective.final - f) / f);
    expect(Math.min(...nearest)).toBeLessThan(5e-4);
  });
});

describe("three-bar truss of the constrained-optimization test sets", () => {
  // f* = 263.8958 at x* = (0.78868, 0.40825) (three-bar truss design problem, e.g. in the
  // engineering test problems of constrained evolutionary optimization papers; from memory).
  for (const { label, options } of runs) {
    it(`reaches 263.8958 (${label})`, () => {
      const r = optimizeModel(fixture("three-bar.truss.json"), options);
      expectTrustworthy(r);
      expect(Math.abs(r.objective.final - 263.8958) / 263.8958).toBeLessThan(2e-6);
      expect(byId(r, "1").area).toBeCloseTo(0.78868, 4);
      expect(byId(r, "2").area).toBeCloseTo(0.40825, 4);
      expect(byId(r, "3").area).toBeCloseTo(byId(r, "1").area, 12); // grouped
    });
  }
});

describe("symmetric two-bar truss, sizing plus apex height", () => {
  // Closed form (common practice): V(h) = P (b^2 + h^2) / (h sigma) is least at h = b with
  // V = 2 P b / sigma; here b = 1000 mm, P = 100 kN, sigma = 200 MPa: V = 1e6 mm3, 7.85e-3 t.
  for (const { label, options } of runs) {
    it(`puts the apex at the half-span (${label})`, () => {
      const r = optimizeModel(fixture("two-bar-shape.truss.json"), options);
      expectTrustworthy(r);
      const apex = r.nodes.find((n) => n.id === "C")!;
      expect(apex.y).toBeCloseTo(1000, 3);
      expect(r.variables).toEqual([{ id: "apex-rise", value: expect.closeTo(600, 3) }]);
      expect(r.volume).toBeCloseTo(1e6, 0);
      expect(r.objective.final).toBeCloseTo(7.85e-3, 9);
      expect(byId(r, "LC").stress.P).toBeCloseTo(-200, 6); // both bars in compression
    });
  }
});

describe("minimum compliance of a statically determinate truss under a volume limit", () => {
  // Closed form (common practice): C = (sum |N_i| L_i)^2 / (E V), A_i = V |N_i| / sum |N_j| L_j.
  // Member forces by the method of joints (see the fixture); the two zero-force members stay at
  // the minimum area 0.01 in2 and take their share of the volume.
  const P = 100, E = 1e4, L = 360, Amin = 0.01;
  const N: Record<string, number> = { "5-3": P, "3-1": 0, "6-4": -2 * P, "4-2": -P, "3-4": -P, "1-2": 0, "5-4": Math.SQRT2 * P, "3-2": Math.SQRT2 * P };
  const len: Record<string, number> = { "5-4": L * Math.SQRT2, "3-2": L * Math.SQRT2 };
  const sumNL = Object.keys(N).reduce((s, id) => s + Math.abs(N[id]) * (len[id] ?? L), 0);
  const V = 20000 - Amin * 2 * L;
  const C = (sumNL * sumNL) / (E * V);
  for (const { label, options } of runs) {
    it(`matches C = (sum |N| L)^2 / (E V) (${label})`, () => {
      const r = optimizeModel(fixture("determinate-compliance.truss.json"), options);
      expectTrustworthy(r);
      expect(sumNL).toBeCloseTo(3240 * P, 9);
      expect(Math.abs(r.objective.final - C) / C).toBeLessThan(1e-6);
      for (const id of Object.keys(N)) {
        const expected = N[id] === 0 ? Amin : (V * Math.abs(N[id])) / sumNL;
        expect(Math.abs(byId(r, id).area - expected) / expected).toBeLessThan(1e-4);
        expect(byId(r, id).force.LC1).toBeCloseTo(N[id], 6);
      }
    });
  }
});

describe("generated ground structures: the formulations agree", () => {
  // No published value: the check is that the two formulations (the simultaneous one with
  // null-space steps, the default at this size) reach one optimum; the scipy cross-check in
  // slsqp-crosscheck.test.ts ties the nested one to an outside reference.
  for (const objective of ["mass", "compliance"] as const) {
    it(`minimum ${objective}: the same optimum, both verified`, () => {
      const model = parse(groundStructure({ nx: 7, ny: 3, reach: 2, objective, stress: false, deflection: 8 }));
      const [nested, simultaneous] = formulations.map((formulation) => optimizeModel(model, { formulation }));
      for (const r of [nested, simultaneous]) expectTrustworthy(r);
      expect(Math.abs(simultaneous.objective.final - nested.objective.final) / nested.objective.final).toBeLessThan(1e-6);
      // null-space steps: one stiffness factorization per trial design, where its displacements
      // are restored (sqp/restoration.ts), and none more: an accepted trial's factor is the next
      // iterate's, so about one per iterate plus one per backtracking step (plus the start)
      expect(simultaneous.analyses).toBeLessThanOrEqual(2 * simultaneous.iterations + 3);
    });
  }
});
