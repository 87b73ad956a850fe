// Adjoint sensitivities against central finite differences (the check the derivations must pass).
import { describe, expect, it } from "vitest";
import { analyze, buildStructure, complianceGradient, displacementGradient, massGradient, stressGradient, volumeGradient, type Structure } from "~/engine/truss";
import type { Analysis } from "~/engine/truss";
import { latticeModel, model } from "./models";

type Resp = (a: Analysis) => number;

function checkAgainstFd(s: Structure, resp: Resp, grad: (a: Analysis) => { areas: Float64Array; coords: Float64Array }) {
  const a0 = analyze(s);
  const g = grad(a0);
  const scaleOf = (v: Float64Array) => Math.max(...Array.from(v, Math.abs), 1e-300);
  const ga = scaleOf(g.areas);
  for (let e = 0; e < s.areas.length; e++) {
    const h = 1e-6 * s.areas[e];
    const up = s.areas.slice(); up[e] += h;
    const dn = s.areas.slice(); dn[e] -= h;
    const fd = (resp(analyze(s, { areas: up })) - resp(analyze(s, { areas: dn }))) / (2 * h);
    expect(Math.abs(fd - g.areas[e])).toBeLessThan(1e-5 * ga + 1e-12);
  }
  const gc = scaleOf(g.coords);
  for (let d = 0; d < s.coords.length; d++) {
    if (s.dim === 2 && d % 3 === 2) { expect(g.coords[d]).toBe(0); continue; }
    const h = 1e-6;
    const up = s.coords.slice(); up[d] += h;
    const dn = s.coords.slice(); dn[d] -= h;
    const fd = (resp(analyze(s, { coords: up })) - resp(analyze(s, { coords: dn }))) / (2 * h);
    expect(Math.abs(fd - g.coords[d])).toBeLessThan(1e-5 * gc + 1e-12);
  }
}

const cases: [string, Structure][] = [
  // determinate: a two-panel 2D truss with a pin and a roller
  ["2D determinate", buildStructure(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 4, 0], ["C", 8, 0, 0, ["y"]], ["D", 2, 3], ["E", 6, 3.2]],
    [["AB", "A", "B"], ["BC", "B", "C"], ["AD", "A", "D"], ["DB", "D", "B"], ["BE", "B", "E", 0.002], ["EC", "E", "C"], ["DE", "D", "E"]],
    [{ id: "LC1", loads: [{ node: "D", fy: -30, fx: 5 }] }, { id: "LC2", loads: [{ node: "B", fy: -50 }, { node: "E", fx: 10 }] }]))],
  // indeterminate: both diagonals in each panel
  ["2D indeterminate", buildStructure(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 3, 0], ["C", 6, 0, 0, ["x", "y"]], ["D", 0, 3], ["E", 3, 3.5], ["F", 6, 3]],
    [["AB", "A", "B"], ["BC", "B", "C"], ["DE", "D", "E"], ["EF", "E", "F"], ["AD", "A", "D"], ["BE", "B", "E"], ["CF", "C", "F"], ["AE", "A", "E"], ["BD", "B", "D", 0.0015], ["BF", "B", "F"], ["CE", "C", "E"]],
    [{ id: "LC1", loads: [{ node: "E", fy: -40 }, { node: "D", fx: 12 }] }]))],
  // determinate 3D: a tripod on three pins
  ["3D determinate", buildStructure(model(3, [["P", 0.3, 0.2, 4], ["A", 0, 0, 0, ["x", "y", "z"]], ["B", 3, 0, 0, ["x", "y", "z"]], ["C", 1, 2.5, 0, ["x", "y", "z"]]],
    [["PA", "P", "A"], ["PB", "P", "B", 0.002], ["PC", "P", "C"]], [{ id: "LC1", loads: [{ node: "P", fx: 3, fy: -2, fz: -20 }] }]))],
  ["3D indeterminate lattice", buildStructure(latticeModel(2, 1, 2))],
];

describe("adjoint sensitivities match central finite differences (from the definition of the derivative)", () => {
  for (const [name, s] of cases) {
    describe(name, () => {
      const free = Array.from({ length: s.coords.length }, (_, d) => d).filter((d) => !s.fixed[d]);
      it("compliance", () => checkAgainstFd(s, (a) => a.compliance[0], (a) => complianceGradient(s, a, 0)));
      it("displacement", () => {
        const dof = free[free.length - 2];
        checkAgainstFd(s, (a) => a.displacements[0][dof], (a) => displacementGradient(s, a, 0, dof));
      });
      it("stress of two members", () => {
        for (const m of [0, s.start.length - 1]) checkAgainstFd(s, (a) => a.stresses[0][m], (a) => stressGradient(s, a, 0, m));
      });
      it("volume and mass", () => {
        checkAgainstFd(s, (a) => a.volume, (a) => volumeGradient(s, a));
        checkAgainstFd(s, (a) => a.mass, (a) => massGradient(s, a));
      });
      if (s.loads.length > 1) it("second load case by id", () => checkAgainstFd(s, (a) => a.compliance[1], (a) => complianceGradient(s, a, s.loadCaseIds[1])));
    });
  }
  it("a restrained dof has a zero displacement gradient", () => {
    const s = cases[0][1];
    const g = displacementGradient(s, analyze(s), 0, 0);
    expect(g.areas.every((v) => v === 0)).toBe(true);
  });
});
