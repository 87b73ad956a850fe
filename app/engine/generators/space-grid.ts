// Double-layer space grids over a rectangle. The top layer is a square grid of nx by ny
// modules. "offset": the bottom layer's nodes sit under the middle of each top module, each
// joined to the module's four top corners (a grid of inverted pyramids) and to its bottom
// neighbours. "aligned": the bottom layer lies directly under the top one, joined by verticals,
// with one diagonal in every vertical panel along both directions, and a plan diagonal in
// every edge module of the top layer so the grid cannot rack in plan.
// Supports on the top layer: every edge node, or the four corners (pinned). The default load
// is an area load on the top layer, shared by the top nodes by tributary area.
import { z } from "zod";
import { assemble, choice, commonFields, KN_TO_N, M_TO_MM, ModelBuilder, num, tributaryLengths, type CommonParams } from "./common";
import { fmt, round } from "./planar";

export const GRID_LAYOUTS = ["offset", "aligned"] as const;
export const GRID_SUPPORTS = ["edges", "corners"] as const;

export const spaceGridParameters = z
  .object({
    layout: choice(GRID_LAYOUTS, "offset", "offset: bottom nodes under the middle of each top module; aligned: bottom layer directly below the top one"),
    modulesX: num({ default: 6, unit: "count", description: "Modules along x", int: true, min: 1, max: 200 }),
    modulesY: num({ default: 4, unit: "count", description: "Modules along y", int: true, min: 1, max: 200 }),
    moduleX: num({ default: 3, unit: "m", description: "Module length along x", positive: true, max: 100 }),
    moduleY: num({ default: 3, unit: "m", description: "Module length along y", positive: true, max: 100 }),
    depth: num({ default: 2.1, unit: "m", description: "Distance between the layers", positive: true, max: 100 }),
    supports: choice(GRID_SUPPORTS, "edges", "Pinned supports at every top edge node, or at the four top corners"),
    areaLoad: num({ default: 1.5, unit: "kN/m²", description: "Downward load per plan area on the top layer", min: 0 }),
    ...commonFields,
  })
  .strict();

export type SpaceGridParams = z.infer<typeof spaceGridParameters>;

export function spaceGrid(p: SpaceGridParams & CommonParams) {
  const nx = p.modulesX;
  const ny = p.modulesY;
  const ax = p.moduleX * M_TO_MM;
  const ay = p.moduleY * M_TO_MM;
  const d = p.depth * M_TO_MM;
  const b = new ModelBuilder(p.area);
  const T = (i: number, j: number) => `T${i}_${j}`;
  const Bn = (i: number, j: number) => `B${i}_${j}`;
  const edge = (i: number, j: number) => i === 0 || j === 0 || i === nx || j === ny;
  const cornerNode = (i: number, j: number) => (i === 0 || i === nx) && (j === 0 || j === ny);
  const supported = (i: number, j: number) => (p.supports === "edges" ? edge(i, j) : cornerNode(i, j));
  for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) b.node(T(i, j), i * ax, j * ay, d, supported(i, j) ? ["x", "y", "z"] : undefined);
  for (let j = 0; j <= ny; j++) for (let i = 0; i < nx; i++) b.member(`tx${i}_${j}`, T(i, j), T(i + 1, j), "top-chords");
  for (let i = 0; i <= nx; i++) for (let j = 0; j < ny; j++) b.member(`ty${i}_${j}`, T(i, j), T(i, j + 1), "top-chords");

  if (p.layout === "offset") {
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) b.node(Bn(i, j), (i + 0.5) * ax, (j + 0.5) * ay, 0);
    for (let j = 0; j < ny; j++) for (let i = 0; i + 1 < nx; i++) b.member(`bx${i}_${j}`, Bn(i, j), Bn(i + 1, j), "bottom-chords");
    for (let i = 0; i < nx; i++) for (let j = 0; j + 1 < ny; j++) b.member(`by${i}_${j}`, Bn(i, j), Bn(i, j + 1), "bottom-chords");
    for (let j = 0; j < ny; j++)
      for (let i = 0; i < nx; i++) {
        b.member(`d${i}_${j}_a`, Bn(i, j), T(i, j), "diagonals");
        b.member(`d${i}_${j}_b`, Bn(i, j), T(i + 1, j), "diagonals");
        b.member(`d${i}_${j}_c`, Bn(i, j), T(i + 1, j + 1), "diagonals");
        b.member(`d${i}_${j}_d`, Bn(i, j), T(i, j + 1), "diagonals");
      }
  } else {
    for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) b.node(Bn(i, j), i * ax, j * ay, 0);
    for (let j = 0; j <= ny; j++) for (let i = 0; i < nx; i++) b.member(`bx${i}_${j}`, Bn(i, j), Bn(i + 1, j), "bottom-chords");
    for (let i = 0; i <= nx; i++) for (let j = 0; j < ny; j++) b.member(`by${i}_${j}`, Bn(i, j), Bn(i, j + 1), "bottom-chords");
    for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) if (!supported(i, j)) b.member(`v${i}_${j}`, Bn(i, j), T(i, j), "verticals");
    // diagonals fall towards the middle of the grid in each vertical panel
    for (let j = 0; j <= ny; j++)
      for (let i = 0; i < nx; i++) b.member(`dx${i}_${j}`, i + 0.5 < nx / 2 ? T(i, j) : Bn(i, j), i + 0.5 < nx / 2 ? Bn(i + 1, j) : T(i + 1, j), "diagonals");
    for (let i = 0; i <= nx; i++)
      for (let j = 0; j < ny; j++) b.member(`dy${i}_${j}`, j + 0.5 < ny / 2 ? T(i, j) : Bn(i, j), j + 0.5 < ny / 2 ? Bn(i, j + 1) : T(i, j + 1), "diagonals");
    // a ring of braced modules round the top layer: rigid in plan, it holds every grid line's ends
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) if (i === 0 || j === 0 || i === nx - 1 || j === ny - 1) b.member(`p${i}_${j}`, T(i, j), T(i + 1, j + 1), "plan-bracing");
    // supported bottom nodes hang from the verticals they lack: pin them too
    for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) if (supported(i, j)) b.fix(Bn(i, j), ["x", "y", "z"]);
  }

  if (p.areaLoad > 0) {
    const sx = tributaryLengths(Array.from({ length: nx + 1 }, (_, i) => i * ax), 0, nx * ax);
    const sy = tributaryLengths(Array.from({ length: ny + 1 }, (_, j) => j * ay), 0, ny * ay);
    const q = (p.areaLoad * KN_TO_N) / (M_TO_MM * M_TO_MM); // N/mm²
    for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) if (!supported(i, j)) b.load(T(i, j), { fx: 0, fy: 0, fz: -q * sx[i]! * sy[j]! });
  }
  const Lx = nx * p.moduleX;
  const Ly = ny * p.moduleY;
  // the span a deflection limit is measured on: the shorter side between edge supports, the longer between corners
  const span = (p.supports === "edges" ? Math.min(Lx, Ly) : Math.max(Lx, Ly)) * M_TO_MM;
  return {
    ok: true as const,
    model: assemble(b, p, {
      name: `Space grid ${fmt(Lx)} m x ${fmt(Ly)} m, ${p.layout}`,
      description: `Double-layer space grid (${p.layout}): ${nx} x ${ny} modules of ${fmt(p.moduleX)} m x ${fmt(p.moduleY)} m, ${fmt(p.depth)} m deep, supported at the ${p.supports === "edges" ? "top edge nodes" : "four top corners"}; ${fmt(p.areaLoad)} kN/m² on the top layer. Generated by the Strutwise workbench.`,
      dimension: 3,
      loadCase: { id: "LC1", name: `Area load ${fmt(p.areaLoad)} kN/m² on the top layer` },
      groups: ["top-chords", "bottom-chords", "diagonals", "verticals", "plan-bracing"],
      deflection: { node: "*", axis: "z", limit: round(span / p.deflectionRatio) },
    }),
  };
}
