// Model files of the design tests and small inline models (invented geometry).
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { trussModelSchema, type TrussModel, type TrussModelInput } from "~/engine/truss";
import { steelModelHeader } from "../../support/model-header";

const dir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../../fixtures/models/design");

export function fixture(name: string): TrussModel {
  return trussModelSchema.parse(JSON.parse(fs.readFileSync(path.join(dir, name), "utf8")));
}

export function parse(input: TrussModelInput): TrussModel {
  return trussModelSchema.parse(input);
}

/** A small 3D mast with two shape variables (height and a mirrored waist), two load cases. */
export function mast3d(): TrussModelInput {
  const nodes: TrussModelInput["nodes"] = [];
  const corners = [[1, 1], [-1, 1], [-1, -1], [1, -1]];
  corners.forEach(([sx, sy], k) => nodes.push({ id: `B${k}`, x: 1000 * sx, y: 1000 * sy, z: 0, fixed: ["x", "y", "z"] }));
  corners.forEach(([sx, sy], k) => nodes.push({ id: `M${k}`, x: 600 * sx, y: 600 * sy, z: 2000 }));
  nodes.push({ id: "T", x: 0, y: 0, z: 3500 });
  const members: TrussModelInput["members"] = [];
  const add = (a: string, b: string, group: string) =>
    members.push({ id: `${a}-${b}`, start: a, end: b, material: "steel", area: 500, group });
  for (let k = 0; k < 4; k++) {
    add(`B${k}`, `M${k}`, "legs");
    add(`B${(k + 1) % 4}`, `M${k}`, `brace${k}`);
    add(`M${k}`, `M${(k + 1) % 4}`, "ring");
    add(`M${k}`, "T", "top");
  }
  add("M0", "M2", "cross");
  return {
    ...steelModelHeader("Test mast (3D, shape and sizing)", 3, { tension: 235, compression: 200 }),
    nodes,
    members,
    loadCases: [
      { id: "wind", loads: [{ node: "T", fx: 20000, fz: -50000 }] },
      { id: "side", loads: [{ node: "M1", fy: 15000, fz: -10000 }, { node: "T", fz: -30000 }] },
    ],
    design: {
      objective: "mass",
      formulation: "nested",
      areaBounds: { min: 10, max: 20000 },
      shape: [
        { id: "height", min: -500, max: 1500, moves: [{ node: "T", axis: "z", factor: 1 }] },
        {
          id: "waist", min: -300, max: 300,
          moves: corners.flatMap(([sx, sy], k) => [
            { node: `M${k}`, axis: "x" as const, factor: sx },
            { node: `M${k}`, axis: "y" as const, factor: sy },
          ]),
        },
      ],
      constraints: {
        stress: true,
        displacement: [{ node: "T", axis: "all", limit: 15 }],
        volume: { max: 5e7 },
        buckling: { sectionRatio: 0.5, effectiveLengthFactor: 1 },
      },
      solver: { maxIterations: 300, tolerance: 1e-7 },
    },
  };
}
