// Symmetric positive (semi)definite matrix in skyline (envelope) storage and its in-place
// Cholesky factorization L L^T. Row i holds columns first[i]..i contiguously, so every inner
// product of the factorization runs over two contiguous stretches of one Float64Array.
//
// A pivot that vanishes relative to the row's original diagonal marks a zero-energy mode
// (a mechanism). The factorization then recovers that mode from the factored leading block,
// takes the dof out of the system and goes on, so several independent mechanisms can be listed.

export interface ZeroPivot {
  /** row (in the skyline's own numbering) whose pivot vanished */
  row: number;
  /** the zero-energy mode: values for rows 0..row, scaled so that entry `row` is 1 */
  mode: Float64Array;
}

export class SkylineMatrix {
  readonly n: number;
  readonly first: Int32Array;
  readonly rowStart: Int32Array; // rowStart[i] = offset of entry (i, first[i]); rowStart[n] = total
  readonly data: Float64Array;

  constructor(first: Int32Array) {
    const n = first.length;
    this.n = n;
    this.first = first;
    this.rowStart = new Int32Array(n + 1);
    for (let i = 0; i < n; i++) {
      if (first[i] > i || first[i] < 0) throw new Error(`skyline row ${i} starts at column ${first[i]}`);
      this.rowStart[i + 1] = this.rowStart[i] + (i - first[i] + 1);
    }
    this.data = new Float64Array(this.rowStart[n]);
  }

  /** Number of stored entries (the profile, diagonal included). */
  get profile(): number {
    return this.rowStart[this.n];
  }

  /** Adds v to entry (i, j); either triangle may be named, the lower one is stored. */
  add(i: number, j: number, v: number): void {
    if (j > i) {
      const t = i;
      i = j;
      j = t;
    }
    this.data[this.rowStart[i] + j - this.first[i]] += v;
  }

  get(i: number, j: number): number {
    if (j > i) {
      const t = i;
      i = j;
      j = t;
    }
    if (j < this.first[i]) return 0;
    return this.data[this.rowStart[i] + j - this.first[i]];
  }
}

export interface FactorOptions {
  /** a pivot at or below relTol times the row's original diagonal counts as zero */
  relTol?: number;
  /** stop after this many zero pivots (default 1) */
  maxZeroPivots?: number;
}

/**
 * Factors the matrix in place (data then holds L). Returns the zero pivots found, in order;
 * an empty list means the matrix was positive definite and the factor is usable.
 */
export function choleskyInPlace(m: SkylineMatrix, opts: FactorOptions = {}): ZeroPivot[] {
  const relTol = opts.relTol ?? 1e-10;
  const maxZero = opts.maxZeroPivots ?? 1;
  const { n, first, rowStart, data } = m;
  const removed = new Uint8Array(n);
  const zeros: ZeroPivot[] = [];
  for (let i = 0; i < n; i++) {
    const fi = first[i];
    const bi = rowStart[i] - fi; // data[bi + k] = L(i, k)
    let diag = data[bi + i];
    const original = diag;
    for (let j = fi; j < i; j++) {
      if (removed[j]) {
        data[bi + j] = 0;
        continue;
      }
      const fj = first[j];
      const bj = rowStart[j] - fj;
      let s = data[bi + j];
      for (let k = fi > fj ? fi : fj; k < j; k++) s -= data[bi + k] * data[bj + k];
      const lij = s / data[bj + j];
      data[bi + j] = lij;
      diag -= lij * lij;
    }
    if (!(diag > relTol * Math.abs(original)) || original <= 0) {
      zeros.push({ row: i, mode: zeroEnergyMode(m, i) });
      removed[i] = 1;
      for (let k = fi; k < i; k++) data[bi + k] = 0;
      data[bi + i] = 1;
      if (zeros.length >= maxZero) return zeros;
      continue;
    }
    data[bi + i] = Math.sqrt(diag);
  }
  return zeros;
}

/** With rows < i factored and row i holding y = L11^-1 k12: mode = [-L11^-T y; 1]. */
function zeroEnergyMode(m: SkylineMatrix, i: number): Float64Array {
  const { first, rowStart, data } = m;
  const x = new Float64Array(i + 1);
  const fi = first[i];
  const bi = rowStart[i] - fi;
  for (let k = fi; k < i; k++) x[k] = data[bi + k];
  for (let j = i - 1; j >= 0; j--) {
    const fj = first[j];
    const bj = rowStart[j] - fj;
    const xj = x[j] / data[bj + j];
    x[j] = xj;
    if (xj !== 0) for (let k = fj; k < j; k++) x[k] -= data[bj + k] * xj;
  }
  for (let k = 0; k < i; k++) x[k] = -x[k];
  x[i] = 1;
  return x;
}

/** Solves L L^T x = b in place with a factored matrix. */
export function choleskySolveInPlace(m: SkylineMatrix, b: Float64Array): void {
  const { n, first, rowStart, data } = m;
  // forward: L y = b (row-oriented)
  for (let i = 0; i < n; i++) {
    const fi = first[i];
    const bi = rowStart[i] - fi;
    let s = b[i];
    for (let k = fi; k < i; k++) s -= data[bi + k] * b[k];
    b[i] = s / data[bi + i];
  }
  // backward: L^T x = y (column-oriented over the rows of L)
  for (let i = n - 1; i >= 0; i--) {
    const fi = first[i];
    const bi = rowStart[i] - fi;
    const xi = b[i] / data[bi + i];
    b[i] = xi;
    if (xi !== 0) for (let k = fi; k < i; k++) b[k] -= data[bi + k] * xi;
  }
}
