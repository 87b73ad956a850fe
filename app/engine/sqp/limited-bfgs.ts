// Limited-memory damped BFGS for many variables: the last m pairs (s_i, r_i) with r the
// Powell-damped gradient change, B0 = delta*I with delta = r'r/s'r of the newest pair
// (Shanno-Phua). H*v by the two-loop recursion, B*v by the unrolled product form
// B_{i+1} = B_i - b_i b_i'/(s_i'b_i) + r_i r_i'/(s_i'r_i), b_i = B_i s_i, recomputed in O(m^2 n)
// after each update. Both are exact for the same pairs, so H is exactly B^-1. Memory O(m n).
import { type HessianApprox, dot, powellDamped } from "./hessian";

export class LimitedBfgs implements HessianApprox {
  private S: Float64Array[] = [];
  private R: Float64Array[] = [];
  private Bs: Float64Array[] = []; // b_i = B_i s_i
  private sr: number[] = [];
  private sb: number[] = [];
  private delta = 1;

  constructor(readonly n: number, private readonly memory: number) {}

  reset(): void {
    this.S = [];
    this.R = [];
    this.Bs = [];
    this.sr = [];
    this.sb = [];
    this.delta = 1;
  }

  get pairs(): number {
    return this.S.length;
  }

  /** out = B_k v using the first k pairs. */
  private applyPartial(k: number, v: Float64Array, out: Float64Array): void {
    const n = this.n;
    for (let i = 0; i < n; i++) out[i] = this.delta * v[i];
    for (let p = 0; p < k; p++) {
      const b = this.Bs[p];
      const r = this.R[p];
      const cb = dot(b, v, n) / this.sb[p];
      const cr = dot(r, v, n) / this.sr[p];
      for (let i = 0; i < n; i++) out[i] += cr * r[i] - cb * b[i];
    }
  }

  applyB(v: Float64Array, out: Float64Array): void {
    this.applyPartial(this.S.length, v, out);
  }

  applyH(v: Float64Array, out: Float64Array): void {
    const n = this.n;
    const m = this.S.length;
    const q = out;
    q.set(v.subarray(0, n));
    const alpha = new Float64Array(m);
    for (let p = m - 1; p >= 0; p--) {
      const a = dot(this.S[p], q, n) / this.sr[p];
      alpha[p] = a;
      const r = this.R[p];
      for (let i = 0; i < n; i++) q[i] -= a * r[i];
    }
    const h0 = 1 / this.delta;
    for (let i = 0; i < n; i++) q[i] *= h0;
    for (let p = 0; p < m; p++) {
      const b = dot(this.R[p], q, n) / this.sr[p];
      const s = this.S[p];
      const c = alpha[p] - b;
      for (let i = 0; i < n; i++) q[i] += c * s[i];
    }
  }

  update(s: Float64Array, y: Float64Array): "updated" | "damped" | "skipped" {
    const n = this.n;
    if (this.S.length === 0) {
      const sy = dot(s, y);
      const yy = dot(y, y);
      if (sy > 0 && yy > 0) this.delta = yy / sy;
    }
    const bs = new Float64Array(n);
    this.applyB(s, bs);
    const d = powellDamped(s, y, bs);
    if (!d || !(d.sr > 1e-300)) return "skipped";
    this.S.push(Float64Array.from(s));
    this.R.push(d.r);
    this.sr.push(d.sr);
    if (this.S.length > this.memory) {
      this.S.shift();
      this.R.shift();
      this.sr.shift();
    }
    const last = this.R.length - 1;
    this.delta = dot(this.R[last], this.R[last]) / this.sr[last];
    this.Bs = [];
    this.sb = [];
    for (let p = 0; p < this.S.length; p++) {
      const b = new Float64Array(n);
      this.applyPartial(p, this.S[p], b);
      this.Bs.push(b);
      this.sb.push(dot(this.S[p], b, n));
    }
    return d.damped ? "damped" : "updated";
  }
}
