// First multiplier guess: least squares on stationarity, min ||g + A' lambda||, for the rows
// active at the start point, through a Householder QR of A' (ml-matrix) rather than the normal
// equations A A' lambda = -A g, whose condition number is the square of A's.
//
// Bound rows (one unit entry) are not put into the QR: a bound multiplier can match its
// variable's component of g + A' lambda exactly, so the least-squares problem splits into the
// general rows restricted to the variables without an active bound, then one division per bound.
//
// Redundant rows (an equality repeated, two limits with the same gradient): a column of A'
// whose part orthogonal to the columns before it is below DEPENDENT times its length — the
// diagonal entry of R — is dependent; it gets multiplier 0 and the QR is made again without it,
// so redundant equalities neither break the solve nor share out arbitrary multipliers.
import { Matrix, QrDecomposition } from "ml-matrix";
import type { QpRow } from "./rows";

/** Relative size of R's diagonal below which a row counts as dependent on the rows before it. */
export const DEPENDENT = 1e-10;

function unitEntry(r: QpRow): { j: number; v: number } | null {
  if (r.idx !== null) return r.idx.length === 1 && r.val[0] !== 0 ? { j: r.idx[0], v: r.val[0] } : null;
  let found: { j: number; v: number } | null = null;
  for (let j = 0; j < r.val.length; j++) {
    if (r.val[j] === 0) continue;
    if (found) return null;
    found = { j, v: r.val[j] };
  }
  return found;
}

/**
 * Columns of M kept by the R-diagonal test, in order. QR takes at most as many columns as M
 * has rows; every column it flags is dependent on the kept ones before it, so all flagged go
 * at once and the next columns move up. A full set of independent columns spans every
 * direction, so the columns after it are dependent too.
 */
function independentColumns(m: Matrix, columns: number[]): number[] {
  let candidates = columns.slice();
  for (;;) {
    const take = candidates.slice(0, m.rows);
    if (take.length === 0) return [];
    const sub = m.subMatrixColumn(take);
    const r = new QrDecomposition(sub).upperTriangularMatrix;
    const flagged = new Set<number>();
    for (let k = 0; k < take.length; k++) {
      let norm = 0;
      for (let i = 0; i < m.rows; i++) norm += sub.get(i, k) ** 2;
      if (!(Math.abs(r.get(k, k)) > DEPENDENT * Math.sqrt(norm))) flagged.add(take[k]);
    }
    if (flagged.size === 0) return take;
    candidates = candidates.filter((c) => !flagged.has(c));
  }
}

export function leastSquaresMultipliers(g: Float64Array, rows: QpRow[], n: number): Float64Array {
  const lam = new Float64Array(rows.length);
  const bounded = new Uint8Array(n);
  const bounds: { row: number; j: number; v: number }[] = [];
  const general: number[] = [];
  rows.forEach((r, i) => {
    const u = unitEntry(r);
    if (u && !bounded[u.j]) {
      bounded[u.j] = 1;
      bounds.push({ row: i, ...u });
    } else if (!u) general.push(i);
    // a second bound row on the same variable is dependent on the first: multiplier 0
  });
  const free: number[] = [];
  for (let j = 0; j < n; j++) if (!bounded[j]) free.push(j);
  const at = new Int32Array(n).fill(-1);
  free.forEach((j, f) => (at[j] = f));

  // residual r = g + A' lambda, completed by the bounds below
  const residual = Float64Array.from(g.subarray(0, n));
  if (general.length > 0 && free.length > 0) {
    const a = Matrix.zeros(free.length, general.length);
    general.forEach((i, k) => {
      const r = rows[i];
      if (r.idx === null) {
        for (let j = 0; j < n; j++) if (at[j] >= 0 && r.val[j] !== 0) a.set(at[j], k, a.get(at[j], k) + r.val[j]);
      } else {
        for (let t = 0; t < r.idx.length; t++) if (at[r.idx[t]] >= 0) a.set(at[r.idx[t]], k, a.get(at[r.idx[t]], k) + r.val[t]);
      }
    });
    const kept = independentColumns(a, general.map((_, k) => k));
    if (kept.length > 0) {
      const rhs = Matrix.columnVector(free.map((j) => -g[j]));
      const sol = new QrDecomposition(a.subMatrixColumn(kept)).solve(rhs).to1DArray();
      kept.forEach((k, t) => {
        const value = Number.isFinite(sol[t]) ? sol[t] : 0;
        const i = general[k];
        lam[i] = value;
        const r = rows[i];
        if (r.idx === null) for (let j = 0; j < n; j++) residual[j] += value * r.val[j];
        else for (let q = 0; q < r.idx.length; q++) residual[r.idx[q]] += value * r.val[q];
      });
    }
  }
  // (every variable on a bound: the general rows' multipliers are not determined and stay 0;
  // the bounds take the whole gradient)
  for (const b of bounds) lam[b.row] = -residual[b.j] / b.v;
  return lam;
}
