// Compressed sparse row matrix: the exchange form for stiffness matrices handed to other
// packages (the simultaneous formulation needs K's entries, not a factorization).

export interface CsrMatrix {
  rows: number;
  cols: number;
  rowPtr: Int32Array; // length rows + 1
  colIdx: Int32Array; // ascending within each row
  values: Float64Array;
}

/**
 * Builds a CSR matrix from coordinate triplets; entries at the same position are summed.
 * count limits how many of the triplet arrays' entries are used.
 */
export function csrFromTriplets(rows: number, cols: number, ti: Int32Array, tj: Int32Array, tv: Float64Array, count = ti.length): CsrMatrix {
  const cnt = new Int32Array(rows + 1);
  for (let t = 0; t < count; t++) cnt[ti[t] + 1]++;
  for (let r = 0; r < rows; r++) cnt[r + 1] += cnt[r];
  const pos = cnt.slice(0, rows);
  const cj = new Int32Array(count);
  const cv = new Float64Array(count);
  for (let t = 0; t < count; t++) {
    const p = pos[ti[t]]++;
    cj[p] = tj[t];
    cv[p] = tv[t];
  }
  // sort each row by column and merge duplicates
  const rowPtr = new Int32Array(rows + 1);
  const colIdx = new Int32Array(count);
  const values = new Float64Array(count);
  let k = 0;
  const idx: number[] = [];
  for (let r = 0; r < rows; r++) {
    const a = cnt[r];
    const b = cnt[r + 1];
    idx.length = 0;
    for (let p = a; p < b; p++) idx.push(p);
    idx.sort((p, q) => cj[p] - cj[q]);
    let last = -1;
    for (const p of idx) {
      if (cj[p] === last) values[k - 1] += cv[p];
      else {
        colIdx[k] = cj[p];
        values[k] = cv[p];
        last = cj[p];
        k++;
      }
    }
    rowPtr[r + 1] = k;
  }
  return { rows, cols, rowPtr, colIdx: colIdx.slice(0, k), values: values.slice(0, k) };
}

/** y = A x */
export function csrMultiply(a: CsrMatrix, x: ArrayLike<number>, y: Float64Array = new Float64Array(a.rows)): Float64Array {
  for (let r = 0; r < a.rows; r++) {
    let s = 0;
    for (let p = a.rowPtr[r]; p < a.rowPtr[r + 1]; p++) s += a.values[p] * x[a.colIdx[p]];
    y[r] = s;
  }
  return y;
}

/** Entry (r, c), 0 when not stored. */
export function csrGet(a: CsrMatrix, r: number, c: number): number {
  let lo = a.rowPtr[r];
  let hi = a.rowPtr[r + 1] - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    const v = a.colIdx[mid];
    if (v === c) return a.values[mid];
    if (v < c) lo = mid + 1;
    else hi = mid - 1;
  }
  return 0;
}
