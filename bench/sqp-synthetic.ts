// Synthetic large sizing-like problem for the SQP benchmark (invented, deterministic):
// minimize sum_j w_j x_j over x_j in [0.05, 10] subject to m "utilization" rows
// sum_{k in row i} a_ik / x_k - 1 <= 0, each row touching `perRow` variables. Reciprocal
// terms mimic stress ~ force/area; most rows are far from active at the optimum.
import type { SqpProblem } from "../app/engine/sqp";

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

export function syntheticSizing(n: number, m: number, perRow = 4, seed = 7): SqpProblem {
  const rand = lcg(seed);
  const w = Float64Array.from({ length: n }, () => 0.5 + rand());
  const idx: Int32Array[] = [];
  const coef: Float64Array[] = [];
  for (let i = 0; i < m; i++) {
    const set = new Set<number>();
    set.add(i % n);
    while (set.size < perRow) set.add(Math.floor(rand() * n));
    const ix = Int32Array.from([...set].sort((a, b) => a - b));
    idx.push(ix);
    // a few rows are demanding, most are light
    const level = rand() < 0.3 ? 0.4 : 0.02;
    coef.push(Float64Array.from(ix, () => level * (0.5 + rand())));
  }
  return {
    n, nIneq: m,
    x0: new Array(n).fill(1),
    lower: new Array(n).fill(0.05),
    upper: new Array(n).fill(10),
    evaluate(x) {
      let f = 0;
      for (let j = 0; j < n; j++) f += w[j] * x[j];
      const ineq = new Float64Array(m);
      for (let i = 0; i < m; i++) {
        let s = 0;
        const ix = idx[i], a = coef[i];
        for (let k = 0; k < ix.length; k++) s += a[k] / x[ix[k]];
        ineq[i] = s - 1;
      }
      return { f, ineq };
    },
    derivatives(x, rows) {
      return {
        grad: Float64Array.from(w),
        ineq: Array.from(rows, (i) => {
          const ix = idx[i], a = coef[i];
          return { index: ix, value: Float64Array.from(ix, (j, k) => -a[k] / (x[j] * x[j])) };
        }),
      };
    },
  };
}
