// The solver's linear algebra checked by reconstruction (the habit of mljs/matrix tests: verify
// L L' = A, H B = I, and so on, instead of trusting outputs) and against closed-form QPs.
import { describe, expect, it } from "vitest";
import { DenseBfgs, GrowingCholesky, LimitedBfgs, solveQp } from "~/engine/sqp";
import type { HessianApprox } from "~/engine/sqp";
import { leastSquaresMultipliers } from "~/engine/sqp/least-squares-multipliers";
import type { QpRow } from "~/engine/sqp/rows";

function lcg(seed: number) {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296) * 2 - 1;
}

function spd(k: number, rand: () => number): number[][] {
  const M = Array.from({ length: k }, () => Array.from({ length: k }, rand));
  return M.map((_, i) => M.map((_, j) => M[i].reduce((s, v, t) => s + v * M[j][t], 0) + (i === j ? k : 0)));
}

const maxDiff = (a: number[][], b: number[][]) => Math.max(...a.flatMap((r, i) => r.map((v, j) => Math.abs(v - b[i][j]))));

describe("GrowingCholesky", () => {
  it("append, remove, rank-one update and downdate reproduce S = L L'", () => {
    const rand = lcg(3);
    const A = spd(7, rand);
    const c = new GrowingCholesky();
    for (let i = 0; i < 7; i++) {
      const y = c.forward(A[i].slice(0, i));
      const d = Math.sqrt(A[i][i] - y.reduce((s, v) => s + v * v, 0));
      c.append(y, d);
    }
    expect(maxDiff(c.toDense(), A)).toBeLessThan(1e-12);
    // delete row/column 2
    c.remove(2);
    const B = A.filter((_, i) => i !== 2).map((r) => r.filter((_, j) => j !== 2));
    expect(maxDiff(c.toDense(), B)).toBeLessThan(1e-12);
    // + w w', then - w w' back
    const w = Array.from({ length: 6 }, rand);
    const plus = B.map((r, i) => r.map((v, j) => v + w[i] * w[j]));
    c.rankOneUpdate(Float64Array.from(w));
    expect(maxDiff(c.toDense(), plus)).toBeLessThan(1e-12);
    expect(c.rankOneDowndate(Float64Array.from(w))).toBe(true);
    expect(maxDiff(c.toDense(), B)).toBeLessThan(1e-11);
    // solve against the matrix
    const x = c.solve(Float64Array.from([1, 2, 3, 4, 5, 6]));
    B.forEach((r, i) => expect(r.reduce((s, v, j) => s + v * x[j], 0)).toBeCloseTo(i + 1, 10));
  });

  it("a downdate that would lose positive definiteness is refused", () => {
    const c = new GrowingCholesky();
    c.append(new Float64Array(0), 1);
    expect(c.rankOneDowndate(Float64Array.of(1.5))).toBe(false);
  });
});

function denseOf(h: HessianApprox, n: number, which: "B" | "H"): number[][] {
  return Array.from({ length: n }, (_, j) => {
    const e = new Float64Array(n);
    e[j] = 1;
    const o = new Float64Array(n);
    if (which === "B") h.applyB(e, o);
    else h.applyH(e, o);
    return Array.from(o);
  });
}

function invert(M: number[][]): number[][] {
  const n = M.length;
  const A = M.map((r, i) => [...r, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let i = c + 1; i < n; i++) if (Math.abs(A[i][c]) > Math.abs(A[p][c])) p = i;
    [A[c], A[p]] = [A[p], A[c]];
    const d = A[c][c];
    A[c] = A[c].map((v) => v / d);
    for (let i = 0; i < n; i++) if (i !== c) {
      const f = A[i][c];
      A[i] = A[i].map((v, j) => v - f * A[c][j]);
    }
  }
  return A.map((r) => r.slice(n));
}

describe.each([
  ["dense BFGS", (n: number) => new DenseBfgs(n)],
  ["limited-memory BFGS (3 pairs)", (n: number) => new LimitedBfgs(n, 3)],
])("%s", (_name, make) => {
  const n = 6;
  const build = () => {
    const h = make(n);
    const rand = lcg(11);
    for (let k = 0; k < 5; k++) {
      const s = Float64Array.from({ length: n }, rand);
      // y from a fixed indefinite "Hessian" so that Powell's damping is exercised
      const y = Float64Array.from(s, (v, i) => (i % 3 === 0 ? -0.5 : 2 + i) * v + 0.1 * s[(i + 1) % n]);
      h.update(s, y);
    }
    return h;
  };

  it("H is the inverse of B (H B = I) and B stays symmetric positive definite", () => {
    const h = build();
    const B = denseOf(h, n, "B");
    const H = denseOf(h, n, "H");
    const HB = H.map((r) => B[0].map((_, j) => r.reduce((s, v, t) => s + v * B[t][j], 0)));
    expect(maxDiff(HB, HB.map((r, i) => r.map((_, j) => (i === j ? 1 : 0))))).toBeLessThan(1e-9);
    expect(maxDiff(B, B.map((r, i) => r.map((_, j) => B[j][i])))).toBeLessThan(1e-9);
    const c = new GrowingCholesky(); // Cholesky succeeds only for a positive definite matrix
    for (let i = 0; i < n; i++) {
      const y = c.forward(B[i].slice(0, i));
      const d2 = B[i][i] - y.reduce((s, v) => s + v * v, 0);
      expect(d2).toBeGreaterThan(0);
      c.append(y, Math.sqrt(d2));
    }
  });

  it("the reduced inverse equals inv(B_FF) after fixing and freeing variables", () => {
    const h = build();
    const B = denseOf(h, n, "B");
    const red = h.reduced();
    red.fix(1);
    red.fix(4);
    red.fix(2);
    red.free(4);
    expectInverseOfFreeBlock(red, B, [0, 3, 4, 5], n);
  });
});

/** The reduced inverse applied to each free unit vector: the column of inv(B_FF), and zero on the fixed variables. */
function expectInverseOfFreeBlock(red: ReturnType<DenseBfgs["reduced"]>, B: number[][], free: number[], n: number) {
  const inv = invert(free.map((i) => free.map((j) => B[i][j])));
  for (let a = 0; a < free.length; a++) {
    const e = new Float64Array(n);
    e[free[a]] = 1;
    const o = new Float64Array(n);
    red.apply(e, o);
    for (let b = 0; b < free.length; b++) expect(o[free[b]]).toBeCloseTo(inv[b][a], 9);
    for (let j = 0; j < n; j++) if (!free.includes(j)) expect(o[j]).toBe(0);
  }
}

describe("dense BFGS: the reduced inverse's shared block", () => {
  // The dense matrix lends one n^2 block to its newest reduced inverse (dense-bfgs.ts); a warm
  // start that fixes many variables at once rebuilds it from B_FF. Reference: inv(B_FF) by
  // Gauss-Jordan elimination above (textbook, common practice).
  it("fixMany gives inv(B_FF), and an older reduced inverse refuses to work once a newer one exists", () => {
    const n = 6;
    const h = new DenseBfgs(n);
    const rand = lcg(5);
    for (let k = 0; k < 4; k++) {
      const s = Float64Array.from({ length: n }, rand);
      h.update(s, Float64Array.from(s, (v, i) => (1 + i) * v));
    }
    const B = denseOf(h, n, "B");
    const older = h.reduced();
    older.fixMany!([0, 3]);
    const red = h.reduced();
    red.fixMany!([1, 4, 5]);
    expectInverseOfFreeBlock(red, B, [0, 2, 3], n);
    expect(() => older.apply(new Float64Array(n), new Float64Array(n))).toThrow(/newer one/);
    expect(() => older.fix(2)).toThrow(/newer one/);
  });
});

describe("solveQp (dual active set) on closed-form problems", () => {
  const identity = (n: number) => {
    const h = new DenseBfgs(n);
    return h;
  };
  it("projection of (3, 3) onto {x + y <= 2, 0 <= x <= 0.5}: (0.5, 1.5)", () => {
    // min 1/2|s|^2 - (3,3)'s  <=>  nearest point to (3,3); closed form (0.5, 1.5)
    const r = solveQp({
      dim: 2, base: 2, hessian: identity(2), g: Float64Array.of(-3, -3),
      eq: [], eqRhs: new Float64Array(0),
      ineq: [{ idx: null, val: Float64Array.of(1, 1), extra: 0 }], ineqRhs: Float64Array.of(2),
      lower: Float64Array.of(0, -Infinity), upper: Float64Array.of(0.5, Infinity),
    });
    expect(r.status).toBe("optimal");
    expect(r.s[0]).toBeCloseTo(0.5, 12);
    expect(r.s[1]).toBeCloseTo(1.5, 12);
    // KKT: s - (3,3) + l*(1,1) + u*(1,0) = 0 -> l = 1.5, u = 1
    expect(r.ineq[0]).toBeCloseTo(1.5, 12);
    expect(r.upper[0]).toBeCloseTo(1, 12);
  });

  it("an equality with an incompatible bound is reported infeasible", () => {
    const r = solveQp({
      dim: 1, base: 1, hessian: identity(1), g: Float64Array.of(0),
      eq: [{ idx: null, val: Float64Array.of(1), extra: 0 }], eqRhs: Float64Array.of(2),
      ineq: [], ineqRhs: new Float64Array(0),
      lower: Float64Array.of(-1), upper: Float64Array.of(1),
    });
    expect(r.status).toBe("infeasible");
  });

  it("warm start gives the same solution as a cold start", () => {
    const mk = (warm?: number[]) =>
      solveQp({
        dim: 3, base: 3, hessian: identity(3), g: Float64Array.of(-1, -2, -3),
        eq: [{ idx: Int32Array.of(0, 1, 2), val: Float64Array.of(1, 1, 1), extra: 0 }], eqRhs: Float64Array.of(1),
        ineq: [{ idx: Int32Array.of(2), val: Float64Array.of(1), extra: 0 }], ineqRhs: Float64Array.of(0.5),
        lower: Float64Array.of(0, 0, 0), upper: Float64Array.of(Infinity, Infinity, Infinity), warm,
      });
    const cold = mk();
    const warm = mk(cold.active);
    // closed form: s3 = 0.5 (row active), s1 + s2 = 0.5, s2 - s1 = 1 -> s1 = 0 at its bound, s2 = 0.5
    expect(cold.s[2]).toBeCloseTo(0.5, 12);
    expect(Array.from(warm.s).map((v) => v.toFixed(12))).toEqual(Array.from(cold.s).map((v) => v.toFixed(12)));
  });
});

describe("leastSquaresMultipliers (Householder QR of A', ml-matrix)", () => {
  const dense = (...v: number[]): QpRow => ({ idx: null, val: Float64Array.from(v), extra: 0 });
  const unit = (j: number, sign: number): QpRow => ({ idx: Int32Array.of(j), val: Float64Array.of(sign), extra: 0 });

  it("solves stationarity exactly when g lies in the rows' span", () => {
    // g = -(2 a1 + 3 a2): the multipliers are (2, 3) (closed form)
    const a1 = [1, 0, 1], a2 = [0, 1, 1];
    const g = Float64Array.from([0, 1, 2].map((j) => -(2 * a1[j] + 3 * a2[j])));
    const lam = leastSquaresMultipliers(g, [dense(...a1), dense(...a2)], 3);
    expect(lam[0]).toBeCloseTo(2, 12);
    expect(lam[1]).toBeCloseTo(3, 12);
  });

  it("gives a repeated row and a multiple of a row multiplier 0 instead of failing", () => {
    const a = [1, 2, 0];
    const g = Float64Array.of(-1, -2, 0);
    const lam = leastSquaresMultipliers(g, [dense(...a), dense(...a), dense(2, 4, 0)], 3);
    expect(Array.from(lam)).toEqual([expect.closeTo(1, 12), 0, 0]);
  });

  it("more rows than variables: the rows after a spanning set get multiplier 0", () => {
    // in 2D, rows (1,0), (1,0) again, (0,1), (1,1): the second and the fourth are dependent
    const g = Float64Array.of(-3, -4);
    const lam = leastSquaresMultipliers(g, [dense(1, 0), dense(1, 0), dense(0, 1), dense(1, 1)], 2);
    expect(Array.from(lam)).toEqual([expect.closeTo(3, 12), 0, expect.closeTo(4, 12), 0]);
  });

  it("a bound row takes its variable's residual exactly, the rest by least squares", () => {
    // min ||g + l1 a + nu e_0||: nu fits component 0, l1 = -(g1 + g2)/2 over the free variables
    const g = Float64Array.of(5, 1, 3);
    const lam = leastSquaresMultipliers(g, [dense(1, 1, 1), unit(0, -1)], 3);
    expect(lam[0]).toBeCloseTo(-2, 12);
    // stationarity in x0: g0 + l1 - nu = 0
    expect(lam[1]).toBeCloseTo(5 - 2, 12);
  });

  it("matches the normal equations on a well-conditioned random system (reconstruction check)", () => {
    let seed = 7;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) * 2 - 1;
    const n = 12, m = 5;
    const rows = Array.from({ length: m }, () => dense(...Array.from({ length: n }, rnd)));
    const g = Float64Array.from({ length: n }, rnd);
    const lam = leastSquaresMultipliers(g, rows, n);
    // optimality of least squares: A (g + A' lam) = 0
    const r = Float64Array.from(g);
    rows.forEach((row, i) => row.val.forEach((v, j) => (r[j] += lam[i] * v)));
    for (const row of rows) expect(Math.abs(row.val.reduce((s, v, j) => s + v * r[j], 0))).toBeLessThan(1e-12);
  });
});
