// Small model builders shared by the truss engine tests (invented geometry, common units).
import type { TrussModel } from "~/engine/truss";

type N = [id: string, x: number, y: number, z?: number, fixed?: ("x" | "y" | "z")[]];
type M = [id: string, start: string, end: string, area?: number];

export function model(dimension: 2 | 3, nodes: N[], members: M[], loadCases: { id: string; loads: { node: string; fx?: number; fy?: number; fz?: number }[] }[], opts: { E?: number; density?: number; area?: number } = {}): TrussModel {
  return {
    format: "strutwise.truss",
    version: 1,
    name: "test model",
    units: { length: "m", force: "kN", mass: "t" },
    dimension,
    materials: [{ id: "steel", E: opts.E ?? 2.1e8, density: opts.density ?? 7.85, allowableTension: 2.35e5, allowableCompression: 2.35e5 }],
    nodes: nodes.map(([id, x, y, z, fixed]) => ({ id, x, y, z: z ?? 0, ...(fixed ? { fixed } : {}) })),
    members: members.map(([id, start, end, area]) => ({ id, start, end, material: "steel", area: area ?? opts.area ?? 0.001 })),
    loadCases: loadCases.map((l) => ({ ...l })),
  };
}

/** A box lattice nx * ny * nz cells: chords on every grid line, one diagonal per face and per cell. */
export function latticeModel(nx: number, ny: number, nz: number, opts: { span?: number; seed?: number } = {}): TrussModel {
  const h = opts.span ?? 1;
  const id = (i: number, j: number, k: number) => `n${i}_${j}_${k}`;
  const nodes: N[] = [];
  for (let k = 0; k <= nz; k++)
    for (let j = 0; j <= ny; j++)
      for (let i = 0; i <= nx; i++) nodes.push([id(i, j, k), i * h, j * h, k * h, k === 0 ? ["x", "y", "z"] : undefined]);
  const members: M[] = [];
  let c = 0;
  const add = (a: string, b: string) => members.push([`m${c++}`, a, b, 0.001 * (1 + ((c * 7919) % 13) / 13)]);
  for (let k = 0; k <= nz; k++)
    for (let j = 0; j <= ny; j++)
      for (let i = 0; i <= nx; i++) {
        if (i < nx) add(id(i, j, k), id(i + 1, j, k));
        if (j < ny) add(id(i, j, k), id(i, j + 1, k));
        if (k < nz) add(id(i, j, k), id(i, j, k + 1));
        if (i < nx && j < ny) add(id(i, j, k), id(i + 1, j + 1, k));
        if (i < nx && k < nz) add(id(i, j, k), id(i + 1, j, k + 1));
        if (j < ny && k < nz) add(id(i, j, k), id(i, j + 1, k + 1));
        if (i < nx && j < ny && k < nz) add(id(i, j, k), id(i + 1, j + 1, k + 1));
      }
  const top: { node: string; fx?: number; fy?: number; fz?: number }[] = [];
  for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) top.push({ node: id(i, j, nz), fx: 1 + ((i + j) % 3), fz: -2 });
  const side: { node: string; fx?: number; fy?: number; fz?: number }[] = [];
  for (let k = 1; k <= nz; k++) side.push({ node: id(nx, ny, k), fy: 5 * k });
  return model(3, nodes, members, [{ id: "LC1", loads: top }, { id: "LC2", loads: side }]);
}
