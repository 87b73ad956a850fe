// Truss models for the queue tests, written out here so each test says what it solves.
import { steelModelHeader } from "../../support/model-header";
export interface ModelJson {
  [key: string]: unknown;
}

/**
 * Symmetric two-bar truss: supports 4 m apart, apex 1.5 m up, 30 kN down at the apex. Each
 * bar is 2.5 m long and carries N = P / (2 sin θ) = 30 kN / (2 · 0.6) = 25 kN in compression
 * (statics). Statically determinate with stress limits only, so the minimum-mass design is
 * the fully stressed one: A = N / σ_allow = 25,000 N / 235 MPa = 106.38 mm² (common practice).
 */
export function twoBarModel(name = "Queue probe: two-bar frame"): ModelJson {
  return {
    ...steelModelHeader(name, 2, { tension: 235, compression: 235 }),
    nodes: [
      { id: "A", x: 0, y: 0, fixed: ["x", "y"] },
      { id: "B", x: 4000, y: 0, fixed: ["x", "y"] },
      { id: "C", x: 2000, y: 1500 },
    ],
    members: [
      { id: "AC", start: "A", end: "C", material: "steel", area: 1000 },
      { id: "BC", start: "B", end: "C", material: "steel", area: 1000 },
    ],
    loadCases: [{ id: "LC1", name: "Apex load", loads: [{ node: "C", fx: 0, fy: -30000 }] }],
    design: {
      objective: "mass",
      formulation: "nested",
      areaBounds: { min: 10, max: 20000 },
      constraints: { stress: true },
      solver: { maxIterations: 100, tolerance: 1e-7 },
    },
  };
}

export const TWO_BAR_FULLY_STRESSED_AREA = 25000 / 235;

/**
 * A planar cantilever grid: `bays` bays of 1 m by `depth` panels, X-braced in every panel,
 * fixed at the left edge, loaded at the right. Many members and displacement limits make a
 * run that lasts long enough to be cancelled or timed out mid-solve.
 */
export function gridModel(bays: number, depth: number, name = `Queue probe: ${bays}x${depth} cantilever grid`): ModelJson {
  const nodes: { id: string; x: number; y: number; fixed?: string[] }[] = [];
  const id = (i: number, j: number) => `N${i}_${j}`;
  for (let i = 0; i <= bays; i++)
    for (let j = 0; j <= depth; j++) nodes.push({ id: id(i, j), x: i * 1000, y: j * 1000, ...(i === 0 ? { fixed: ["x", "y"] } : {}) });
  const members: { id: string; start: string; end: string; material: string; area: number }[] = [];
  const add = (a: string, b: string) => members.push({ id: `${a}-${b}`, start: a, end: b, material: "steel", area: 2000 });
  for (let i = 0; i <= bays; i++)
    for (let j = 0; j <= depth; j++) {
      if (i < bays) add(id(i, j), id(i + 1, j));
      if (j < depth && i > 0) add(id(i, j), id(i, j + 1));
      if (i < bays && j < depth) {
        add(id(i, j), id(i + 1, j + 1));
        add(id(i, j + 1), id(i + 1, j));
      }
    }
  return {
    ...steelModelHeader(name, 2, { tension: 235, compression: 235 }),
    nodes,
    members,
    loadCases: [
      { id: "LC1", loads: [{ node: id(bays, 0), fy: -50000 }] },
      { id: "LC2", loads: [{ node: id(bays, depth), fx: 30000, fy: -20000 }] },
    ],
    design: {
      objective: "mass",
      formulation: "nested",
      areaBounds: { min: 1, max: 50000 },
      constraints: { stress: true, displacement: [{ node: "*", axis: "all", limit: bays * 4 }] },
      solver: { maxIterations: 5000, tolerance: 1e-12 },
    },
  };
}

/** The two-bar frame without its second support: node C can swing, a mechanism. */
export function mechanismModel(): ModelJson {
  const m = twoBarModel("Queue probe: unbraced apex") as { members: unknown[]; name: string };
  return { ...m, members: [m.members[0]] };
}
