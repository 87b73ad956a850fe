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
 *
 * Rows come in groups (a node's dofs) that share one skyline start; the off-diagonal blocks
 * are formed group against group, so each stretch of a previous row is read once for up to
 * three rows of the current group (9 running sums at a time instead of 1).
 */
export function choleskyInPlace(m: SkylineMatrix, opts: FactorOptions = {}): ZeroPivot[] {
  const relTol = opts.relTol ?? 1e-10;
  const maxZero = opts.maxZeroPivots ?? 1;
  const { n, first, rowStart, data } = m;
  if (n === 0) return [];
  const groups = rowGroups(m);
  const removed = new Uint8Array(n);
  const zeros: ZeroPivot[] = [];
  const s = new Float64Array(9);
  const nGroups = groups.length - 1;
  for (let gi = 0; gi < nGroups; gi++) {
    const i0 = groups[gi];
    const ni = groups[gi + 1] - i0;
    const fi = first[i0];
    // off-diagonal blocks against earlier groups J, in order
    let gj = groupOf(groups, fi, gi);
    for (; gj < gi; gj++) {
      const j0 = groups[gj];
      const nj = groups[gj + 1] - j0;
      const fj = first[j0];
      const k0 = fi > fj ? fi : fj;
      blockDots(data, rowStart, first, i0, ni, j0, nj, k0, s);
      // finish column by column: the triangular part inside group J
      for (let b = 0; b < nj; b++) {
        const j = j0 + b;
        const bj = rowStart[j] - fj;
        const djj = data[bj + j];
        for (let a = 0; a < ni; a++) {
          const bi = rowStart[i0 + a] - fi;
          if (removed[j]) {
            data[bi + j] = 0;
            continue;
          }
          let v = data[bi + j] - s[a * 3 + b];
          for (let k = j0; k < j; k++) v -= data[bi + k] * data[bj + k];
          data[bi + j] = v / djj;
        }
      }
    }
    // the diagonal block of group I
    for (let a = 0; a < ni; a++) {
      const i = i0 + a;
      const bi = rowStart[i] - fi;
      for (let j = i0; j < i; j++) {
        const bj = rowStart[j] - fi;
        if (removed[j]) {
          data[bi + j] = 0;
          continue;
        }
        let v = data[bi + j];
        for (let k = fi; k < j; k++) v -= data[bi + k] * data[bj + k];
        data[bi + j] = v / data[bj + j];
      }
      const original = data[bi + i];
      let diag = original;
      for (let k = fi; k < i; k++) diag -= data[bi + k] * data[bi + k];
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
  }
  return zeros;
}

/**
 * Boundaries of runs of consecutive rows with the same skyline start (at most 3 rows each).
 * Every row that some skyline starts at begins a run, so a row's stretch never starts inside a run.
 */
function rowGroups(m: SkylineMatrix): Int32Array {
  const startsHere = new Uint8Array(m.n);
  for (let i = 0; i < m.n; i++) startsHere[m.first[i]] = 1;
  const out: number[] = [0];
  let len = 1;
  for (let i = 1; i < m.n; i++) {
    if (m.first[i] === m.first[i - 1] && len < 3 && !startsHere[i]) len++;
    else {
      out.push(i);
      len = 1;
    }
  }
  out.push(m.n);
  return Int32Array.from(out);
}

/** Index of the group containing row r (binary search below group `hi`). */
function groupOf(groups: Int32Array, r: number, hi: number): number {
  let lo = 0;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (groups[mid] <= r) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** s[a*3+b] = sum over k in [k0, j0) of L(i0+a, k) L(j0+b, k). */
function blockDots(data: Float64Array, rowStart: Int32Array, first: Int32Array, i0: number, ni: number, j0: number, nj: number, k0: number, s: Float64Array): void {
  const fi = first[i0];
  const fj = first[j0];
  if (ni === 3 && nj === 3) {
    const a0 = rowStart[i0] - fi, a1 = rowStart[i0 + 1] - fi, a2 = rowStart[i0 + 2] - fi;
    const b0 = rowStart[j0] - fj, b1 = rowStart[j0 + 1] - fj, b2 = rowStart[j0 + 2] - fj;
    let s00 = 0, s01 = 0, s02 = 0, s10 = 0, s11 = 0, s12 = 0, s20 = 0, s21 = 0, s22 = 0;
    for (let k = k0; k < j0; k++) {
      const x0 = data[a0 + k], x1 = data[a1 + k], x2 = data[a2 + k];
      const y0 = data[b0 + k], y1 = data[b1 + k], y2 = data[b2 + k];
      s00 += x0 * y0; s01 += x0 * y1; s02 += x0 * y2;
      s10 += x1 * y0; s11 += x1 * y1; s12 += x1 * y2;
      s20 += x2 * y0; s21 += x2 * y1; s22 += x2 * y2;
    }
    s[0] = s00; s[1] = s01; s[2] = s02; s[3] = s10; s[4] = s11; s[5] = s12; s[6] = s20; s[7] = s21; s[8] = s22;
    return;
  }
  for (let a = 0; a < ni; a++) {
    const ba = rowStart[i0 + a] - fi;
    for (let b = 0; b < nj; b++) {
      const bb = rowStart[j0 + b] - fj;
      let v = 0;
      for (let k = k0; k < j0; k++) v += data[ba + k] * data[bb + k];
      s[a * 3 + b] = v;
    }
  }
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
