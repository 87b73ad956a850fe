// Laws every linear truss analysis must obey, checked on an indeterminate 3D lattice.
import { describe, expect, it } from "vitest";
import { analyze, assembleStiffness, buildStructure, csrGet, csrMultiply, freeDofs, internalForces, memberForces, memberLengths } from "~/engine/truss";
import { latticeModel } from "./models";

const s = buildStructure(latticeModel(3, 2, 3));
const a = analyze(s);
const nNodes = s.nodeIds.length;

describe("mechanics checks on a 3 x 2 x 3 lattice", () => {
  it("Maxwell-Betti reciprocity: u_i under a unit load at j equals u_j under a unit load at i", () => {
    const free = Array.from({ length: nNodes * 3 }, (_, d) => d).filter((d) => !s.fixed[d]);
    const pick = [free[0], free[7], free[free.length - 1], free[Math.floor(free.length / 2)]];
    for (const i of pick) for (const j of pick) {
      const fi = new Float64Array(nNodes * 3); fi[i] = 1;
      const fj = new Float64Array(nNodes * 3); fj[j] = 1;
      const ui = a.solve(fi);
      const uj = a.solve(fj);
      expect(Math.abs(uj[i] - ui[j])).toBeLessThan(1e-12 * Math.max(Math.abs(ui[i]), Math.abs(uj[j])));
    }
  });

  it("rigid-body motion (translation + small rotation) strains no member", () => {
    const u = new Float64Array(nNodes * 3);
    const t = [0.3, -0.2, 0.5], w = [0.01, -0.02, 0.015]; // u = t + w x r
    for (let i = 0; i < nNodes; i++) {
      const r = [s.coords[3 * i], s.coords[3 * i + 1], s.coords[3 * i + 2]];
      u[3 * i] = t[0] + w[1] * r[2] - w[2] * r[1];
      u[3 * i + 1] = t[1] + w[2] * r[0] - w[0] * r[2];
      u[3 * i + 2] = t[2] + w[0] * r[1] - w[1] * r[0];
    }
    const L = memberLengths(s);
    const N = memberForces(s, s.areas, s.coords, L, u);
    // the force a strain of the motion's size would give: E A |u|max / L; rigid motion must give ~0
    const scale = (s.E[0] * Math.max(...s.areas) * Math.max(...u.map(Math.abs))) / Math.min(...L);
    expect(Math.max(...N.map(Math.abs))).toBeLessThan(1e-12 * scale);
    const p = internalForces(s, s.coords, L, N);
    expect(Math.max(...p.map(Math.abs))).toBeLessThan(1e-11 * scale);
  });

  it("equilibrium: reactions balance the loads in force and moment, residual tiny", () => {
    expect(a.equilibriumResidual).toBeLessThan(1e-10);
    for (let k = 0; k < s.loads.length; k++) {
      const F = [0, 0, 0], M = [0, 0, 0];
      let scale = 0;
      for (let i = 0; i < nNodes; i++) {
        const r = [s.coords[3 * i], s.coords[3 * i + 1], s.coords[3 * i + 2]];
        const f = [0, 1, 2].map((c) => s.loads[k][3 * i + c] + a.reactions[k][3 * i + c]);
        for (let c = 0; c < 3; c++) { F[c] += f[c]; scale = Math.max(scale, Math.abs(s.loads[k][3 * i + c])); }
        M[0] += r[1] * f[2] - r[2] * f[1];
        M[1] += r[2] * f[0] - r[0] * f[2];
        M[2] += r[0] * f[1] - r[1] * f[0];
      }
      for (const v of F) expect(Math.abs(v)).toBeLessThan(1e-9 * scale);
      for (const v of M) expect(Math.abs(v)).toBeLessThan(1e-8 * scale);
    }
  });

  it("compliance f.u equals the strain energy sum N^2 L / (E A) (Clapeyron's theorem)", () => {
    for (let k = 0; k < s.loads.length; k++) {
      let U = 0;
      for (let e = 0; e < s.start.length; e++) U += (a.forces[k][e] ** 2 * a.lengths[e]) / (s.E[e] * s.areas[e]);
      expect(Math.abs(U - a.compliance[k])).toBeLessThan(1e-10 * U);
    }
  });

  it("linearity: doubling every area halves every displacement", () => {
    const b = analyze(s, { areas: s.areas.map((v) => 2 * v) });
    for (let d = 0; d < nNodes * 3; d++) expect(Math.abs(2 * b.displacements[0][d] - a.displacements[0][d])).toBeLessThan(1e-12 + 1e-10 * Math.abs(a.displacements[0][d]));
  });

  it("assembleStiffness (CSR on the free dofs) is symmetric and K u = f on the free dofs", () => {
    const K = assembleStiffness(s);
    const free = freeDofs(s);
    expect(K.rows).toBe(free.length);
    for (let r = 0; r < K.rows; r += 7) for (let p = K.rowPtr[r]; p < K.rowPtr[r + 1]; p++) expect(csrGet(K, K.colIdx[p], r)).toBe(K.values[p]);
    for (let k = 0; k < s.loads.length; k++) {
      const Ku = csrMultiply(K, Array.from(free, (d) => a.displacements[k][d]));
      const fMax = Math.max(...s.loads[k].map(Math.abs));
      free.forEach((d, r) => expect(Math.abs(Ku[r] - s.loads[k][d])).toBeLessThan(1e-10 * fMax));
    }
  });
});
