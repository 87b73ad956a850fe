// Dense damped BFGS: keeps B and H = B^-1 explicitly (n^2 each, O(n^2) per update), so the QP
// never factorizes B. First matrix scaled by Shanno and Phua's factor y'y/s'y at the first update.
import { type HessianApprox, type ReducedInverse, dot, powellDamped } from "./hessian";
import { B_COLUMN_PRODUCT_SHARE, SPARSE_PRODUCT_SHARE } from "./thresholds";

/** Writes the positions of v's nonzero entries among the first n to into, in order; their count. */
function nonzerosOf(v: Float64Array, n: number, into: Int32Array): number {
  let nnz = 0;
  for (let j = 0; j < n; j++) if (v[j] !== 0) into[nnz++] = j;
  return nnz;
}

/** Row M[offset + j] times v over the listed nonzero positions j of v (ascending). */
function sparseRowDot(M: Float64Array, offset: number, v: Float64Array, nonzeros: Int32Array, nnz: number): number {
  let s = 0;
  for (let k = 0; k < nnz; k++) {
    const j = nonzeros[k];
    s += M[offset + j] * v[j];
  }
  return s;
}

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

/**
 * Work vectors of length n for DenseReducedInverse, owned by the DenseBfgs: the QP's inner loop
 * then allocates nothing, and a QP's setup only the block itself.
 */
interface BlockScratch {
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
class DenseReducedInverse implements ReducedInverse {
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
