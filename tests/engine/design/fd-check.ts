// Central finite differences of a solver problem's own function values against its analytic
// derivatives (the standard check of an adjoint implementation, common practice).
import type { SqpProblem, Row } from "~/engine/sqp/types";

function dense(row: Row, n: number): Float64Array {
  if (row instanceof Float64Array) return row;
  const out = new Float64Array(n);
  row.index.forEach((c, k) => (out[c] += row.value[k]));
  return out;
}

/** Deterministic pseudo-random numbers in [0, 1). */
export function rng(seed: number) {
  let s = seed;
  return () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648);
}

export function checkProblem(sp: SqpProblem, x: Float64Array, h: number) {
  const n = sp.n;
  const rows = Int32Array.from({ length: sp.nIneq ?? 0 }, (_, i) => i);
  const d = sp.derivatives(x, rows);
  const nEq = sp.nEq ?? 0, nIn = sp.nIneq ?? 0;
  let worst = 0;
  const scaleOf = (v: Float64Array) => Math.max(1, ...Array.from(v).map(Math.abs));
  for (let j = 0; j < n; j++) {
    const xp = Float64Array.from(x), xm = Float64Array.from(x);
    xp[j] += h; xm[j] -= h;
    const ep = sp.evaluate(xp), em = sp.evaluate(xm);
    const fd = (ep.f - em.f) / (2 * h);
    worst = Math.max(worst, Math.abs(fd - d.grad[j]) / scaleOf(d.grad));
    for (let r = 0; r < nEq; r++) {
      const row = dense(d.eq![r], n);
      const fdr = (ep.eq![r] - em.eq![r]) / (2 * h);
      worst = Math.max(worst, Math.abs(fdr - row[j]) / scaleOf(row));
    }
    for (let r = 0; r < nIn; r++) {
      const row = dense(d.ineq![r], n);
      const fdr = (ep.ineq![r] - em.ineq![r]) / (2 * h);
      worst = Math.max(worst, Math.abs(fdr - row[j]) / scaleOf(row));
    }
  }
  return worst;
}

