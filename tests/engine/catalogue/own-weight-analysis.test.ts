// Own weight, combinations and reactions in the analysis, against closed forms and against
// separate analyses.
import { describe, expect, it } from "vitest";
import { analyze, buildStructure, parseModel, type TrussModel, type TrussModelInput } from "~/engine/truss";
import { reactionBalance, reactions } from "~/engine/design/responses";

function parsed(m: TrussModelInput): TrussModel {
  const r = parseModel(m);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.model;
}

const G_KN_PER_T = 9.80665; // standard gravity: 1 t weighs 9.80665 kN

describe("a determinate truss under own weight: method of joints (closed form)", () => {
  // Triangle A(0,0) pinned, B(L,0) on a roller, apex C(L/2,h); units m, kN, t.
  // Member weights W = rho g A L; half of each goes to each end. Load at C: P = (W_AC + W_BC)/2.
  // Joint C, by symmetry N_AC = N_BC = N:  2 N h / L_d + P = 0  ->  N = -P L_d / (2h)
  // Joint A, horizontal:  N_AB + N (L/2) / L_d = 0  ->  N_AB = P L / (4h)
  // Supports: each carries half the total weight, R_Ax = 0.
  const L = 8, h = 3, rho = 7.85, Achord = 0.004, Adiag = 0.006;
  const Ld = Math.hypot(L / 2, h);
  const model = parsed({
    format: "strutwise.truss", version: 1, name: "Ashcombe barn truss (invented)",
    units: { length: "m", force: "kN", mass: "t" }, dimension: 2,
    materials: [{ id: "steel", E: 2.1e8, density: rho }],
    nodes: [{ id: "A", x: 0, y: 0, fixed: ["x", "y"] }, { id: "B", x: L, y: 0, fixed: ["y"] }, { id: "C", x: L / 2, y: h }],
    members: [
      { id: "AB", start: "A", end: "B", material: "steel", area: Achord },
      { id: "AC", start: "A", end: "C", material: "steel", area: Adiag },
      { id: "BC", start: "B", end: "C", material: "steel", area: Adiag },
    ],
    loadCases: [{ id: "G", selfWeight: 1, loads: [] }],
  });

  it("member forces and reactions", () => {
    const s = buildStructure(model);
    const a = analyze(s);
    const Wd = rho * G_KN_PER_T * Adiag * Ld;
    const Wc = rho * G_KN_PER_T * Achord * L;
    const P = Wd; // (W_AC + W_BC) / 2
    const N = (-P * Ld) / (2 * h);
    expect(a.forces[0][1]).toBeCloseTo(N, 9);
    expect(a.forces[0][2]).toBeCloseTo(N, 9);
    expect(a.forces[0][0]).toBeCloseTo((P * L) / (4 * h), 9);
    const total = Wc + 2 * Wd;
    const R = reactions(s, a);
    expect(R.map((r) => r.node)).toEqual(["A", "B"]);
    expect(R[0].values.G[0]).toBeCloseTo(0, 9);
    expect(R[0].values.G[1]).toBeCloseTo(total / 2, 9);
    expect(R[1].values.G[1]).toBeCloseTo(total / 2, 9);
    const [bal] = reactionBalance(s, a);
    expect(bal.applied[1]).toBeCloseTo(-total, 9);
    expect(bal.residual).toBeLessThan(1e-12);
  });

  it("scales with the selfWeight factor", () => {
    const m2 = { ...model, loadCases: [{ id: "G", selfWeight: 1.35, loads: [] }] };
    const a1 = analyze(buildStructure(model)), a2 = analyze(buildStructure(m2));
    expect(a2.forces[0][0] / a1.forces[0][0]).toBeCloseTo(1.35, 12);
  });
});

describe("a 3D tripod under own weight along -z (closed form)", () => {
  // Three equal legs from pinned base points on a circle of radius c to the apex at height h:
  // apex load P = 3 W/2 (half of each leg's weight), leg force N = -P L / (3 h).
  it("leg forces and the vertical reaction", () => {
    const c = 2, h = 5, rho = 7.85e-9, A = 1200; // mm, N, t
    const nodes: TrussModelInput["nodes"] = [0, 1, 2].map((k) => ({ id: `B${k}`, x: 2000 * Math.cos((2 * Math.PI * k) / 3), y: 2000 * Math.sin((2 * Math.PI * k) / 3), z: 0, fixed: ["x", "y", "z"] }));
    nodes.push({ id: "T", x: 0, y: 0, z: 5000 });
    const model = parsed({
      format: "strutwise.truss", version: 1, name: "Tripod (invented)", units: { length: "mm", force: "N", mass: "t" }, dimension: 3,
      materials: [{ id: "steel", E: 210000, density: rho }], nodes,
      members: [0, 1, 2].map((k) => ({ id: `L${k}`, start: `B${k}`, end: "T", material: "steel", area: A })),
      loadCases: [{ id: "G", selfWeight: 1, loads: [] }],
    });
    const s = buildStructure(model);
    const a = analyze(s);
    const Lleg = Math.hypot(c, h) * 1000;
    const W = rho * A * Lleg * 9806.65; // 1 t weighs 9806.65 N
    const N = (-(1.5 * W) * Lleg) / (3 * h * 1000);
    for (let e = 0; e < 3; e++) expect(Math.abs(a.forces[0][e] / N - 1)).toBeLessThan(1e-10);
    const R = reactions(s, a);
    const vertical = R.reduce((t, r) => t + r.values.G[2], 0);
    expect(Math.abs(vertical / (3 * W) - 1)).toBeLessThan(1e-12);
  });
});

describe("combinations: superposition of one factorization against separate analyses", () => {
  const base: TrussModelInput = {
    format: "strutwise.truss", version: 1, name: "Longmere pedestrian bridge (invented)",
    units: { length: "mm", force: "N", mass: "t" }, dimension: 2,
    materials: [{ id: "steel", E: 210000, density: 7.85e-9 }],
    nodes: [
      { id: "A", x: 0, y: 0, fixed: ["x", "y"] }, { id: "B", x: 3000, y: 0 }, { id: "C", x: 6000, y: 0 },
      { id: "D", x: 9000, y: 0, fixed: ["y"] }, { id: "E", x: 3000, y: 2000 }, { id: "F", x: 6000, y: 2000 },
    ],
    members: [["A", "B"], ["B", "C"], ["C", "D"], ["E", "F"], ["A", "E"], ["B", "E"], ["C", "F"], ["F", "D"], ["B", "F"], ["C", "E"]].map(([p, q], k) => ({ id: `${p}${q}`, start: p, end: q, material: "steel", area: 900 + 100 * k })),
    loadCases: [
      { id: "G", selfWeight: 1, loads: [{ node: "E", fy: -2000 }, { node: "F", fy: -2000 }] },
      { id: "S", loads: [{ node: "B", fy: -15000 }, { node: "C", fy: -9000 }] },
      { id: "W", loads: [{ node: "E", fx: 4000 }, { node: "F", fx: 4000 }] },
    ],
    combinations: [
      { id: "ULS-1", use: "strength", factors: { G: 1.35, S: 1.5, W: 0.9 } },
      { id: "SLS-1", use: "service", factors: { G: 1, S: 1 } },
    ],
  };

  it("forces, displacements, reactions and loads equal those of the combined load as one case", () => {
    const model = parsed(base);
    const s = buildStructure(model);
    const a = analyze(s);
    expect(s.responseIds).toEqual(["G", "S", "W", "ULS-1", "SLS-1"]);
    for (const [ci, combo] of base.combinations!.entries()) {
      // one load case with the factored point loads and the factored own weight
      const loads = Object.entries(combo.factors).flatMap(([lc, f]) => base.loadCases.find((c) => c.id === lc)!.loads.map((l) => ({ node: l.node, fx: (l.fx ?? 0) * f, fy: (l.fy ?? 0) * f })));
      const sw = Object.entries(combo.factors).reduce((t, [lc, f]) => t + f * (base.loadCases.find((c) => c.id === lc)!.selfWeight ?? 0), 0);
      const single = parsed({ ...base, combinations: undefined, loadCases: [{ id: combo.id, selfWeight: sw, loads }] });
      const b = analyze(buildStructure(single));
      const r = 3 + ci;
      const close = (x: ArrayLike<number>, y: ArrayLike<number>) => {
        const scale = Math.max(...Array.from(y, Math.abs));
        for (let k = 0; k < y.length; k++) expect(Math.abs(x[k] - y[k])).toBeLessThan(1e-10 * scale);
      };
      close(a.forces[r], b.forces[0]);
      close(a.displacements[r], b.displacements[0]);
      close(a.reactions[r], b.reactions[0]);
      close(a.loads[r], b.loads[0]);
    }
    for (const bal of reactionBalance(s, a)) expect(bal.residual, bal.id).toBeLessThan(1e-10);
  });
});

describe("analysis-only results carry combinations and reactions", () => {
  it("every map lists cases and combinations; utilization reads the strength combination", async () => {
    const { analyseModel } = await import("~/engine/design");
    const model = parsed({
      format: "strutwise.truss", version: 1, name: "Tollgate shelter (invented)",
      units: { length: "mm", force: "N", mass: "t" }, dimension: 2,
      materials: [{ id: "steel", E: 210000, density: 7.85e-9, allowableTension: 235, allowableCompression: 235 }],
      nodes: [{ id: "A", x: 0, y: 0, fixed: ["x", "y"] }, { id: "B", x: 4000, y: 0, fixed: ["y"] }, { id: "C", x: 2000, y: 1500 }],
      members: [
        { id: "AB", start: "A", end: "B", material: "steel", area: 600 },
        { id: "BC", start: "B", end: "C", material: "steel", area: 800 },
        { id: "CA", start: "C", end: "A", material: "steel", area: 800 },
      ],
      loadCases: [{ id: "G", selfWeight: 1, loads: [] }, { id: "S", loads: [{ node: "C", fy: -20000 }] }],
      combinations: [{ id: "ULS", use: "strength", factors: { G: 1.35, S: 1.5 } }, { id: "SLS", use: "service", factors: { G: 1, S: 1 } }],
    });
    const r = analyseModel(model);
    expect(Object.keys(r.members[0].force)).toEqual(["G", "S", "ULS", "SLS"]);
    expect(Object.keys(r.nodes[2].displacement)).toEqual(["G", "S", "ULS", "SLS"]);
    expect(r.reactions.map((x) => x.node)).toEqual(["A", "B"]);
    expect(Object.keys(r.reactions[0].values)).toEqual(["G", "S", "ULS", "SLS"]);
    expect(r.members[1].governingCase).toBe("ULS");
    expect(r.members[1].utilization).toBeCloseTo(Math.abs(r.members[1].stress.ULS) / 235, 12);
    const uls = r.reactionBalance!.find((b) => b.id === "ULS")!;
    expect(uls.residual).toBeLessThan(1e-12);
    expect(uls.reactions[1]).toBeCloseTo(1.5 * 20000 + 1.35 * r.mass! * 9806.65, 6);
  });
});
