// Gaussian elimination with partial pivoting for the small (2m x 2m) symmetric indefinite
// middle matrix of the limited-memory inverse; row-major, factor once, solve many times.
export class SmallLu {
  private readonly a: Float64Array;
  private readonly piv: Int32Array;
  readonly singular: boolean;

  constructor(matrix: Float64Array, readonly k: number) {
    const a = (this.a = Float64Array.from(matrix));
    const piv = (this.piv = new Int32Array(k));
    let singular = false;
    let scale = 0;
    for (let i = 0; i < k * k; i++) scale = Math.max(scale, Math.abs(a[i]));
    for (let c = 0; c < k; c++) {
      let p = c;
      for (let i = c + 1; i < k; i++) if (Math.abs(a[i * k + c]) > Math.abs(a[p * k + c])) p = i;
      piv[c] = p;
      if (p !== c) for (let j = 0; j < k; j++) [a[c * k + j], a[p * k + j]] = [a[p * k + j], a[c * k + j]];
      const d = a[c * k + c];
      if (!(Math.abs(d) > 1e-14 * scale)) {
        singular = true;
        continue;
      }
      for (let i = c + 1; i < k; i++) {
        const f = (a[i * k + c] /= d);
        if (f !== 0) for (let j = c + 1; j < k; j++) a[i * k + j] -= f * a[c * k + j];
      }
    }
    this.singular = singular;
  }

  solve(b: Float64Array): Float64Array {
    const { a, k, piv } = this;
    const x = Float64Array.from(b);
    for (let c = 0; c < k; c++) if (piv[c] !== c) [x[c], x[piv[c]]] = [x[piv[c]], x[c]];
    for (let i = 0; i < k; i++) for (let j = 0; j < i; j++) x[i] -= a[i * k + j] * x[j];
    for (let i = k - 1; i >= 0; i--) {
      for (let j = i + 1; j < k; j++) x[i] -= a[i * k + j] * x[j];
      x[i] /= a[i * k + i];
    }
    return x;
  }
}
