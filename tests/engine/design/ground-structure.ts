// Generated planar ground structures for tests and benchmarks: an nx x ny grid of nodes,
// every pair within `reach` grid steps joined unless a nearer node lies on the line between
// them (no overlapping members). Left edge pinned, a load on the middle of the right edge:
// the usual cantilever layout study. All data invented for Strutwise.
import type { TrussModelInput } from "~/engine/truss";

export interface GroundOptions {
  nx: number;
  ny: number;
  reach: number;
  objective: "mass" | "compliance";
  spacing?: number; // mm
  loadCases?: number; // 1 or 2 (second case: a horizontal load at the top right)
  formulation?: "nested" | "simultaneous";
  stress?: boolean;
  deflection?: number; // mm, limit at the loaded nodes (mass objective)
}

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

export function groundStructure(o: GroundOptions): TrussModelInput {
  const h = o.spacing ?? 1000;
  const nodes: TrussModelInput["nodes"] = [];
  for (let j = 0; j < o.ny; j++) {
    for (let i = 0; i < o.nx; i++) {
      nodes.push({ id: `n${i}_${j}`, x: i * h, y: j * h, ...(i === 0 ? { fixed: ["x", "y"] as ("x" | "y")[] } : {}) });
    }
  }
  const members: TrussModelInput["members"] = [];
  const N = o.nx * o.ny;
  for (let a = 0; a < N; a++) {
    for (let b = a + 1; b < N; b++) {
      const ia = a % o.nx, ja = Math.floor(a / o.nx), ib = b % o.nx, jb = Math.floor(b / o.nx);
      const dx = Math.abs(ib - ia), dy = Math.abs(jb - ja);
      if (dx > o.reach || dy > o.reach || gcd(dx, dy) !== 1) continue;
      if (ia === 0 && ib === 0) continue; // both ends pinned: carries nothing
      members.push({ id: `b${members.length + 1}`, start: nodes[a].id, end: nodes[b].id, material: "steel", area: 400 });
    }
  }
  const tip = `n${o.nx - 1}_${Math.floor(o.ny / 2)}`;
  const top = `n${o.nx - 1}_${o.ny - 1}`;
  const loadCases: TrussModelInput["loadCases"] = [{ id: "LC1", name: "Tip load", loads: [{ node: tip, fy: -100000 }] }];
  if ((o.loadCases ?? 1) > 1) loadCases.push({ id: "LC2", name: "Side load", loads: [{ node: top, fx: 40000 }] });
  const span = (o.nx - 1) * h;
  const totalLength = members.reduce((s, m) => {
    const a = nodes.find((n) => n.id === m.start)!, b = nodes.find((n) => n.id === m.end)!;
    return s + Math.hypot(b.x - a.x, b.y - a.y);
  }, 0);
  return {
    format: "strutwise.truss",
    version: 1,
    name: `Ground structure ${o.nx}x${o.ny} reach ${o.reach} (${members.length} members)`,
    units: { length: "mm", force: "N", mass: "t" },
    dimension: 2,
    materials: [{ id: "steel", E: 210000, density: 7.85e-9, allowableTension: 235, allowableCompression: 235 }],
    nodes,
    members,
    loadCases,
    design: {
      objective: o.objective,
      formulation: o.formulation ?? "nested",
      areaBounds: { min: 1, max: 20000 },
      constraints:
        o.objective === "compliance"
          ? { volume: { max: 0.25 * 400 * totalLength } }
          : {
              stress: o.stress ?? true,
              displacement: [{ node: tip, axis: "y", limit: o.deflection ?? span / 250 }],
            },
      solver: { tolerance: 1e-6 },
    },
  };
}
