// Lower-triangular Cholesky factor L (S = L L') of a matrix that grows and shrinks one
// row/column at a time: append in O(k^2) from a forward solve, delete any row/column in O(k^2)
// with Givens rotations. The dual active-set QP keeps its Schur complement N'HN this way.

export class GrowingCholesky {
  private rows: Float64Array[] = [];

  get size(): number {
    return this.rows.length;
  }

  /** y = L^-1 w */
  forward(w: ArrayLike<number>): Float64Array {
    const k = this.rows.length;
    const y = new Float64Array(k);
    for (let i = 0; i < k; i++) {
      const r = this.rows[i];
      let s = w[i];
      for (let j = 0; j < i; j++) s -= r[j] * y[j];
      y[i] = s / r[i];
    }
    return y;
  }

  /** x = L^-T y */
  backward(y: ArrayLike<number>): Float64Array {
    const k = this.rows.length;
    const x = Float64Array.from(y as ArrayLike<number>);
    for (let i = k - 1; i >= 0; i--) {
      x[i] /= this.rows[i][i];
      const xi = x[i];
      const r = this.rows[i];
      for (let j = 0; j < i; j++) x[j] -= r[j] * xi;
    }
    return x;
  }

  /** Solve S x = w. */
  solve(w: ArrayLike<number>): Float64Array {
    return this.backward(this.forward(w));
  }

  /** Append a row/column whose off-diagonal part gives y = L^-1 w and whose new pivot is d (> 0). */
  append(y: Float64Array, d: number): void {
    const k = this.rows.length;
    const r = new Float64Array(k + 1);
    r.set(y.subarray(0, k));
    r[k] = d;
    this.rows.push(r);
  }

  /** Delete row/column `pos` of S, keeping L lower triangular. */
  remove(pos: number): void {
    const rows = this.rows;
    rows.splice(pos, 1);
    const k = rows.length;
    for (let j = pos; j < k; j++) {
      const a = rows[j][j];
      const b = rows[j][j + 1];
      const h = Math.hypot(a, b);
      if (h > 0) {
        const c = a / h;
        const s = b / h;
        for (let i = j; i < k; i++) {
          const ri = rows[i];
          const x = ri[j];
          const z = ri[j + 1];
          ri[j] = c * x + s * z;
          ri[j + 1] = -s * x + c * z;
        }
      }
      rows[j] = rows[j].subarray(0, j + 1);
    }
  }

  /** L L' + w w' in O(k^2) (rotations; always succeeds). w is overwritten. */
  rankOneUpdate(w: Float64Array): void {
    const rows = this.rows;
    const k = rows.length;
    for (let c = 0; c < k; c++) {
      const lcc = rows[c][c];
      const r = Math.hypot(lcc, w[c]);
      const cs = r / lcc;
      const sn = w[c] / lcc;
      rows[c][c] = r;
      for (let i = c + 1; i < k; i++) {
        const lic = (rows[i][c] + sn * w[i]) / cs;
        rows[i][c] = lic;
        w[i] = cs * w[i] - sn * lic;
      }
    }
  }

  /** L L' - w w' in O(k^2); false (factor then unusable) if the result is not positive definite. */
  rankOneDowndate(w: Float64Array): boolean {
    const rows = this.rows;
    const k = rows.length;
    for (let c = 0; c < k; c++) {
      const lcc = rows[c][c];
      const r2 = lcc * lcc - w[c] * w[c];
      if (!(r2 > 1e-14 * lcc * lcc)) return false;
      const r = Math.sqrt(r2);
      const cs = r / lcc;
      const sn = w[c] / lcc;
      rows[c][c] = r;
      for (let i = c + 1; i < k; i++) {
        const lic = (rows[i][c] - sn * w[i]) / cs;
        rows[i][c] = lic;
        w[i] = cs * w[i] - sn * lic;
      }
    }
    return true;
  }

  clear(): void {
    this.rows = [];
  }

  /** L L' reconstructed (for tests). */
  toDense(): number[][] {
    const k = this.rows.length;
    const out: number[][] = [];
    for (let i = 0; i < k; i++) {
      out.push([]);
      for (let j = 0; j < k; j++) {
        let s = 0;
        for (let m = 0; m <= Math.min(i, j); m++) s += this.rows[i][m] * this.rows[j][m];
        out[i].push(s);
      }
    }
    return out;
  }
}
