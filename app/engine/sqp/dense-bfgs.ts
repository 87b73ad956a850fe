// Dense damped BFGS: keeps B and H = B^-1 explicitly (n^2 each, O(n^2) per update), so the QP
// never factorizes B. First matrix scaled by Shanno and Phua's factor y'y/s'y at the first update.
import { type BlockScratch, DenseReducedInverse } from "./dense-reduced-inverse";
import { type HessianApprox, type ReducedInverse, dot, powellDamped } from "./hessian";
import { nonzerosOf, sparseRowDot } from "./sparse-products";
import { B_COLUMN_PRODUCT_SHARE, SPARSE_PRODUCT_SHARE } from "./thresholds";

export class DenseBfgs implements HessianApprox {
  private B: Float64Array;
  /**
   * H = B^-1 as of the last pending update. Most QPs never read H (a warm start with any bound
   * fixed rebuilds its block from B), so its updates wait in pendingH until something does and
   * are then applied in the order they came, with the same operations: H has the same bits as
   * if each had been applied at once, and a run that never reads it skips two n^2 passes per
   * iteration.
   */
  private H: Float64Array;
  /** When not null, H is diag(hDiagonal) before the pending updates (a reset or the first scaling). */
  private hDiagonal: number | null = null;
  private pendingH: { s: Float64Array; r: Float64Array; sr: number }[] = [];
  private fresh = true;
  /** Scratch: positions of the nonzero entries of the vector being multiplied. */
  private readonly nonzeros: Int32Array;
  /**
   * The block and work vectors of the reduced inverse: one QP uses one at a time, so the newest
   * gets them (allocating an n^2 block per QP cost more than the QP on small problems).
   */
  private readonly blockScratch: BlockScratch;

  constructor(readonly n: number) {
    this.B = new Float64Array(n * n);
    this.H = new Float64Array(n * n);
    this.nonzeros = new Int32Array(n);
    this.blockScratch = {
      HF: new Float64Array(n * n), fixed: new Uint8Array(n), idx: new Int32Array(n), pos: new Int32Array(n), owner: null,
      vF: new Float64Array(n), nonzeros: new Int32Array(n), column: new Float64Array(n), product: new Float64Array(n), factor: new Float64Array(n * n), factorTransposed: new Float64Array(n * n),
    };
    this.reset();
  }

  reset(): void {
    const n = this.n;
    this.B.fill(0);
    for (let i = 0; i < n; i++) this.B[i * n + i] = 1;
    this.hDiagonal = 1;
    this.pendingH.length = 0;
    this.fresh = true;
  }

  /** H with every pending update applied. */
  private currentH(): Float64Array {
    const { n, H } = this;
    if (this.hDiagonal !== null) {
      H.fill(0);
      for (let i = 0; i < n; i++) H[i * n + i] = this.hDiagonal;
      this.hDiagonal = null;
    }
    for (const { s, r, sr } of this.pendingH) this.updateInverse(s, r, sr);
    this.pendingH.length = 0;
    return H;
  }

  static mul(M: Float64Array, n: number, v: Float64Array, out: Float64Array): void {
    for (let i = 0; i < n; i++) {
      let s = 0;
      const o = i * n;
      for (let j = 0; j < n; j++) s += M[o + j] * v[j];
      out[i] = s;
    }
  }

  reduced(): ReducedInverse {
    return new DenseReducedInverse(this.B, () => this.currentH(), this.n, this.blockScratch);
  }

  applyB(v: Float64Array, out: Float64Array): void {
    // the QP multiplies by vectors that are zero on the variables at a bound (most of them on
    // a ground structure): then only the nonzero entries are summed, in the dense product's
    // order (a skipped term is an exact zero, so the bits are the same)
    const n = this.n;
    const nnz = nonzerosOf(v, n, this.nonzeros);
    if (nnz <= B_COLUMN_PRODUCT_SHARE * n) {
      out.fill(0, 0, n);
      this.addColumns(v, nnz, null, n, out);
    } else if (nnz <= SPARSE_PRODUCT_SHARE * n) {
      for (let i = 0; i < n; i++) out[i] = sparseRowDot(this.B, i * n, v, this.nonzeros, nnz);
    } else DenseBfgs.mul(this.B, n, v, out);
  }

  /**
   * (B v)_i for the rows listed in rows[0..count) (ascending) only; out's other entries are
   * left as they are. The dual QP needs B v on the variables fixed at a bound alone, for a v
   * that is zero on them: (fixed x free) products instead of n^2. Each entry has the bits
   * applyB gives it.
   */
  applyBRows(v: Float64Array, rows: Int32Array, count: number, out: Float64Array): void {
    const n = this.n;
    const nnz = nonzerosOf(v, n, this.nonzeros);
    if (nnz <= B_COLUMN_PRODUCT_SHARE * n) {
      for (let a = 0; a < count; a++) out[rows[a]] = 0;
      this.addColumns(v, nnz, rows, count, out);
    } else for (let a = 0; a < count; a++) out[rows[a]] = sparseRowDot(this.B, rows[a] * n, v, this.nonzeros, nnz);
  }

  /** out_i += sum over the nonzero v_j of B_ji v_j, j ascending, for the listed rows i (all when rows is null). */
  private addColumns(v: Float64Array, nnz: number, rows: Int32Array | null, count: number, out: Float64Array): void {
    const { B, n, nonzeros } = this;
    for (let k = 0; k < nnz; k++) {
      const j = nonzeros[k];
      const vj = v[j];
      const o = j * n;
      if (rows === null) for (let i = 0; i < n; i++) out[i] += B[o + i] * vj;
      else
        for (let a = 0; a < count; a++) {
          const i = rows[a];
          out[i] += B[o + i] * vj;
        }
    }
  }

  applyH(v: Float64Array, out: Float64Array): void {
    DenseBfgs.mul(this.currentH(), this.n, v, out);
  }

  update(s: Float64Array, y: Float64Array): "updated" | "damped" | "skipped" {
    const n = this.n;
    if (this.fresh) {
      const sy = dot(s, y);
      const yy = dot(y, y);
      if (sy > 0 && yy > 0) {
        const gamma = yy / sy; // Shanno-Phua initial scaling
        this.B.fill(0);
        for (let i = 0; i < n; i++) this.B[i * n + i] = gamma;
        this.hDiagonal = 1 / gamma;
        this.pendingH.length = 0;
      }
    }
    const bs = new Float64Array(n);
    this.applyB(s, bs);
    const d = powellDamped(s, y, bs);
    if (!d || !(d.sr > 1e-300)) return "skipped";
    const sBs = dot(s, bs);
    const { r, sr } = d;
    const B = this.B;
    for (let i = 0; i < n; i++) {
      const o = i * n;
      const bi = bs[i] / sBs;
      const ri = r[i] / sr;
      for (let j = 0; j < n; j++) B[o + j] += ri * r[j] - bi * bs[j];
    }
    this.pendingH.push({ s: s.slice(0, n), r, sr });
    // at most n waiting: their memory stays within that of B
    if (this.pendingH.length >= n) this.currentH();
    this.fresh = false;
    return d.damped ? "damped" : "updated";
  }

  /** H+ = (I - rho s r') H (I - rho r s') + rho s s', rho = 1 / s'r. */
  private updateInverse(s: Float64Array, r: Float64Array, sr: number): void {
    const { n, H } = this;
    const rho = 1 / sr;
    const hr = new Float64Array(n);
    DenseBfgs.mul(H, n, r, hr);
    const rHr = dot(r, hr);
    const c = rho * rho * rHr + rho;
    for (let i = 0; i < n; i++) {
      const o = i * n;
      const si = s[i];
      const hi = hr[i];
      for (let j = 0; j < n; j++) H[o + j] += c * si * s[j] - rho * (si * hr[j] + hi * s[j]);
    }
  }
}
