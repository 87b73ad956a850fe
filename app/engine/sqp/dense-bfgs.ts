// Dense damped BFGS: keeps B and H = B^-1 explicitly (n^2 each, O(n^2) per update), so the QP
// never factorizes B. First matrix scaled by Shanno and Phua's factor y'y/s'y at the first update.
import { type HessianApprox, type ReducedInverse, dot, powellDamped } from "./hessian";

export class DenseBfgs implements HessianApprox {
  private B: Float64Array;
  private H: Float64Array;
  private fresh = true;

  constructor(readonly n: number) {
    this.B = new Float64Array(n * n);
    this.H = new Float64Array(n * n);
    this.reset();
  }

  reset(): void {
    const n = this.n;
    this.B.fill(0);
    this.H.fill(0);
    for (let i = 0; i < n; i++) {
      this.B[i * n + i] = 1;
      this.H[i * n + i] = 1;
    }
    this.fresh = true;
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
    return new DenseReducedInverse(this.B, this.H, this.n);
  }

  applyB(v: Float64Array, out: Float64Array): void {
    DenseBfgs.mul(this.B, this.n, v, out);
  }

  applyH(v: Float64Array, out: Float64Array): void {
    DenseBfgs.mul(this.H, this.n, v, out);
  }

  update(s: Float64Array, y: Float64Array): "updated" | "damped" | "skipped" {
    const n = this.n;
    if (this.fresh) {
      const sy = dot(s, y);
      const yy = dot(y, y);
      if (sy > 0 && yy > 0) {
        const gamma = yy / sy; // Shanno-Phua initial scaling
        this.B.fill(0);
        this.H.fill(0);
        for (let i = 0; i < n; i++) {
          this.B[i * n + i] = gamma;
          this.H[i * n + i] = 1 / gamma;
        }
      }
    }
    const bs = new Float64Array(n);
    this.applyB(s, bs);
    const d = powellDamped(s, y, bs);
    if (!d || !(d.sr > 1e-300)) return "skipped";
    const sBs = dot(s, bs);
    const { r, sr } = d;
    const B = this.B;
    const H = this.H;
    for (let i = 0; i < n; i++) {
      const o = i * n;
      const bi = bs[i] / sBs;
      const ri = r[i] / sr;
      for (let j = 0; j < n; j++) B[o + j] += ri * r[j] - bi * bs[j];
    }
    // H+ = (I - rho s r') H (I - rho r s') + rho s s'
    const rho = 1 / sr;
    const hr = new Float64Array(n);
    this.applyH(r, hr);
    const rHr = dot(r, hr);
    const c = rho * rho * rHr + rho;
    for (let i = 0; i < n; i++) {
      const o = i * n;
      const si = s[i];
      const hi = hr[i];
      for (let j = 0; j < n; j++) H[o + j] += c * si * s[j] - rho * (si * hr[j] + hi * s[j]);
    }
    this.fresh = false;
    return d.damped ? "damped" : "updated";
  }
}

/**
 * (B_FF)^-1 kept explicitly: fixing variable j is the rank-one downdate H_F - h h'/h_jj
 * (h = column j), freeing it the bordered-inverse formula with column j of B; O(n^2) each.
 * A pivot that is not safely positive triggers a rebuild from a Cholesky factor of B_FF.
 */
class DenseReducedInverse implements ReducedInverse {
  private readonly HF: Float64Array;
  private readonly fixed: Uint8Array;

  constructor(private readonly B: Float64Array, H: Float64Array, private readonly n: number) {
    this.HF = Float64Array.from(H);
    this.fixed = new Uint8Array(n);
  }

  apply(v: Float64Array, out: Float64Array): void {
    DenseBfgs.mul(this.HF, this.n, v, out);
  }

  fix(j: number): void {
    const { n, HF } = this;
    if (this.fixed[j]) return;
    const h = HF.slice(j * n, j * n + n);
    const hjj = h[j];
    this.fixed[j] = 1;
    if (!(hjj > 0)) return this.rebuild();
    for (let i = 0; i < n; i++) {
      const hi = h[i] / hjj;
      if (hi === 0) continue;
      const o = i * n;
      for (let k = 0; k < n; k++) HF[o + k] -= hi * h[k];
    }
    for (let i = 0; i < n; i++) HF[i * n + j] = HF[j * n + i] = 0;
  }

  free(j: number): void {
    const { n, HF, B, fixed } = this;
    if (!fixed[j]) return;
    fixed[j] = 0;
    const b = new Float64Array(n);
    for (let i = 0; i < n; i++) if (!fixed[i] && i !== j) b[i] = B[i * n + j];
    const x = new Float64Array(n);
    DenseBfgs.mul(HF, n, b, x);
    const gamma = B[j * n + j] - dot(b, x);
    if (!(gamma > 1e-12 * Math.abs(B[j * n + j]))) return this.rebuild();
    for (let i = 0; i < n; i++) {
      const xi = x[i] / gamma;
      if (xi === 0) continue;
      const o = i * n;
      for (let k = 0; k < n; k++) HF[o + k] += xi * x[k];
    }
    for (let i = 0; i < n; i++) HF[i * n + j] = HF[j * n + i] = -x[i] / gamma;
    HF[j * n + j] = 1 / gamma;
  }

  /** H_F from scratch: Cholesky of B_FF, then its inverse column by column. */
  private rebuild(): void {
    const { n, B, HF, fixed } = this;
    const free: number[] = [];
    for (let i = 0; i < n; i++) if (!fixed[i]) free.push(i);
    const m = free.length;
    const L = new Float64Array(m * m);
    for (let a = 0; a < m; a++) {
      for (let c = 0; c <= a; c++) {
        let s = B[free[a] * n + free[c]];
        for (let k = 0; k < c; k++) s -= L[a * m + k] * L[c * m + k];
        if (a === c) L[a * m + a] = Math.sqrt(Math.max(s, 1e-300));
        else L[a * m + c] = s / L[c * m + c];
      }
    }
    HF.fill(0);
    const col = new Float64Array(m);
    for (let c = 0; c < m; c++) {
      col.fill(0);
      col[c] = 1;
      for (let a = 0; a < m; a++) {
        let s = col[a];
        for (let k = 0; k < a; k++) s -= L[a * m + k] * col[k];
        col[a] = s / L[a * m + a];
      }
      for (let a = m - 1; a >= 0; a--) {
        let s = col[a];
        for (let k = a + 1; k < m; k++) s -= L[k * m + a] * col[k];
        col[a] = s / L[a * m + a];
      }
      for (let a = 0; a < m; a++) HF[free[a] * n + free[c]] = col[a];
    }
  }
}
