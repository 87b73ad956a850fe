// Internal constraint rows in the solver's scaled space. A row is dense (idx === null, val of
// length n) or sparse (idx/val pairs). `extra` is the coefficient of the elastic variable that
// sits at index n of the subproblem when incompatible linearizations are relaxed.
import type { Row } from "./types";

export interface QpRow {
  idx: Int32Array | null;
  val: Float64Array;
  extra: number;
}

export function rowDot(r: QpRow, v: Float64Array, n: number): number {
  let s = 0;
  const { idx, val } = r;
  if (idx === null) s = denseDot(val, v);
  else for (let k = 0; k < idx.length; k++) s += val[k] * v[idx[k]];
  if (r.extra !== 0 && v.length > n) s += r.extra * v[n];
  return s;
}

/**
 * a . v over a's length with four running sums: the dual QP updates every dense row after each
 * of its steps (most of the time on layouts of thousands of members), and one running sum
 * makes each addition wait for the one before it; four measured about 25 % faster there.
 */
function denseDot(a: Float64Array, v: Float64Array): number {
  const n = a.length;
  const n4 = n - (n & 3);
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
  let k = 0;
  for (; k < n4; k += 4) {
    s0 += a[k] * v[k];
    s1 += a[k + 1] * v[k + 1];
    s2 += a[k + 2] * v[k + 2];
    s3 += a[k + 3] * v[k + 3];
  }
  for (; k < n; k++) s0 += a[k] * v[k];
  return s0 + s1 + (s2 + s3);
}

/** out += alpha * r */
export function rowAxpy(r: QpRow, alpha: number, out: Float64Array, n: number): void {
  const { idx, val } = r;
  if (idx === null) for (let k = 0; k < val.length; k++) out[k] += alpha * val[k];
  else for (let k = 0; k < idx.length; k++) out[idx[k]] += alpha * val[k];
  if (r.extra !== 0 && out.length > n) out[n] += alpha * r.extra;
}

export function rowNormInf(r: QpRow): number {
  let m = 0;
  for (let k = 0; k < r.val.length; k++) m = Math.max(m, Math.abs(r.val[k]));
  return m;
}

/** Copies a user row into scaled space: entries times rowScale * varScale[j]. Returns null for a malformed row. */
export function scaleUserRow(row: Row, n: number, rowScale: number, varScale: Float64Array): QpRow | string {
  if (row instanceof Float64Array) {
    if (row.length !== n) return `has ${row.length} entries instead of ${n}`;
    const val = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      const v = row[j];
      if (!Number.isFinite(v)) return `entry for variable ${j} is ${v}`;
      val[j] = v * rowScale * varScale[j];
    }
    return { idx: null, val, extra: 0 };
  }
  if (!row || !(row.index instanceof Int32Array) || !(row.value instanceof Float64Array)) return "is neither a Float64Array nor { index: Int32Array, value: Float64Array }";
  const m = row.index.length;
  if (row.value.length !== m) return "has index and value arrays of different lengths";
  const idx = new Int32Array(m);
  const val = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    const j = row.index[k];
    const v = row.value[k];
    if (j < 0 || j >= n) return `refers to variable index ${j}, outside 0..${n - 1}`;
    if (!Number.isFinite(v)) return `entry for variable ${j} is ${v}`;
    idx[k] = j;
    val[k] = v * rowScale * varScale[j];
  }
  return { idx, val, extra: 0 };
}

/** Unscaled infinity norm of a user row (used once, at the start point, for row scaling). */
export function userRowNormInf(row: Row, varScale: Float64Array): number {
  let m = 0;
  if (row instanceof Float64Array) {
    for (let j = 0; j < row.length; j++) m = Math.max(m, Math.abs(row[j] * varScale[j]));
  } else {
    for (let k = 0; k < row.index.length; k++) m = Math.max(m, Math.abs(row.value[k] * varScale[row.index[k]]));
  }
  return m;
}
