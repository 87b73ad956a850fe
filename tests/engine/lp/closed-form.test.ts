// The least-mass LP against closed forms on statically determinate trusses. There the member
// forces follow from equilibrium alone (method of joints), so the least mass is the fully
// stressed design, A = |N| / sigma for each member (common practice: fully stressed design is
// exact for statically determinate trusses), and the LP must reproduce it.
import { beforeAll, describe, expect, it } from "vitest";
import { loadHighsSolver, plasticInputFromModel, solvePlasticDesign, type LpSolver } from "~/engine/lp";
import type { TrussModel } from "~/engine/truss";
import { bracket, hangingBar, STEEL_DENSITY, tripod } from "./models";

let solver: LpSolver;
beforeAll(async () => {
  solver = await loadHighsSolver(); // also shows HiGHS loads under the test runner
});

function solve(model: TrussModel) {
  const r = solvePlasticDesign(plasticInputFromModel(model).input, solver);
  if (r.status !== "optimal") throw new Error(r.message);
  return r;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("wall bracket (two bars, determinate)", () => {
  const L = 3000, H = 2000, P = 80000;
  const diag = Math.hypot(L, H);
  const T = (P * diag) / H; // diagonal tension, from vertical equilibrium at B
  const N = (P * L) / H; // horizontal compression, from horizontal equilibrium at B

  it("one load case, unequal allowables: mass = rho (L_CB T / sigma_t + L_AB N / sigma_c)", () => {
    const r = solve(bracket({ L, H, P, tension: 235, compression: 150 }));
    const mass = STEEL_DENSITY * ((diag * T) / 235 + (L * N) / 150);
    expect(rel(r.mass, mass)).toBeLessThan(1e-7);
    expect(rel(r.memberAreas[0], N / 150)).toBeLessThan(1e-6);
    expect(rel(r.memberAreas[1], T / 235)).toBeLessThan(1e-6);
    expect(rel(r.forces[0][0], -N)).toBeLessThan(1e-6);
    expect(rel(r.forces[0][1], T)).toBeLessThan(1e-6);
  });

  it("two load cases: each area is the larger of the two cases' needs", () => {
    const Q = 300000; // side load pulls AB in tension, CB carries nothing
    const r = solve(bracket({ L, H, P, tension: 235, compression: 150, sideLoad: Q }));
    const aAB = Math.max(N / 150, Q / 235);
    const mass = STEEL_DENSITY * ((diag * T) / 235 + L * aAB);
    expect(rel(r.mass, mass)).toBeLessThan(1e-7);
  });

  it("both bars in one group share the larger area", () => {
    const r = solve(bracket({ L, H, P, tension: 235, compression: 150, grouped: true }));
    const a = Math.max(T / 235, N / 150);
    expect(rel(r.mass, STEEL_DENSITY * (L + diag) * a)).toBeLessThan(1e-7);
    expect(r.varAreas.length).toBe(1);
  });
});

describe("tripod (3D, determinate)", () => {
  it("each leg carries P / (3 cos alpha) in compression", () => {
    const R = 1500, H = 4000, P = 120000;
    const leg = Math.hypot(R, H);
    const N = P / (3 * (H / leg));
    const r = solve(tripod(R, H, P));
    expect(rel(r.mass, 3 * STEEL_DENSITY * leg * (N / 180))).toBeLessThan(1e-7);
  });
});

describe("own weight stays linear in the area", () => {
  // A bar hanging from a support with tip load P; half its weight w = rho g A L acts at the tip:
  // sigma A = P + w / 2, so A = P / (sigma - rho g L / 2) (statics, common practice).
  // 1 t weighs 9806.65 N (standard gravity, NIST SP 811).
  const L = 100_000, P = 50_000, g = 9806.65;

  it("load case with own weight", () => {
    const model = hangingBar(L, P, { selfWeight: 1 });
    // without combinations every load case is checked: Q carries only P, G only the weight
    const r = solve(model);
    const aQ = P / 235;
    const aG = 0; // a bar carrying only its own weight needs no area in the limit A -> 0
    expect(rel(r.mass, STEEL_DENSITY * L * Math.max(aQ, aG))).toBeLessThan(1e-7);
  });

  it("strength combination 1.35 G + 1.5 Q: A = 1.5 P / (sigma - 1.35 rho g L / 2)", () => {
    const model = hangingBar(L, P, {
      selfWeight: 1,
      combinations: [
        { id: "ULS", use: "strength", factors: { G: 1.35, Q: 1.5 } },
        { id: "SLS", use: "service", factors: { G: 1, Q: 1 } },
      ],
    });
    const r = solve(model);
    const A = (1.5 * P) / (235 - (1.35 * STEEL_DENSITY * g * L) / 2);
    expect(rel(r.memberAreas[0], A)).toBeLessThan(1e-6);
    expect(rel(r.mass, STEEL_DENSITY * L * A)).toBeLessThan(1e-6);
    expect(A / ((1.5 * P) / 235) - 1).toBeGreaterThan(0.02); // the weight matters here
  });
});
