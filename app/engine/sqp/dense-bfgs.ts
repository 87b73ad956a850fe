// Dense damped BFGS: keeps B and H = B^-1 explicitly (n^2 each, O(n^2) per update), so the QP
// never factorizes B. First matrix scaled by Shanno and Phua's factor y'y/s'y at the first update.
import { type HessianApprox, dot, powellDamped } from "./hessian";

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

  private static mul(M: Float64Array, n: number, v: Float64Array, out: Float64Array): void {
    for (let i = 0; i < n; i++) {
      let s = 0;
      const o = i * n;
      for (let j = 0; j < n; j++) s += M[o + j] * v[j];
      out[i] = s;
    }
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
