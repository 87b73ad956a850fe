// Lattice towers and masts with 3 or 4 legs: the legs run straight from the base polygon to
// the top polygon (taper when the widths differ), horizontals close each level, and every
// face panel is braced with one diagonal (alternating up the face), a cross (X), or a K: two
// diagonals from the panel's lower corners to the middle of its upper horizontal, whose
// middles are tied round the tower in plan (and across, on 4 legs) so they cannot move out of
// the face. Plan bracing
// every n panels adds a diagonal across a 4-leg level (a triangle is rigid in plan already).
// The base nodes are pinned; the default load is a horizontal tip load shared by the top nodes.
import { z } from "zod";
import { assemble, choice, commonFields, KN_TO_N, M_TO_MM, ModelBuilder, num, type CommonParams } from "./common";
import { fmt, round } from "./planar";

export const TOWER_BRACING = ["single", "x", "k"] as const;

export const towerParameters = z
  .object({
    legs: z.union([z.literal(3), z.literal(4)], { error: "must be 3 or 4" }).default(4).meta({ description: "Number of legs" }),
    height: num({ default: 30, unit: "m", description: "Height from the base to the top", positive: true, max: 1000 }),
    panels: num({ default: 10, unit: "count", description: "Number of panels up the height", int: true, min: 1, max: 200 }),
    baseWidth: num({ default: 4, unit: "m", description: "Width of a face at the base (distance between neighbouring legs)", positive: true, max: 200 }),
    topWidth: num({ default: 1.5, unit: "m", description: "Width of a face at the top (equal to the base width: no taper)", positive: true, max: 200 }),
    bracing: choice(TOWER_BRACING, "x", "Face bracing: single diagonal, X (cross) or K"),
    planBracingEvery: num({ default: 2, unit: "count", description: "A plan diagonal every this many panels (0: none; 4-leg towers only)", int: true, min: 0, max: 200 }),
    tipLoad: num({ default: 20, unit: "kN", description: "Horizontal load at the top along x, shared by the top nodes", min: 0 }),
    tipVertical: num({ default: 10, unit: "kN", description: "Downward load at the top, shared by the top nodes (equipment)", min: 0 }),
    ...commonFields,
  })
  .strict();

export type TowerParams = z.infer<typeof towerParameters>;

export function latticeTower(p: TowerParams & CommonParams) {
  const H = p.height * M_TO_MM;
  const n = p.panels;
  const k = p.legs;
  const b = new ModelBuilder(p.area);
  // legs on a regular polygon: circumradius = width / (2 sin(pi / k))
  const corner = (level: number, leg: number): [number, number, number] => {
    const z = (level / n) * H;
    const w = (p.baseWidth + ((p.topWidth - p.baseWidth) * level) / n) * M_TO_MM;
    const r = w / (2 * Math.sin(Math.PI / k));
    const angle = (2 * Math.PI * leg) / k + (k === 4 ? Math.PI / 4 : -Math.PI / 2);
    return [r * Math.cos(angle), r * Math.sin(angle), z];
  };
  const id = (level: number, leg: number) => `L${level}_${(leg + k) % k}`;
  for (let j = 0; j <= n; j++) for (let l = 0; l < k; l++) b.node(id(j, l), ...corner(j, l), j === 0 ? ["x", "y", "z"] : undefined);

  for (let j = 0; j < n; j++) {
    for (let l = 0; l < k; l++) b.member(`leg${l}_${j + 1}`, id(j, l), id(j + 1, l), "legs");
    for (let l = 0; l < k; l++) {
      const [a0, a1, b0, b1] = [id(j, l), id(j, l + 1), id(j + 1, l), id(j + 1, l + 1)];
      const face = `f${l}_${j + 1}`;
      if (p.bracing === "k") {
        const [x0, y0, z0] = corner(j + 1, l);
        const [x1, y1] = corner(j + 1, l + 1);
        const mid = b.node(`K${j + 1}_${l}`, (x0 + x1) / 2, (y0 + y1) / 2, z0);
        b.member(`${face}_h1`, b0, mid, "horizontals");
        b.member(`${face}_h2`, mid, b1, "horizontals");
        b.member(`${face}_k1`, a0, mid, "bracing");
        b.member(`${face}_k2`, a1, mid, "bracing");
      } else {
        b.member(`${face}_h`, b0, b1, "horizontals");
        if (p.bracing === "x") {
          b.member(`${face}_x1`, a0, b1, "bracing");
          b.member(`${face}_x2`, a1, b0, "bracing");
        } else if (j % 2 === 0) b.member(`${face}_d`, a0, b1, "bracing");
        else b.member(`${face}_d`, a1, b0, "bracing");
      }
    }
    if (p.bracing === "k") {
      for (let l = 0; l < k; l++) b.member(`ring${j + 1}_${l}`, `K${j + 1}_${l}`, `K${j + 1}_${(l + 1) % k}`, "plan-bracing");
      // the ring of face middles is a square on a 4-leg tower: one diagonal keeps it square
      if (k === 4) b.member(`ring${j + 1}_x`, `K${j + 1}_0`, `K${j + 1}_2`, "plan-bracing");
    }
    const level = j + 1;
    if (k === 4 && p.planBracingEvery > 0 && level % p.planBracingEvery === 0 && level < n) {
      b.member(`plan${level}`, id(level, 0), id(level, 2), "plan-bracing");
    }
  }
  // the top level always gets its plan diagonal on a 4-leg tower: the load enters there
  if (k === 4) b.member(`plan${n}`, id(n, 0), id(n, 2), "plan-bracing");

  if (p.tipLoad > 0 || p.tipVertical > 0) {
    for (let l = 0; l < k; l++) {
      b.load(id(n, l), { fx: (p.tipLoad * KN_TO_N) / k, fy: 0, fz: -(p.tipVertical * KN_TO_N) / k });
    }
  }
  const bracingWords = { single: "single-diagonal", x: "X", k: "K" }[p.bracing];
  return {
    ok: true as const,
    model: assemble(b, p, {
      name: `${k}-leg tower, ${fmt(p.height)} m, ${bracingWords} bracing`,
      description: `${k}-leg lattice tower: height ${fmt(p.height)} m in ${n} panels, face width ${fmt(p.baseWidth)} m at the base and ${fmt(p.topWidth)} m at the top, ${bracingWords} face bracing${k === 4 && p.planBracingEvery > 0 ? `, plan bracing every ${p.planBracingEvery} panels` : ""}; ${fmt(p.tipLoad)} kN sideways and ${fmt(p.tipVertical)} kN down at the top. Generated by the Strutwise workbench.`,
      dimension: 3,
      loadCase: { id: "LC1", name: `Tip load ${fmt(p.tipLoad)} kN sideways, ${fmt(p.tipVertical)} kN down` },
      groups: ["legs", "bracing", "horizontals", "plan-bracing"],
      // a sway limit of height / ratio at the top (the same common-practice ratio as spans)
      deflection: { node: id(n, 0), axis: "x", limit: round(H / p.deflectionRatio) },
    }),
  };
}
