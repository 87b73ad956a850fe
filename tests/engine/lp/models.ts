// Small invented trusses for the least-mass bound tests, built as plain model objects.
import { trussModelSchema, type TrussModel, type TrussModelInput } from "~/engine/truss";
import { steelModelHeader } from "../../support/model-header";

export const STEEL_DENSITY = 7.85e-9; // t/mm3, as in steelModelHeader

/**
 * A wall bracket: supports A (0,0) and C (0,H), free node B (L,0) with a downward load P; AB
 * horizontal (compression), CB diagonal (tension). Statically determinate.
 */
export function bracket(o: { L: number; H: number; P: number; tension: number; compression: number; sideLoad?: number; grouped?: boolean }): TrussModel {
  const loadCases: TrussModelInput["loadCases"] = [{ id: "down", loads: [{ node: "B", fy: -o.P }] }];
  if (o.sideLoad) loadCases.push({ id: "side", loads: [{ node: "B", fx: o.sideLoad }] });
  return trussModelSchema.parse({
    ...steelModelHeader("Test bracket", 2, { tension: o.tension, compression: o.compression }),
    nodes: [
      { id: "A", x: 0, y: 0, fixed: ["x", "y"] },
      { id: "C", x: 0, y: o.H, fixed: ["x", "y"] },
      { id: "B", x: o.L, y: 0 },
    ],
    members: [
      { id: "AB", start: "A", end: "B", material: "steel", area: 500, ...(o.grouped ? { group: "all" } : {}) },
      { id: "CB", start: "C", end: "B", material: "steel", area: 500, ...(o.grouped ? { group: "all" } : {}) },
    ],
    loadCases,
    design: { objective: "mass", areaBounds: { min: 1e-3, max: 1e5 }, constraints: { stress: true }, solver: { tolerance: 1e-9 } },
  });
}

/** A tripod: three legs from supports on a circle of radius R to an apex at height H, load P down. */
export function tripod(R: number, H: number, P: number): TrussModel {
  const angles = [0, (2 * Math.PI) / 3, (4 * Math.PI) / 3];
  return trussModelSchema.parse({
    ...steelModelHeader("Test tripod", 3, { tension: 235, compression: 180 }),
    nodes: [
      ...angles.map((a, k) => ({ id: `S${k}`, x: R * Math.cos(a), y: R * Math.sin(a), z: 0, fixed: ["x", "y", "z"] as ("x" | "y" | "z")[] })),
      { id: "T", x: 0, y: 0, z: H },
    ],
    members: angles.map((_, k) => ({ id: `leg${k}`, start: `S${k}`, end: "T", material: "steel", area: 800 })),
    loadCases: [{ id: "LC1", loads: [{ node: "T", fz: -P }] }],
    design: { objective: "mass", constraints: { stress: true } },
  });
}

/** A hanging bar of length L from a support, tip load P, own weight in load case G. */
export function hangingBar(L: number, P: number, extras: { selfWeight?: number; combinations?: TrussModelInput["combinations"] }): TrussModel {
  const m = trussModelSchema.parse({
    ...steelModelHeader("Test hanging bar", 2, { tension: 235, compression: 235 }),
    nodes: [
      { id: "top", x: 0, y: 0, fixed: ["x", "y"] },
      { id: "tip", x: 0, y: -L, fixed: ["x"] },
    ],
    members: [{ id: "bar", start: "top", end: "tip", material: "steel", area: 100 }],
    loadCases: [
      { id: "G", loads: [], selfWeight: extras.selfWeight ?? 1 },
      { id: "Q", loads: [{ node: "tip", fy: -P }] },
    ],
    ...(extras.combinations ? { combinations: extras.combinations } : {}),
    design: { objective: "mass", constraints: { stress: true } },
  });
  return m;
}
