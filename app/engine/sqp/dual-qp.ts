// Strictly convex QP   min 1/2 s'Bs + g's   s.t.  eq rows: a's = b,  ineq rows: a's <= b,
// lower <= s <= upper,  solved by the dual active-set method of Goldfarb and Idnani (1983) in
// range-space form. Why dual: it starts from the unconstrained minimizer, needs no feasible
// start point, and an infeasible QP is detected rather than cycled on (the SQP driver then
// relaxes the linearization).
//
// Structure exploited:
//  - B enters only through products with B and with H_F = (B_FF)^-1, the inverse on the
//    variables not fixed at a bound (hessian.ts ReducedInverse: dense or limited-memory).
//  - Bounds are handled as such: an active bound fixes its variable (a cheap update of H_F) and
//    never enters the Schur complement, so the dense work scales with the number of active
//    general rows k only, not with the (often much larger) number of variables at a bound.
//  - The Schur complement S = N'H_F N of the active general normals N is a Cholesky factor
//    that grows by one row per added row, loses one by Givens rotations per dropped row, and
//    takes a rank-one downdate/update when a bound is fixed/freed: O(k^2) per change.
// Warm start: Goldfarb-Idnani may add ANY violated constraint next; we pick equalities first,
// then constraints of the previous active set, then the rest (most violated first in each class).
// Written from the paper's algorithm; the npm 'quadprog' package (dense, n^3 per solve, bounds
// as general rows) was not used.
import { GrowingCholesky } from "./growing-cholesky";
import type { ReducedInverse } from "./hessian";
import { type QpRow, rowAxpy, rowDot } from "./rows";
import { appendAll } from "../util/extent";

export interface QpHessian {
  applyB(v: Float64Array, out: Float64Array): void;
  /** (B v)_i for i in rows[0..count) only, other entries of out untouched (where cheaper than applyB). */
  applyBRows?(v: Float64Array, rows: Int32Array, count: number, out: Float64Array): void;
  reduced(): ReducedInverse;
}

export interface QpInput {
  /** Dimension of s (base, or base + 1 with the elastic variable). */
  dim: number;
  /** Number of true variables; rows carry the elastic coefficient in `extra` at index base. */
  base: number;
  hessian: QpHessian;
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
  /**
   * The equality-constrained solution for new right-hand sides with the final active set and
   * factorization kept (no active-set changes): the cheap second-order correction.
   */
  resolve(eqRhs: Float64Array, ineqRhs: Float64Array): Float64Array;
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
  const HF = q.hessian.reduced();

  // general active rows (keys < offL), in factor order
  const active: number[] = [];
  const u: number[] = [];
  const isActive = new Uint8Array(total);
  const skipped = new Uint8Array(total);
  const warm = new Uint8Array(total);
  if (q.warm) for (let k = 0; k < q.warm.length; k++) if (q.warm[k] >= 0 && q.warm[k] < total) warm[q.warm[k]] = 1;
  const eqSign = new Float64Array(nE).fill(1);
  const chol = new GrowingCholesky();
  // bounds: fixedSide[j] = -1 at lower, +1 at upper, 0 free; uB their multipliers
  const fixedSide = new Int8Array(dim);
  const uB = new Float64Array(dim);

  const s = new Float64Array(dim);
  const vEq = new Float64Array(nE);
  const vIn = new Float64Array(nI);

  const rhsOf = (key: number, eRhs = eqRhs, iRhs = ineqRhs): number => {
    if (key < nE) return eqSign[key] * eRhs[key];
    if (key < offL) return iRhs[key - nE];
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
  const violation = (key: number): number => {
    if (key < nE) return Math.abs(vEq[key] - eqRhs[key]);
    if (key < offL) return vIn[key - nE] - ineqRhs[key - nE];
    if (key < offU) return lower[key - offL] - s[key - offL];
    return s[key - offU] - upper[key - offU];
  };
  const tolOf = (key: number): number => 1e-11 * (1 + Math.abs(rhsOf(key)));

  const hn = new Float64Array(dim);
  const z = new Float64Array(dim);
  const bz = new Float64Array(dim);
  const unit = new Float64Array(dim);
  const fixedList = new Int32Array(dim); // the variables at a bound, for the dual direction

  /** w = N' H_F e_j for the active general rows, and (H_F)_jj. */
  const boundColumn = (j: number): { w: Float64Array; hjj: number } => {
    unit.fill(0);
    unit[j] = 1;
    HF.apply(unit, hn);
    const w = new Float64Array(active.length);
    for (let a = 0; a < active.length; a++) w[a] = normalDot(active[a], hn);
    return { w, hjj: hn[j] };
  };

  /** S = N'H_F N from scratch (after a failed downdate); rows that became dependent are released. */
  const refactor = (): void => {
    chol.clear();
    const keep: number[] = [];
    const keepU: number[] = [];
    const np = new Float64Array(dim);
    for (let a = 0; a < active.length; a++) {
      np.fill(0);
      normalAxpy(active[a], 1, np);
      HF.apply(np, hn);
      const w = new Float64Array(keep.length);
      for (let b = 0; b < keep.length; b++) w[b] = normalDot(keep[b], hn);
      const y = chol.forward(w);
      let d2 = normalDot(active[a], hn);
      for (let b = 0; b < y.length; b++) d2 -= y[b] * y[b];
      if (d2 > 1e-12 * Math.abs(normalDot(active[a], hn))) {
        chol.append(y, Math.sqrt(d2));
        keep.push(active[a]);
        keepU.push(u[a]);
      } else isActive[active[a]] = 0;
    }
    active.length = 0;
    appendAll(active, keep);
    u.length = 0;
    appendAll(u, keepU);
  };

  /** Fix bound j; w = N'H_F e_j (up to sign) and hjj = (H_F)_jj come from the caller's step. */
  const fixBound = (j: number, side: number, w: Float64Array, hjj: number): void => {
    HF.fix(j);
    fixedSide[j] = side;
    s[j] = side < 0 ? lower[j] : upper[j];
    if (active.length > 0) {
      if (!(hjj > 0)) refactor();
      else {
        const v = Float64Array.from(w);
        for (let a = 0; a < v.length; a++) v[a] /= Math.sqrt(hjj);
        if (!chol.rankOneDowndate(v)) refactor();
      }
    }
  };

  const freeBound = (j: number): void => {
    HF.free(j);
    fixedSide[j] = 0;
    uB[j] = 0;
    if (active.length > 0) {
      const { w, hjj } = boundColumn(j);
      if (hjj > 0) {
        for (let a = 0; a < w.length; a++) w[a] /= Math.sqrt(hjj);
        chol.rankOneUpdate(w);
      } else refactor();
    }
  };

  const dropGeneral = (pos: number): void => {
    isActive[active[pos]] = 0;
    active.splice(pos, 1);
    u.splice(pos, 1);
    chol.remove(pos);
  };

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
      resolve: (eRhs, iRhs) => {
        const sB = new Float64Array(dim);
        for (let j = 0; j < dim; j++) sB[j] = fixedSide[j] < 0 ? lower[j] : fixedSide[j] > 0 ? upper[j] : 0;
        const r = new Float64Array(dim);
        const h = new Float64Array(dim);
        const out = new Float64Array(dim);
        q.hessian.applyB(sB, r);
        for (let j = 0; j < dim; j++) r[j] += q.g[j];
        HF.apply(r, h);
        const k = active.length;
        const rhs = new Float64Array(k);
        for (let a = 0; a < k; a++) rhs[a] = -normalDot(active[a], h) - rhsOf(active[a], eRhs, iRhs) + normalDot(active[a], sB);
        const sol = k > 0 ? chol.solve(rhs) : rhs;
        for (let a = 0; a < k; a++) normalAxpy(active[a], sol[a], r);
        HF.apply(r, out);
        for (let j = 0; j < dim; j++) out[j] = fixedSide[j] !== 0 ? sB[j] : -out[j];
        return out;
      },
    };
    for (let a = 0; a < active.length; a++) {
      const key = active[a];
      if (key < nE) out.eq[key] = eqSign[key] * u[a];
      else out.ineq[key - nE] = u[a];
    }
    // bound multipliers from stationarity (more accurate than the running values)
    const r = new Float64Array(dim);
    q.hessian.applyB(s, r);
    for (let i = 0; i < dim; i++) r[i] += q.g[i];
    for (let a = 0; a < active.length; a++) normalAxpy(active[a], u[a], r);
    for (let j = 0; j < dim; j++) {
      if (fixedSide[j] < 0) {
        out.lower[j] = Math.max(0, r[j]);
        out.active.push(offL + j);
      } else if (fixedSide[j] > 0) {
        out.upper[j] = Math.max(0, -r[j]);
        out.active.push(offU + j);
      }
    }
    return out;
  };

  const np = new Float64Array(dim);
  let iterations = 0;
  startFromWarmSet();
  for (let i = 0; i < nE; i++) vEq[i] = rowDot(eq[i], s, base);
  for (let i = 0; i < nI; i++) vIn[i] = rowDot(ineq[i], s, base);

  /**
   * Warm start in bulk: every equality row and warm inequality row active and every warm bound
   * fixed at once, S = N'H_F N factored once, the equality-constrained QP solved; then rows and
   * bounds whose multipliers come out negative are released (all together) and the solve
   * repeated until none is. The result is a valid dual-feasible start for Goldfarb-Idnani at
   * about a third of the cost of adding the same constraints one by one.
   */
  function startFromWarmSet(): void {
    const toFix: number[] = [];
    for (let j = 0; j < dim; j++) {
      if (warm[offL + j] && lower[j] > -Infinity) fixedSide[j] = -1;
      else if (warm[offU + j] && upper[j] < Infinity) fixedSide[j] = 1;
      if (fixedSide[j] !== 0) toFix.push(j);
    }
    if (HF.fixMany) HF.fixMany(toFix);
    else for (const j of toFix) HF.fix(j);
    for (let i = 0; i < nE; i++) active.push(i);
    for (let key = nE; key < offL; key++) if (warm[key]) active.push(key);
    for (const key of active) isActive[key] = 1;
    u.length = active.length;
    u.fill(0);
    refactor();
    const sB = new Float64Array(dim);
    const r = new Float64Array(dim);
    const h = new Float64Array(dim);
    for (let round = 0; ; round++) {
      for (let j = 0; j < dim; j++) sB[j] = fixedSide[j] < 0 ? lower[j] : fixedSide[j] > 0 ? upper[j] : 0;
      // g~ = g + B sB; solve S u = -N'H_F g~ - b + N'sB; s = sB - H_F (g~ + N u)
      q.hessian.applyB(sB, r);
      for (let j = 0; j < dim; j++) r[j] += q.g[j];
      HF.apply(r, h);
      const k = active.length;
      const rhs = new Float64Array(k);
      for (let a = 0; a < k; a++) rhs[a] = -normalDot(active[a], h) - rhsOf(active[a]) + normalDot(active[a], sB);
      const sol = k > 0 ? chol.solve(rhs) : rhs;
      for (let a = 0; a < k; a++) {
        u[a] = sol[a];
        normalAxpy(active[a], sol[a], r);
      }
      HF.apply(r, s);
      for (let j = 0; j < dim; j++) s[j] = fixedSide[j] !== 0 ? sB[j] : -s[j];
      // multipliers of the bounds from stationarity: r = B s + g + N u
      q.hessian.applyB(s, r);
      for (let j = 0; j < dim; j++) r[j] += q.g[j];
      for (let a = 0; a < k; a++) normalAxpy(active[a], u[a], r);
      const giveUp = round >= 30;
      let released = 0;
      for (let a = k - 1; a >= 0; a--) {
        if (active[a] >= nE && (u[a] < 0 || giveUp)) {
          dropGeneral(a);
          released++;
        }
      }
      for (let j = 0; j < dim; j++) {
        if (fixedSide[j] === 0) continue;
        const mult = fixedSide[j] < 0 ? r[j] : -r[j];
        if (mult < 0 || giveUp) {
          freeBound(j);
          released++;
        } else uB[j] = mult;
      }
      if (released === 0) return;
      uB.fill(0);
    }
  }

  // the constraint to add next (consider), and the dual step's data (dualStep, dropBlocking)
  let p = -1;
  let pClass = 3;
  let pViol = 0;
  let up = 0;
  const w = new Float64Array(nE + nI); // N'H_F n+ over the active general rows, first k entries
  const tmp = new Float64Array(dim); // n+ - N r
  function consider(key: number, cls: number): void {
    const v = violation(key);
    if (!(v > tolOf(key)) || skipped[key]) return;
    if (cls < pClass || (cls === pClass && v > pViol)) {
      p = key;
      pClass = cls;
      pViol = v;
    }
  }
  /** Moves the multipliers by t along the dual direction: r for the active rows, side_j (tmp - Bz)_j for the bounds. */
  function dualStep(t: number, r: Float64Array): void {
    for (let a = 0; a < r.length; a++) u[a] -= t * r[a];
    for (let j = 0; j < dim; j++) if (fixedSide[j] !== 0) uB[j] = Math.max(0, uB[j] - t * fixedSide[j] * (tmp[j] - bz[j]));
    up += t;
  }
  function dropBlocking(lBound: number, lGen: number): void {
    if (lBound >= 0) freeBound(lBound);
    else dropGeneral(lGen);
  }

  for (;;) {
    // choose the next violated constraint: equalities, then the warm set, then the rest
    p = -1;
    pClass = 3;
    pViol = 0;
    for (let i = 0; i < nE; i++) if (!isActive[i]) consider(i, 0);
    if (p < 0) {
      for (let key = nE; key < offL; key++) if (!isActive[key]) consider(key, warm[key] ? 1 : 2);
      for (let j = 0; j < dim; j++) {
        if (fixedSide[j] !== 0) continue;
        if (lower[j] > -Infinity) consider(offL + j, warm[offL + j] ? 1 : 2);
        if (upper[j] < Infinity) consider(offU + j, warm[offU + j] ? 1 : 2);
      }
    }
    if (p < 0) return finish("optimal", iterations);
    if (p < nE) eqSign[p] = vEq[p] - eqRhs[p] >= 0 ? 1 : -1;
    const pBound = p >= offL ? (p < offU ? p - offL : p - offU) : -1;

    up = 0;
    for (;;) {
      if (++iterations > maxIt) return finish("iteration-limit", iterations);
      np.fill(0);
      normalAxpy(p, 1, np);
      HF.apply(np, hn);
      const k = active.length;
      for (let a = 0; a < k; a++) w[a] = normalDot(active[a], hn);
      const y = chol.forward(w);
      const r = chol.backward(y);
      tmp.set(np);
      for (let a = 0; a < k; a++) normalAxpy(active[a], -r[a], tmp);
      HF.apply(tmp, z);
      const nz = normalDot(p, z);
      const nHn = normalDot(p, hn);
      const viol = normalDot(p, s) - rhsOf(p);
      // dual direction of the fixed bounds: r_j = side_j * (tmp - B z)_j, read on them alone
      if (q.hessian.applyBRows) {
        let nFixed = 0;
        for (let j = 0; j < dim; j++) if (fixedSide[j] !== 0) fixedList[nFixed++] = j;
        q.hessian.applyBRows(z, fixedList, nFixed, bz);
      } else q.hessian.applyB(z, bz);

      let t1 = Infinity;
      let lGen = -1;
      let lBound = -1;
      for (let a = 0; a < k; a++) {
        if (active[a] < nE) continue;
        if (r[a] > 1e-14 * (1 + Math.abs(u[a]))) {
          const t = u[a] / r[a];
          if (t < t1) {
            t1 = t;
            lGen = a;
          }
        }
      }
      for (let j = 0; j < dim; j++) {
        if (fixedSide[j] === 0) continue;
        const rj = fixedSide[j] * (tmp[j] - bz[j]);
        if (rj > 1e-14 * (1 + uB[j])) {
          const t = uB[j] / rj;
          if (t < t1) {
            t1 = t;
            lGen = -1;
            lBound = j;
          }
        }
      }

      const dependent = !(nz > 1e-12 * nHn) || !(nz > 0);
      if (dependent) {
        if (t1 === Infinity) {
          // the new normal is a combination of active ones: consistent (ignore) or infeasible
          if (viol <= 1e-8 * (1 + Math.abs(rhsOf(p)))) {
            skipped[p] = 1;
            break;
          }
          return finish("infeasible", iterations);
        }
        dualStep(t1, r);
        if (lGen >= 0) u[lGen] = 0;
        dropBlocking(lBound, lGen);
        continue;
      }

      const t2 = viol / nz;
      const t = Math.min(t1, t2);
      if (t !== 0) {
        // a zero step (a multiplier already at zero) leaves s and every row value as they are
        for (let i = 0; i < dim; i++) s[i] -= t * z[i];
        for (let i = 0; i < nE; i++) vEq[i] -= t * rowDot(eq[i], z, base);
        for (let i = 0; i < nI; i++) vIn[i] -= t * rowDot(ineq[i], z, base);
      }
      dualStep(t, r);
      if (t2 <= t1) {
        if (pBound >= 0) {
          fixBound(pBound, p < offU ? -1 : 1, w.subarray(0, k), nHn);
          uB[pBound] = up;
        } else {
          chol.append(y, Math.sqrt(nz));
          active.push(p);
          u.push(up);
          isActive[p] = 1;
        }
        break;
      }
      if (lGen >= 0) u[lGen] = 0;
      dropBlocking(lBound, lGen);
    }
  }
}
