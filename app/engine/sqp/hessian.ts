// What the SQP driver needs from a quasi-Newton approximation B of the Lagrangian's Hessian:
// products with B and with H = B^-1 (the dual QP works with H only), and a damped update.
export interface HessianApprox {
  readonly n: number;
  /** The inverse of B restricted to the free variables, for the QP's bound handling. */
  reduced(): ReducedInverse;
  applyB(v: Float64Array, out: Float64Array): void;
  /** (B v)_i for i in rows[0..count) only, other entries of out untouched (where cheaper than applyB). */
  applyBRows?(v: Float64Array, rows: Int32Array, count: number, out: Float64Array): void;
  applyH(v: Float64Array, out: Float64Array): void;
  /** Damped BFGS update with step s and Lagrangian-gradient change y. */
  update(s: Float64Array, y: Float64Array): "updated" | "damped" | "skipped";
  /** Back to a multiple of the identity (after a failed line search). */
  reset(): void;
}

/**
 * H_F = (B_FF)^-1 padded with zeros: the inverse Hessian on the variables not fixed at a bound.
 * fix/free change the free set by one variable at O(n^2) (dense) or O(m^2 n) (limited memory).
 */
export interface ReducedInverse {
  apply(v: Float64Array, out: Float64Array): void;
  fix(j: number): void;
  free(j: number): void;
  /** Fixes many variables at once (a warm start), where that is cheaper than one by one. */
  fixMany?(js: number[]): void;
}

export function dot(a: Float64Array, b: Float64Array, n = a.length): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += a[i] * b[i];
  return s;
}

/**
 * Powell's damping: r = theta*y + (1-theta)*Bs with theta chosen so that s'r >= 0.2 s'Bs,
 * which keeps B positive definite even where the Lagrangian has negative curvature.
 */
export function powellDamped(s: Float64Array, y: Float64Array, bs: Float64Array): { r: Float64Array; damped: boolean; sr: number } | null {
  const n = s.length;
  const sBs = dot(s, bs, n);
  const sy = dot(s, y, n);
  if (!(sBs > 0) || !Number.isFinite(sy)) return null;
  if (sy >= 0.2 * sBs) return { r: Float64Array.from(y), damped: false, sr: sy };
  const theta = (0.8 * sBs) / (sBs - sy);
  const r = new Float64Array(n);
  for (let i = 0; i < n; i++) r[i] = theta * y[i] + (1 - theta) * bs[i];
  return { r, damped: true, sr: dot(s, r, n) };
}
