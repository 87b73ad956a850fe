// The sparse kernels against dense references: ml-matrix's Cholesky (a reference library) and
// the known property of Cuthill-McKee on a path graph (bandwidth 1, common practice).
import { CholeskyDecomposition, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { csrFromTriplets, csrGet, csrMultiply } from "~/engine/truss/sparse/csr";
import { graphFromEdges, reverseCuthillMcKee } from "~/engine/truss/sparse/ordering";
import { choleskyInPlace, choleskySolveInPlace, SkylineMatrix } from "~/engine/truss/sparse/skyline";

function rng(seed: number) {
  let x = seed;
  return () => ((x = (x * 1103515245 + 12345) % 2147483648) / 2147483648);
}

/** A random SPD matrix with a random skyline: B B^T + n I restricted to the envelope pattern. */
function randomSkyline(n: number, seed: number): { sky: SkylineMatrix; dense: Matrix } {
  const r = rng(seed);
  const first = new Int32Array(n);
  for (let i = 0; i < n; i++) first[i] = Math.max(0, i - Math.floor(r() * 8));
  // group-like runs of equal starts, as a node's three dofs produce
  for (let i = 1; i < n; i += 3) { first[i] = Math.min(first[i - 1], i); if (i + 1 < n) first[i + 1] = first[i]; }
  const dense = new Matrix(n, n);
  const sky = new SkylineMatrix(first);
  for (let i = 0; i < n; i++) {
    for (let j = first[i]; j < i; j++) {
      const v = r() - 0.5;
      dense.set(i, j, v); dense.set(j, i, v); sky.add(i, j, v);
    }
    dense.set(i, i, n); sky.add(i, i, n);
  }
  return { sky, dense };
}

describe("skyline Cholesky", () => {
  it("matches ml-matrix's dense Cholesky factor and solve", () => {
    for (const seed of [1, 2, 3]) {
      const n = 40;
      const { sky, dense } = randomSkyline(n, seed);
      const chol = new CholeskyDecomposition(dense);
      expect(chol.isPositiveDefinite()).toBe(true);
      expect(choleskyInPlace(sky)).toHaveLength(0);
      const Lref = chol.lowerTriangularMatrix;
      for (let i = 0; i < n; i++) for (let j = sky.first[i]; j <= i; j++) expect(Math.abs(sky.get(i, j) - Lref.get(i, j))).toBeLessThan(1e-12);
      const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i));
      const x = b.slice();
      choleskySolveInPlace(sky, x);
      const xr = chol.solve(Matrix.columnVector(Array.from(b))).to1DArray();
      for (let i = 0; i < n; i++) expect(Math.abs(x[i] - xr[i])).toBeLessThan(1e-12);
    }
  });

  it("a singular matrix gives a zero pivot whose mode A v = 0", () => {
    // graph Laplacian of a path: singular, null vector all ones
    const n = 7;
    const first = Int32Array.from({ length: n }, (_, i) => Math.max(0, i - 1));
    const sky = new SkylineMatrix(first);
    const dense = new Matrix(n, n);
    for (let i = 0; i + 1 < n; i++) {
      for (const [a, b, v] of [[i, i, 1], [i + 1, i + 1, 1], [i + 1, i, -1]] as const) { sky.add(a, b, v); dense.set(a, b, dense.get(a, b) + v); if (a !== b) dense.set(b, a, dense.get(b, a) + v); }
    }
    const zeros = choleskyInPlace(sky);
    expect(zeros).toHaveLength(1);
    expect(zeros[0].row).toBe(n - 1);
    const v = zeros[0].mode;
    const Av = dense.mmul(Matrix.columnVector(Array.from(v))).to1DArray();
    for (const x of Av) expect(Math.abs(x)).toBeLessThan(1e-12);
    for (const x of v) expect(x).toBeCloseTo(1, 12);
  });
});

describe("reverse Cuthill-McKee", () => {
  it("numbers a shuffled path graph with bandwidth 1", () => {
    const n = 50;
    const perm = Array.from({ length: n }, (_, i) => i);
    const r = rng(9);
    for (let i = n - 1; i > 0; i--) { const j = Math.floor(r() * (i + 1)); [perm[i], perm[j]] = [perm[j], perm[i]]; }
    const a = Int32Array.from({ length: n - 1 }, (_, i) => perm[i]);
    const b = Int32Array.from({ length: n - 1 }, (_, i) => perm[i + 1]);
    const order = reverseCuthillMcKee(graphFromEdges(n, a, b));
    const pos = new Int32Array(n);
    order.forEach((v, k) => (pos[v] = k));
    expect(new Set(order).size).toBe(n);
    for (let e = 0; e < n - 1; e++) expect(Math.abs(pos[a[e]] - pos[b[e]])).toBe(1);
  });

  it("covers every vertex of a graph with several components", () => {
    const order = reverseCuthillMcKee(graphFromEdges(6, Int32Array.from([0, 2, 4]), Int32Array.from([1, 3, 5])));
    expect([...order].sort()).toEqual([0, 1, 2, 3, 4, 5]);
  });
});

describe("CSR", () => {
  it("sums duplicate triplets, multiplies and looks up", () => {
    const A = csrFromTriplets(3, 3, Int32Array.from([0, 0, 1, 2, 0]), Int32Array.from([0, 2, 1, 2, 0]), Float64Array.from([1, 2, 3, 4, 5]));
    expect(csrGet(A, 0, 0)).toBe(6);
    expect(csrGet(A, 1, 0)).toBe(0);
    expect(Array.from(csrMultiply(A, [1, 1, 1]))).toEqual([8, 3, 4]);
  });
});
