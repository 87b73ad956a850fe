// Displacements of generated 3D lattices against an independent assembly and solve in scipy.sparse.
import { describe, expect, it } from "vitest";
import { analyze, buildStructure } from "~/engine/truss";
import { latticeModel } from "./models";
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
});
