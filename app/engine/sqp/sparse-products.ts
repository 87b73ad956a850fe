// Products that read only the nonzero entries of a vector, in the dense order: a skipped term
// is an exact zero, so the sum has the same bits as the dense loop (decision 0025).
/** Writes the positions of v's nonzero entries among the first n to into, in order; their count. */
export function nonzerosOf(v: Float64Array, n: number, into: Int32Array): number {
  let nnz = 0;
  for (let j = 0; j < n; j++) if (v[j] !== 0) into[nnz++] = j;
  return nnz;
}

/** Row M[offset + j] times v over the listed nonzero positions j of v (ascending). */
export function sparseRowDot(M: Float64Array, offset: number, v: Float64Array, nonzeros: Int32Array, nnz: number): number {
  let s = 0;
  for (let k = 0; k < nnz; k++) {
    const j = nonzeros[k];
    s += M[offset + j] * v[j];
  }
  return s;
}
