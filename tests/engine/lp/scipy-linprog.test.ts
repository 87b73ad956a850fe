// Least-mass bounds of ground structures against scipy.optimize.linprog (method "highs"), through
// tests/python/plastic_lp.py: the LP built again from the model file in Python, independently of
// the TypeScript assembly, scaling and compact form. Skips loudly without python3-scipy.
import { spawnSync } from "node:child_process";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { loadHighsSolver, plasticInputFromModel, solvePlasticDesign, type LpSolver } from "~/engine/lp";
import { trussModelSchema, type TrussModel } from "~/engine/truss";
import { groundStructure } from "../design/ground-structure";
import { findScipy, loudSkip } from "../../support/scipy";

const here = path.dirname(fileURLToPath(import.meta.url));
const scipy = findScipy();
if (!scipy) loudSkip("least-mass LP bounds against scipy.optimize.linprog (tests/engine/lp/scipy-linprog.test.ts)");

function reference(model: TrussModel): number {
  const r = spawnSync(scipy!.python, [path.join(here, "../../python/plastic_lp.py")], { input: JSON.stringify(model), encoding: "utf8" });
  if (r.status !== 0) throw new Error(r.stderr);
  const out = JSON.parse(r.stdout) as { mass: number | null; status: string };
  if (out.mass === null) throw new Error(`linprog: ${out.status}`);
  return out.mass;
}

let solver: LpSolver;
beforeAll(async () => {
  solver = await loadHighsSolver();
});

function ours(model: TrussModel): number {
  const r = solvePlasticDesign(plasticInputFromModel(model).input, solver);
  if (r.status !== "optimal") throw new Error(r.message);
  return r.mass;
}

function ground(nx: number, ny: number, reach: number, loadCases = 1): TrussModel {
  return trussModelSchema.parse(groundStructure({ nx, ny, reach, objective: "mass", loadCases }));
}

describe.skipIf(!scipy)("ground structures: least-mass bound against scipy linprog (HiGHS)", () => {
  it("109 members, one load case (compact form)", () => {
    const m = ground(6, 4, 2);
    expect(Math.abs(ours(m) / reference(m) - 1)).toBeLessThan(1e-6);
  });

  it("418 members, two load cases (full form)", () => {
    const m = ground(12, 6, 2, 2);
    expect(Math.abs(ours(m) / reference(m) - 1)).toBeLessThan(1e-6);
  });

  it("109 members in 9 shared-area groups, unequal allowables, own weight in strength combinations", () => {
    const m = ground(6, 4, 2, 2);
    m.members.forEach((mm, e) => (mm.group = `g${e % 9}`));
    m.materials[0].allowableCompression = 140;
    m.units.mass = "kg";
    m.materials[0].density = 7.85e-5; // kg/mm3: ten times steel, an invented material whose weight counts
    Object.assign(m.loadCases[0], { selfWeight: 1 });
    Object.assign(m, {
      combinations: [
        { id: "ULS-1", use: "strength", factors: { LC1: 1.35, LC2: 1.5 } },
        { id: "ULS-2", use: "strength", factors: { LC1: 1.0 } },
        { id: "SLS", use: "service", factors: { LC1: 1, LC2: 1 } },
      ],
    });
    const withWeight = ours(m);
    expect(Math.abs(withWeight / reference(m) - 1)).toBeLessThan(1e-6);
    Object.assign(m.loadCases[0], { selfWeight: 0 });
    expect(withWeight / ours(m) - 1).toBeGreaterThan(1e-3); // own weight changed the answer
  });
});
