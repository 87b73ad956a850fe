// Limited-memory damped BFGS for many variables: the last m pairs (s_i, r_i) with r the
// Powell-damped gradient change, B0 = delta*I with delta = r'r/s'r of the newest pair
// (Shanno-Phua). H*v by the two-loop recursion, B*v by the unrolled product form
// B_{i+1} = B_i - b_i b_i'/(s_i'b_i) + r_i r_i'/(s_i'r_i), b_i = B_i s_i, recomputed in O(m^2 n)
// after each update. Both are exact for the same pairs, so H is exactly B^-1. Memory O(m n).
import { type HessianApprox, type ReducedInverse, dot, powellDamped } from "./hessian";
import { SmallLu } from "./small-lu";

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

  /** B = delta*I + U diag(1/dinv) U' with U = [r_1..r_m, b_1..b_m], dinv = [s'r..., -s'b...]. */
  reduced(): ReducedInverse {
    const U = [...this.R, ...this.Bs];
    const dinv = [...this.sr, ...this.sb.map((v) => -v)];
    return new LimitedReducedInverse(this.n, this.delta, U, Float64Array.from(dinv));
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

/**
 * Woodbury form of the limited-memory inverse on the free variables:
 * (B_FF)^-1 = I/delta - U_F C^-1 U_F' / delta^2,  C = diag(dinv) + U_F'U_F / delta.
 * Fixing or freeing variable j changes U_F'U_F by the outer product of row j of U: O(m^2); the
 * O(m^3) refactorization of the 2m x 2m matrix C waits for the next apply, so that a QP that
 * fixes or frees many variables in a row (its warm start) factors once.
 */
class LimitedReducedInverse implements ReducedInverse {
  private readonly G: Float64Array;
  private readonly q: number;
  private lu: SmallLu | null = null;
  /** C changed since lu was made */
  private stale = true;
  private readonly fixed: Uint8Array;

  constructor(private readonly n: number, private readonly delta: number, private readonly U: Float64Array[], private readonly dinv: Float64Array) {
    const q = (this.q = U.length);
    this.fixed = new Uint8Array(n);
    this.G = new Float64Array(q * q);
    for (let a = 0; a < q; a++)
      for (let b = 0; b <= a; b++) {
        const v = dot(U[a], U[b], n);
        this.G[a * q + b] = v;
        this.G[b * q + a] = v;
      }
  }

  private factor(): void {
    const { q, G, delta, dinv } = this;
    this.stale = false;
    if (q === 0) return;
    const C = new Float64Array(q * q);
    for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) C[a * q + b] = G[a * q + b] / delta + (a === b ? dinv[a] : 0);
    const lu = new SmallLu(C, q);
    this.lu = lu.singular ? null : lu;
  }

  private outer(j: number, sign: number): void {
    const { q, G, U } = this;
    for (let a = 0; a < q; a++) {
      const ua = U[a][j] * sign;
      for (let b = 0; b < q; b++) G[a * q + b] += ua * U[b][j];
    }
  }

  fix(j: number): void {
    if (this.fixed[j]) return;
    this.fixed[j] = 1;
    this.outer(j, -1);
    this.stale = true;
  }

  fixMany(js: number[]): void {
    for (const j of js) this.fix(j);
  }

  free(j: number): void {
    if (!this.fixed[j]) return;
    this.fixed[j] = 0;
    this.outer(j, 1);
    this.stale = true;
  }

  apply(v: Float64Array, out: Float64Array): void {
    if (this.stale) this.factor();
    const { n, q, U, delta, fixed } = this;
    for (let i = 0; i < n; i++) out[i] = fixed[i] ? 0 : v[i] / delta;
    if (q === 0 || !this.lu) return;
    const t = new Float64Array(q);
    for (let a = 0; a < q; a++) {
      const u = U[a];
      let s = 0;
      for (let i = 0; i < n; i++) if (!fixed[i]) s += u[i] * v[i];
      t[a] = s;
    }
    const y = this.lu.solve(t);
    const d2 = delta * delta;
    for (let a = 0; a < q; a++) {
      const u = U[a];
      const c = y[a] / d2;
      if (c === 0) continue;
      for (let i = 0; i < n; i++) if (!fixed[i]) out[i] -= c * u[i];
    }
  }
}
