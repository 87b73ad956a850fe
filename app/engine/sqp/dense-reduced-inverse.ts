// (B_FF)^-1 over the free variables of a QP, kept explicitly in a block lent by DenseBfgs
// (dense-bfgs.ts): fixing and freeing a variable cost O(m^2) for m free variables.
import { type ReducedInverse, dot } from "./hessian";
import { sparseRowDot } from "./sparse-products";
import { SPARSE_PRODUCT_SHARE } from "./thresholds";

/**
 * Work vectors of length n for DenseReducedInverse, owned by the DenseBfgs: the QP's inner loop
 * then allocates nothing, and a QP's setup only the block itself.
 */
export interface BlockScratch {
  /** The block (stride n) and its index maps, lent to the newest reduced inverse. */
  HF: Float64Array;
  fixed: Uint8Array;
  idx: Int32Array;
  pos: Int32Array;
  /** The reduced inverse the block belongs to now; an older one refuses to work (no silent sharing). */
  owner: DenseReducedInverse | null;
  vF: Float64Array;
  nonzeros: Int32Array;
  column: Float64Array;
  product: Float64Array;
  /** The Cholesky factor of B_FF while the block is rebuilt (m x m, stride m). */
  factor: Float64Array;
  factorTransposed: Float64Array;
}

/**
 * (B_FF)^-1 kept explicitly over the free variables only (an m x m block, m = free count, in
 * a buffer of stride n), so that applying it, fixing a variable (the rank-one downdate
 * H_F - h h'/h_jj, then the last free variable moved into its slot) and freeing one (the
 * bordered-inverse formula with column j of B) cost O(m^2), not O(n^2): on ground structures
 * most variables sit at a bound and m is a small part of n. A warm start that fixes many
 * variables at once rebuilds the block from a Cholesky factor of B_FF, O(m^3); so does a pivot
 * that is not safely positive.
 */
export class DenseReducedInverse implements ReducedInverse {
  private readonly HF: Float64Array; // row a, column b of the block at HF[a * n + b]
  private readonly fixed: Uint8Array;
  private readonly idx: Int32Array; // free variable of block position a
  private readonly pos: Int32Array; // block position of variable j, -1 when fixed
  private m: number;

  /** False until the block holds something: a QP that fixes bounds first never copies H. */
  private ready = false;

  constructor(private readonly B: Float64Array, private readonly inverse: () => Float64Array, private readonly n: number, private readonly scratch: BlockScratch) {
    scratch.owner = this;
    this.HF = scratch.HF;
    this.fixed = scratch.fixed;
    this.idx = scratch.idx;
    this.pos = scratch.pos;
    this.fixed.fill(0);
    for (let j = 0; j < n; j++) this.idx[j] = this.pos[j] = j;
    this.m = n;
  }

  /** Before every operation: the block must still be this one's; at first use, with nothing fixed, it is all of H. */
  private ensureBlock(): void {
    if (this.scratch.owner !== this) throw new Error("A reduced inverse was used after a newer one of the same matrix took its block.");
    if (this.ready) return;
    this.HF.set(this.inverse());
    this.ready = true;
  }

  apply(v: Float64Array, out: Float64Array): void {
    this.ensureBlock();
    const { n, HF, idx, m } = this;
    const { vF, nonzeros } = this.scratch;
    // the QP applies the block to bound normals (one nonzero) as often as to dense vectors:
    // summing over the nonzero entries only gives the dense product's bits at their cost
    let nnz = 0;
    for (let b = 0; b < m; b++) {
      const vb = v[idx[b]];
      vF[b] = vb;
      if (vb !== 0) nonzeros[nnz++] = b;
    }
    out.fill(0, 0, n);
    if (nnz > SPARSE_PRODUCT_SHARE * m) {
      for (let a = 0; a < m; a++) {
        const o = a * n;
        let s = 0;
        for (let b = 0; b < m; b++) s += HF[o + b] * vF[b];
        out[idx[a]] = s;
      }
    } else for (let a = 0; a < m; a++) out[idx[a]] = sparseRowDot(HF, a * n, vF, nonzeros, nnz);
  }

  fix(j: number): void {
    this.ensureBlock();
    if (this.fixed[j]) return;
    const { n, HF } = this;
    const a = this.pos[j];
    const m = this.m;
    const h = this.scratch.column;
    for (let c = 0; c < m; c++) h[c] = HF[a * n + c];
    const hjj = h[a];
    this.fixed[j] = 1;
    if (!(hjj > 0)) return this.rebuild();
    for (let r = 0; r < m; r++) {
      const hr = h[r] / hjj;
      if (hr === 0) continue;
      const o = r * n;
      for (let c = 0; c < m; c++) HF[o + c] -= hr * h[c];
    }
    // move the last free variable into slot a
    const last = m - 1;
    if (a !== last) {
      for (let c = 0; c < m; c++) HF[a * n + c] = HF[last * n + c];
      for (let r = 0; r < m; r++) HF[r * n + a] = HF[r * n + last];
      HF[a * n + a] = HF[last * n + last];
      const jl = this.idx[last];
      this.idx[a] = jl;
      this.pos[jl] = a;
    }
    this.pos[j] = -1;
    this.m = last;
  }

  /** Many fixes at once: one Cholesky of B_FF, O(m^3) for m free variables, instead of O(k m^2). */
  fixMany(js: number[]): void {
    if (this.scratch.owner !== this) throw new Error("A reduced inverse was used after a newer one of the same matrix took its block.");
    let added = 0;
    for (const j of js) if (!this.fixed[j]) { this.fixed[j] = 1; added++; }
    if (added > 0) this.rebuild();
  }

  free(j: number): void {
    this.ensureBlock();
    const { n, HF, B, fixed, idx } = this;
    if (!fixed[j]) return;
    const m = this.m;
    const b = this.scratch.column;
    for (let a = 0; a < m; a++) b[a] = B[idx[a] * n + j];
    const x = this.scratch.product;
    for (let a = 0; a < m; a++) {
      const o = a * n;
      let s = 0;
      for (let c = 0; c < m; c++) s += HF[o + c] * b[c];
      x[a] = s;
    }
    const gamma = B[j * n + j] - dot(b, x, m);
    fixed[j] = 0;
    if (!(gamma > 1e-12 * Math.abs(B[j * n + j]))) return this.rebuild();
    for (let r = 0; r < m; r++) {
      const xr = x[r] / gamma;
      if (xr === 0) continue;
      const o = r * n;
      for (let c = 0; c < m; c++) HF[o + c] += xr * x[c];
    }
    for (let r = 0; r < m; r++) HF[r * n + m] = HF[m * n + r] = -x[r] / gamma;
    HF[m * n + m] = 1 / gamma;
    idx[m] = j;
    this.pos[j] = m;
    this.m = m + 1;
  }

  /**
   * The block from scratch: Cholesky of B_FF, then its inverse column by column. Both triangles
   * are solved, not one mirrored (a third less work): the block's last bits steer chaotic runs
   * as B's do (thresholds.ts, B_COLUMN_PRODUCT_SHARE).
   */
  private rebuild(): void {
    const { n, B, HF, fixed, idx, pos } = this;
    let m = 0;
    for (let j = 0; j < n; j++) {
      if (fixed[j]) pos[j] = -1;
      else { idx[m] = j; pos[j] = m; m++; }
    }
    this.m = m;
    this.ready = true;
    const L = this.scratch.factor;
    for (let a = 0; a < m; a++) {
      const ba = idx[a] * n;
      for (let c = 0; c <= a; c++) {
        let s = B[ba + idx[c]];
        for (let k = 0; k < c; k++) s -= L[a * m + k] * L[c * m + k];
        if (a === c) L[a * m + a] = Math.sqrt(Math.max(s, 1e-300));
        else L[a * m + c] = s / L[c * m + c];
      }
    }
    // the back substitutions read L by columns: from a transposed copy they read contiguous
    // memory (same operations in the same order, so the same bits)
    const LT = this.scratch.factorTransposed;
    for (let a = 0; a < m; a++) for (let c = 0; c <= a; c++) LT[c * m + a] = L[a * m + c];
    const col = this.scratch.column;
    for (let c = 0; c < m; c++) {
      col.fill(0, 0, m);
      col[c] = 1;
      for (let a = c; a < m; a++) {
        let s = col[a];
        for (let k = c; k < a; k++) s -= L[a * m + k] * col[k];
        col[a] = s / L[a * m + a];
      }
      for (let a = m - 1; a >= 0; a--) {
        let s = col[a];
        for (let k = a + 1; k < m; k++) s -= LT[a * m + k] * col[k];
        col[a] = s / L[a * m + a];
      }
      for (let a = 0; a < m; a++) HF[a * n + c] = col[a];
    }
  }
}
