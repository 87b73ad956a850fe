// Displacements of generated 3D lattices against an independent assembly and solve in scipy.sparse.
import { describe, expect, it } from "vitest";
import { analyze, buildStructure } from "~/engine/truss";
import { latticeModel, model } from "./models";
import { scipyAvailable, scipySolve, warnNoScipy } from "./scipy";

const haveScipy = scipyAvailable();
if (!haveScipy) warnNoScipy("3D lattice displacements against scipy.sparse (tests/engine/truss/scipy-lattice.test.ts)");

describe.skipIf(!haveScipy)("3D lattices against scipy.sparse (reference library: scipy.sparse.linalg.splu)", () => {
  for (const [nx, ny, nz] of [[3, 2, 4], [5, 4, 6]] as const) {
    it(`${nx} x ${ny} x ${nz} cells, two load cases`, () => {
      const model = latticeModel(nx, ny, nz);
      const a = analyze(buildStructure(model));
      const ref = scipySolve(model);
      model.loadCases.forEach((lc, k) => {
        const u = a.displacements[k];
        const r = ref.displacements[lc.id].flat();
        const scale = Math.max(...r.map(Math.abs));
        expect(scale).toBeGreaterThan(0);
        let worst = 0;
        for (let d = 0; d < r.length; d++) worst = Math.max(worst, Math.abs(u[d] - r[d]));
        expect(worst / scale).toBeLessThan(1e-9);
      });
    });
  }

  it("a 2D girder with 40 panels and both diagonals, pin and roller", () => {
    const nodes: Parameters<typeof model>[1] = [];
    const members: Parameters<typeof model>[2] = [];
    for (let i = 0; i <= 40; i++) {
      nodes.push([`b${i}`, i * 1.5, 0, 0, i === 0 ? ["x", "y"] : i === 40 ? ["y"] : undefined]);
      nodes.push([`t${i}`, i * 1.5, 2 + 0.5 * Math.sin((Math.PI * i) / 40)]);
      members.push([`v${i}`, `b${i}`, `t${i}`]);
      if (i > 0) {
        members.push([`bc${i}`, `b${i - 1}`, `b${i}`], [`tc${i}`, `t${i - 1}`, `t${i}`]);
        members.push([`d${i}`, `b${i - 1}`, `t${i}`, 0.0007], [`e${i}`, `t${i - 1}`, `b${i}`, 0.0005]);
      }
    }
    const m = model(2, nodes, members, [{ id: "LC1", loads: nodes.filter((n) => n[0].startsWith("t")).map((n) => ({ node: n[0], fy: -3, fx: 0.4 })) }]);
    const a = analyze(buildStructure(m));
    const r = scipySolve(m).displacements.LC1.flat();
    const scale = Math.max(...r.map(Math.abs));
    let worst = 0;
    for (let d = 0; d < r.length; d++) worst = Math.max(worst, Math.abs(a.displacements[0][d] - r[d]));
    expect(worst / scale).toBeLessThan(1e-9);
  });
});
