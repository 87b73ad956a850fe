// Strictly convex QP   min 1/2 s'Bs + g's   s.t.  eq rows: a's = b,  ineq rows: a's <= b,
// lower <= s <= upper,  solved by the dual active-set method of Goldfarb and Idnani (1983) in
// range-space form: B enters only through products with H = B^-1 (dense or limited-memory),
// and the Schur complement S = N'HN of the active normals N is kept as a Cholesky factor that
// grows by one row per added constraint and loses one by Givens rotations per dropped one.
// Why dual: it starts from the unconstrained minimizer -Hg, needs no feasible start point, and
// an infeasible QP is detected (not cycled on) -- the SQP driver then relaxes the linearization.
// Bounds are handled as such: unit normals touching one entry, checked in O(1) each.
// Warm start: Goldfarb-Idnani may add ANY violated constraint next; we pick equalities first,
// then constraints of the previous active set, then the rest (most violated first within each
// class). Written from the paper's algorithm; the npm 'quadprog' package (dense, n^3 per
// solve) was not used.
import { GrowingCholesky } from "./growing-cholesky";
import { type QpRow, rowAxpy, rowDot } from "./rows";

export interface QpInput {
  /** Dimension of s (base, or base + 1 with the elastic variable). */
  dim: number;
  /** Number of true variables; rows carry the elastic coefficient in `extra` at index base. */
  base: number;
  applyH(v: Float64Array, out: Float64Array): void;
  g: Float64Array;
  eq: QpRow[];
  eqRhs: Float64Array;
  ineq: QpRow[];
  ineqRhs: Float64Array;
  lower: Float64Array;
  upper: Float64Array;
  /** Keys of the previous active set (see qpKey). */
  warm?: ArrayLike<number>;
  maxIterations?: number;
}

export interface QpOutput {
  status: "optimal" | "infeasible" | "iteration-limit";
  s: Float64Array;
  /** Multipliers: eq free sign; ineq, lower, upper >= 0 (stationarity Bs + g + Aeq'eq + Ain'ineq - lower + upper = 0). */
  eq: Float64Array;
  ineq: Float64Array;
  lower: Float64Array;
  upper: Float64Array;
  active: number[];
  iterations: number;
}

/** Key layout: eq rows, then ineq rows, then lower bounds, then upper bounds. */
export function qpKey(kind: "eq" | "ineq" | "lower" | "upper", i: number, nEq: number, nIneq: number, dim: number): number {
  switch (kind) {
    case "eq":
      return i;
    case "ineq":
      return nEq + i;
    case "lower":
      return nEq + nIneq + i;
    case "upper":
      return nEq + nIneq + dim + i;
  }
}

export function solveQp(q: QpInput): QpOutput {
  const { dim, base, eq, ineq, eqRhs, ineqRhs, lower, upper } = q;
  const nE = eq.length;
  const nI = ineq.length;
  const offL = nE + nI;
  const offU = offL + dim;
  const total = offU + dim;
  const maxIt = q.maxIterations ?? 10 * (total + 10);

  const active: number[] = [];
  const u: number[] = [];
  const isActive = new Uint8Array(total);
  const skipped = new Uint8Array(total);
  const warm = new Uint8Array(total);
  if (q.warm) for (let k = 0; k < q.warm.length; k++) if (q.warm[k] >= 0 && q.warm[k] < total) warm[q.warm[k]] = 1;
  const eqSign = new Float64Array(nE).fill(1);
  const chol = new GrowingCholesky();

  const s = new Float64Array(dim);
  q.applyH(q.g, s);
  for (let i = 0; i < dim; i++) s[i] = -s[i];
  const vEq = new Float64Array(nE);
  const vIn = new Float64Array(nI);
  for (let i = 0; i < nE; i++) vEq[i] = rowDot(eq[i], s, base);
  for (let i = 0; i < nI; i++) vIn[i] = rowDot(ineq[i], s, base);

  const rhsOf = (key: number): number => {
    if (key < nE) return eqSign[key] * eqRhs[key];
    if (key < offL) return ineqRhs[key - nE];
    if (key < offU) return -lower[key - offL];
    return upper[key - offU];
  };
  const normalDot = (key: number, v: Float64Array): number => {
    if (key < nE) return eqSign[key] * rowDot(eq[key], v, base);
    if (key < offL) return rowDot(ineq[key - nE], v, base);
    if (key < offU) return -v[key - offL];
    return v[key - offU];
  };
  const normalAxpy = (key: number, alpha: number, out: Float64Array): void => {
    if (key < nE) rowAxpy(eq[key], alpha * eqSign[key], out, base);
    else if (key < offL) rowAxpy(ineq[key - nE], alpha, out, base);
    else if (key < offU) out[key - offL] -= alpha;
    else out[key - offU] += alpha;
  };
  // violation of a not-yet-active constraint at the current s, from the cached row products
  const violation = (key: number): number => {
    if (key < nE) return Math.abs(vEq[key] - eqRhs[key]);
    if (key < offL) return vIn[key - nE] - ineqRhs[key - nE];
    if (key < offU) return lower[key - offL] - s[key - offL];
    return s[key - offU] - upper[key - offU];
  };
  const tolOf = (key: number): number => 1e-11 * (1 + Math.abs(rhsOf(key)));

  const finish = (status: QpOutput["status"], iterations: number): QpOutput => {
    const out: QpOutput = {
      status,
      s,
      eq: new Float64Array(nE),
      ineq: new Float64Array(nI),
      lower: new Float64Array(dim),
      upper: new Float64Array(dim),
      active: active.slice(),
      iterations,
    };
    for (let j = 0; j < active.length; j++) {
      const key = active[j];
      if (key < nE) out.eq[key] = eqSign[key] * u[j];
      else if (key < offL) out.ineq[key - nE] = u[j];
      else if (key < offU) out.lower[key - offL] = u[j];
      else out.upper[key - offU] = u[j];
    }
    return out;
  };

  const drop = (pos: number): void => {
    isActive[active[pos]] = 0;
    active.splice(pos, 1);
    u.splice(pos, 1);
    chol.remove(pos);
  };

  const np = new Float64Array(dim);
  const hn = new Float64Array(dim);
  const z = new Float64Array(dim);
  let iterations = 0;

  for (;;) {
    // choose the next violated constraint: equalities, then the warm set, then the rest
    let p = -1;
    let pClass = 3;
    let pViol = 0;
    const consider = (key: number, cls: number): void => {
      if (isActive[key] || skipped[key]) return;
      const v = violation(key);
      if (!(v > tolOf(key))) return;
      if (cls < pClass || (cls === pClass && v > pViol)) {
        p = key;
        pClass = cls;
        pViol = v;
      }
    };
    for (let i = 0; i < nE; i++) consider(i, 0);
    if (p < 0) {
      for (let key = nE; key < offL; key++) consider(key, warm[key] ? 1 : 2);
      for (let j = 0; j < dim; j++) {
        if (lower[j] > -Infinity) consider(offL + j, warm[offL + j] ? 1 : 2);
        if (upper[j] < Infinity) consider(offU + j, warm[offU + j] ? 1 : 2);
      }
    }
    if (p < 0) return finish("optimal", iterations);
    if (p < nE) eqSign[p] = vEq[p] - eqRhs[p] >= 0 ? 1 : -1;

    let up = 0;
    for (;;) {
      if (++iterations > maxIt) return finish("iteration-limit", iterations);
      np.fill(0);
      normalAxpy(p, 1, np);
      q.applyH(np, hn);
      const k = active.length;
      const w = new Float64Array(k);
      for (let j = 0; j < k; j++) w[j] = normalDot(active[j], hn);
      const y = chol.forward(w);
      const r = chol.backward(y);
      const tmp = Float64Array.from(np);
      for (let j = 0; j < k; j++) normalAxpy(active[j], -r[j], tmp);
      q.applyH(tmp, z);
      const nz = normalDot(p, z);
      const nHn = normalDot(p, hn);
      const viol = normalDot(p, s) - rhsOf(p);

      let t1 = Infinity;
      let l = -1;
      for (let j = 0; j < k; j++) {
        if (active[j] < nE) continue;
        if (r[j] > 1e-14 * (1 + Math.abs(u[j]))) {
          const t = u[j] / r[j];
          if (t < t1) {
            t1 = t;
            l = j;
          }
        }
      }

      const dependent = !(nz > 1e-12 * nHn) || !(nz > 0);
      if (dependent) {
        if (l < 0) {
          // the new normal is a combination of active ones: consistent (ignore) or infeasible
          if (viol <= 1e-8 * (1 + Math.abs(rhsOf(p)))) {
            skipped[p] = 1;
            break;
          }
          return finish("infeasible", iterations);
        }
        for (let j = 0; j < k; j++) u[j] -= t1 * r[j];
        up += t1;
        drop(l);
        continue;
      }

      const t2 = viol / nz;
      const t = Math.min(t1, t2);
      for (let i = 0; i < dim; i++) s[i] -= t * z[i];
      for (let i = 0; i < nE; i++) vEq[i] -= t * rowDot(eq[i], z, base);
      for (let i = 0; i < nI; i++) vIn[i] -= t * rowDot(ineq[i], z, base);
      for (let j = 0; j < k; j++) u[j] -= t * r[j];
      up += t;
      if (t2 <= t1) {
        chol.append(y, Math.sqrt(nz));
        active.push(p);
        u.push(up);
        isActive[p] = 1;
        break;
      }
      u[l] = 0;
      drop(l);
    }
  }
}
