// Analysis against hand solutions: the method of joints for determinate trusses, Clapeyron's
// theorem for the energy, and a printed textbook formula for an indeterminate three-bar system.
import fs from "node:fs";
import path from "node:path";
import { Matrix, solve } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { analyze, analyzeModelToJson, buildStructure, parseModel, type TrussModel } from "~/engine/truss";
import { model } from "./models";

const fixture = (name: string): TrussModel => {
  const r = parseModel(JSON.parse(fs.readFileSync(path.join(import.meta.dirname, "../../fixtures/models/analysis", name), "utf8")));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.model;
};
const close = (a: number, b: number, rel = 1e-9) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));

describe("two-bar symmetric truss (method of joints, common practice)", () => {
  // apex load P at 45 degrees: N = -P / (2 sin t); vertical deflection P L / (2 E A sin^2 t)
  const P = 10, E = 1000, A = 2, L = Math.SQRT2, t = Math.PI / 4;
  const s = buildStructure(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 1, 1], ["C", 2, 0, 0, ["x", "y"]]], [["AB", "A", "B", A], ["BC", "B", "C", A]], [{ id: "L", loads: [{ node: "B", fy: -P }] }], { E }));
  const a = analyze(s);
  it("forces and deflection", () => {
    close(a.forces[0][0], -P / (2 * Math.sin(t)));
    close(a.forces[0][1], -P / (2 * Math.sin(t)));
    close(a.stresses[0][0], -P / (2 * Math.sin(t)) / A);
    close(a.displacements[0][4], -(P * L) / (2 * E * A * Math.sin(t) ** 2));
    close(a.displacements[0][3], 0);
  });
  it("reactions", () => {
    close(a.reactions[0][1], P / 2);
    close(a.reactions[0][7], P / 2);
    close(a.reactions[0][0], P / 2); // horizontal thrust P / (2 tan t)
    close(a.reactions[0][6], -P / 2);
  });
});

describe("Warren roof girder fixture, LC1 (method of joints by hand: sin = 0.8, cos = 0.6 for 1500 x 2000 mm panels)", () => {
  const m = fixture("roof-warren-2d.truss.json");
  const r = analyzeModelToJson(m);
  const force = (id: string) => r.members.find((x) => x.id === id)!.force.LC1;
  // joints B0, T0, B1 solved by hand; the rest by symmetry. Reactions 3 x 24 kN / 2 = 36 kN.
  const expected: Record<string, number> = {
    d1: -45000, d6: -45000, b01: 27000, b23: 27000, d2: 15000, d5: 15000,
    t01: -36000, t12: -36000, d3: -15000, d4: -15000, b12: 45000, // b12 also = M / h = 90e6 / 2000
  };
  it("member forces", () => {
    for (const [id, N] of Object.entries(expected)) close(force(id), N);
  });
  it("reactions and equilibrium residual", () => {
    const rB0 = r.reactions.find((x) => x.node === "B0")!.force.LC1;
    const rB3 = r.reactions.find((x) => x.node === "B3")!.force.LC1;
    close(rB0[1], 36000);
    close(rB3[1], 36000);
    close(rB0[0], 0);
    expect(r.equilibriumResidual).toBeLessThan(1e-12);
  });
  it("compliance equals the strain energy sum N^2 L / (E A) (Clapeyron's theorem)", () => {
    let U = 0;
    for (const mem of r.members) U += (expected[mem.id] ** 2 * mem.length) / (210000 * mem.area);
    close(r.compliance.LC1, U);
  });
  it("mass = density * sum A L", () => {
    let V = 0;
    for (const mem of m.members) V += mem.area * (mem.id.startsWith("d") ? 2500 : 3000);
    close(r.volume, V);
    close(r.mass, 7.85e-9 * V);
  });
});

describe("symmetric tripod fixture (method of joints in 3D)", () => {
  const r = analyzeModelToJson(fixture("mast-tripod-3d.truss.json"));
  // legs from (0,0,6) to the base circle of radius 2: L = sqrt(40), cos a = 6 / L
  const P = 60, L = Math.sqrt(40), cos = 6 / L, E = 2.1e8, A = 0.002;
  it("leg forces -P / (3 cos a), apex drop P L / (3 E A cos^2 a)", () => {
    for (const mem of r.members) close(mem.force.ice, -P / (3 * cos));
    const apex = r.nodes.find((n) => n.id === "P")!.displacement.ice;
    close(apex[2], -(P * L) / (3 * E * A * cos * cos));
    close(apex[0], 0, 1e-12);
  });
});

describe("unsymmetric tripod, 3D method of joints (joint equations solved with ml-matrix)", () => {
  const nodes = { P: [0.4, -0.3, 5], A: [2, 0.5, 0], B: [-1.2, 2, 0.3], C: [-0.8, -2.4, -0.2] } as const;
  const F = [7, -3, -25];
  const s = buildStructure(model(3, [["P", ...nodes.P], ["A", ...nodes.A, ["x", "y", "z"]], ["B", ...nodes.B, ["x", "y", "z"]], ["C", ...nodes.C, ["x", "y", "z"]]],
    [["PA", "P", "A"], ["PB", "P", "B"], ["PC", "P", "C"]], [{ id: "L", loads: [{ node: "P", fx: F[0], fy: F[1], fz: F[2] }] }]));
  it("forces from sum N_m e_m + F = 0 at the apex", () => {
    const dirs = (["A", "B", "C"] as const).map((k) => {
      const d = nodes[k].map((v, c) => v - nodes.P[c]);
      const l = Math.hypot(...d);
      return d.map((v) => v / l);
    });
    const M = new Matrix([0, 1, 2].map((c) => dirs.map((d) => d[c])));
    const N = solve(M, Matrix.columnVector(F.map((v) => -v))).to1DArray();
    const a = analyze(s);
    for (let e = 0; e < 3; e++) close(a.forces[0][e], N[e]);
  });
});

describe("three-bar suspended system (Timoshenko, Strength of Materials, part I: statically indeterminate bars; formula from memory)", () => {
  // vertical bar of length l, two bars at angle alpha each side, equal E A:
  // inclined force X = P cos^2 a / (1 + 2 cos^3 a), vertical bar P / (1 + 2 cos^3 a),
  // drop of the joint P l / (E A (1 + 2 cos^3 a))
  const l = 3, alpha = Math.PI / 6, P = 100, E = 2.1e8, A = 0.0005;
  const h = l * Math.tan(alpha);
  const s = buildStructure(model(2, [["O", 0, 0], ["C", 0, l, 0, ["x", "y"]], ["L", -h, l, 0, ["x", "y"]], ["R", h, l, 0, ["x", "y"]]],
    [["OC", "O", "C", A], ["OL", "O", "L", A], ["OR", "O", "R", A]], [{ id: "W", loads: [{ node: "O", fy: -P }] }], { E }));
  const a = analyze(s);
  const c = Math.cos(alpha);
  it("forces and deflection", () => {
    close(a.forces[0][0], P / (1 + 2 * c ** 3));
    close(a.forces[0][1], (P * c * c) / (1 + 2 * c ** 3));
    close(a.forces[0][2], (P * c * c) / (1 + 2 * c ** 3));
    close(a.displacements[0][1], -(P * l) / (E * A * (1 + 2 * c ** 3)));
  });
});

describe("three-bar plane truss, D. L. Logan's finite element textbook, Example 3.5 (printed values from memory)", () => {
  // Node 1 joined to three pinned nodes: a vertical bar (120 in), a 45-degree bar (120 sqrt 2 in)
  // and a horizontal bar (120 in); E = 30e6 psi, A = 2 in^2, 10,000 lb down at node 1.
  // Printed: u1 = 0.414e-2 in, v1 = -1.59e-2 in; stresses 3965, 1471, -1035 psi (the book
  // rounds the displacements before the stresses, hence the loose tolerance).
  const s = buildStructure({
    ...model(2, [["1", 0, 0], ["2", 0, 120, 0, ["x", "y"]], ["3", 120, 120, 0, ["x", "y"]], ["4", 120, 0, 0, ["x", "y"]]],
      [["e1", "1", "2", 2], ["e2", "1", "3", 2], ["e3", "1", "4", 2]], [{ id: "P", loads: [{ node: "1", fy: -10000 }] }], { E: 30e6 }),
    units: { length: "in", force: "lbf", mass: "lb" },
  });
  const a = analyze(s);
  const near = (v: number, printed: number, rel: number) => expect(Math.abs(v - printed)).toBeLessThanOrEqual(rel * Math.abs(printed));
  it("displacements of node 1", () => {
    near(a.displacements[0][0], 0.414e-2, 0.005);
    near(a.displacements[0][1], -1.59e-2, 0.005);
  });
  it("bar stresses", () => {
    near(a.stresses[0][0], 3965, 0.005);
    near(a.stresses[0][1], 1471, 0.006);
    near(a.stresses[0][2], -1035, 0.005);
  });
});
