// A square lattice tower for the catalogue tests and benchmarks (invented: a mast for the
// Fenwick Moor wind-measurement site). Four legs tapering from the base to the top, a
// horizontal ring and X-bracing on every face at each level; the base is pinned. Groups: legs,
// rings, x-face and y-face braces per band of levels. Loads: own weight, wind along x at every
// ring (heavier at the top), an instrument load at the top; two strength and one service
// combination.
import type { TrussModelInput } from "~/engine/truss";
import { genericCatalogue } from "~/engine/sections";
import { steelModelHeader } from "./model-header";

export interface TowerOptions {
  levels: number;
  bands: number;
  /** sections in the catalogue (evenly spread over the generic CHS series) */
  sections: number;
  levelHeight?: number; // mm
  baseWidth?: number; // mm
  topWidth?: number; // mm
  formulation?: "nested" | "simultaneous";
  sizing?: "continuous" | "catalogue";
  /** own weight and combinations (false: one wind case, the same limits on it) */
  loadsCombined?: boolean;
}

export function latticeTower(o: TowerOptions): TrussModelInput {
  const h = o.levelHeight ?? 2000, wb = o.baseWidth ?? 6000, wt = o.topWidth ?? 2000;
  const nodes: TrussModelInput["nodes"] = [];
  const corners = [[1, 1], [-1, 1], [-1, -1], [1, -1]];
  for (let l = 0; l <= o.levels; l++) {
    const half = (wb + ((wt - wb) * l) / o.levels) / 2;
    corners.forEach(([sx, sy], k) => nodes.push({ id: `N${l}-${k}`, x: sx * half, y: sy * half, z: l * h, ...(l === 0 ? { fixed: ["x", "y", "z"] as ("x" | "y" | "z")[] } : {}) }));
  }
  const members: TrussModelInput["members"] = [];
  const band = (l: number) => Math.min(o.bands - 1, Math.floor((l * o.bands) / o.levels));
  for (let l = 0; l < o.levels; l++) {
    const b = band(l);
    for (let k = 0; k < 4; k++) {
      const k2 = (k + 1) % 4;
      const face = k % 2 === 0 ? "bx" : "by";
      members.push({ id: `leg${l}-${k}`, start: `N${l}-${k}`, end: `N${l + 1}-${k}`, material: "steel", area: 2000, group: `leg-${b}` });
      members.push({ id: `ring${l}-${k}`, start: `N${l + 1}-${k}`, end: `N${l + 1}-${k2}`, material: "steel", area: 800, group: `ring-${b}` });
      members.push({ id: `d${l}-${k}a`, start: `N${l}-${k}`, end: `N${l + 1}-${k2}`, material: "steel", area: 800, group: `${face}-${b}` });
      members.push({ id: `d${l}-${k}b`, start: `N${l}-${k2}`, end: `N${l + 1}-${k}`, material: "steel", area: 800, group: `${face}-${b}` });
    }
  }
  const wind = [];
  for (let l = 1; l <= o.levels; l++) for (const k of [0, 1]) wind.push({ node: `N${l}-${k}`, fx: l === o.levels ? 6000 : 1500 });
  const top = [0, 1, 2, 3].map((k) => ({ node: `N${o.levels}-${k}`, fz: -5000 }));
  const combined = o.loadsCombined ?? true;
  const all = CHS();
  const pick = Array.from({ length: o.sections }, (_, k) => all[Math.round((k * (all.length - 1)) / Math.max(1, o.sections - 1))]);
  return {
    ...steelModelHeader(`Fenwick Moor mast, ${o.levels} levels (invented)`, 3, { tension: 235, compression: 235 }),
    nodes,
    members,
    loadCases: combined
      ? [
          { id: "G", name: "Own weight", selfWeight: 1, loads: [] },
          { id: "Q", name: "Instruments", loads: top },
          { id: "W", name: "Wind along x", loads: wind },
        ]
      : [{ id: "W", name: "Wind along x", loads: [...wind, ...top] }],
    ...(combined
      ? {
          combinations: [
            { id: "STR-1", name: "Strength: wind leading", use: "strength" as const, factors: { G: 1.35, Q: 1.05, W: 1.5 } },
            { id: "STR-2", name: "Strength: wind with light own weight", use: "strength" as const, factors: { G: 1.0, W: 1.5 } },
            { id: "SRV-1", name: "Service", use: "service" as const, factors: { G: 1, Q: 1, W: 1 } },
          ],
        }
      : {}),
    sections: pick.map((s) => ({ id: s.id, area: s.area, I: s.I, family: s.family })),
    design: {
      objective: "mass",
      formulation: o.formulation ?? "nested",
      sizing: o.sizing ?? "catalogue",
      areaBounds: { min: pick[0].area, max: pick[pick.length - 1].area },
      constraints: {
        stress: true,
        buckling: { effectiveLengthFactor: 1 },
        displacement: [{ node: `N${o.levels}-0`, axis: "x", limit: (o.levels * h) / 150 }],
      },
    },
  };
}

function CHS() {
  return genericCatalogue("mm", ["CHS"]);
}
