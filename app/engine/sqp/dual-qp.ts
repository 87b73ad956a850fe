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
  return new DualActiveSet(q).solve();
}

/**
 * One solve's state. A class rather than closures over locals: the test and bench runner
 * (tsx) names every closure at its creation, and on small problems naming the dozen helpers
 * of each solve cost a fifth of the Hock–Schittkowski table.
 */
class DualActiveSet {
  private readonly dim: number;
  private readonly base: number;
  private readonly eq: QpRow[];
  private readonly ineq: QpRow[];
  private readonly eqRhs: Float64Array;
  private readonly ineqRhs: Float64Array;
  private readonly lower: Float64Array;
  private readonly upper: Float64Array;
  private readonly nE: number;
  private readonly nI: number;
  private readonly offL: number;
  private readonly offU: number;
  private readonly maxIt: number;
  private readonly HF: ReducedInverse;

  // general active rows (keys < offL), in factor order, and their multipliers
  private readonly active: number[] = [];
  private readonly u: number[] = [];
  private readonly isActive: Uint8Array;
  private readonly skipped: Uint8Array;
  private readonly warm: Uint8Array;
  private readonly eqSign: Float64Array;
  private readonly chol = new GrowingCholesky();
  // bounds: fixedSide[j] = -1 at lower, +1 at upper, 0 free; uB their multipliers
  private readonly fixedSide: Int8Array;
  private readonly uB: Float64Array;

  private readonly s: Float64Array;
  private readonly vEq: Float64Array;
  private readonly vIn: Float64Array;

  private readonly hn: Float64Array;
  private readonly z: Float64Array;
  private readonly bz: Float64Array;
  private readonly unit: Float64Array;
  private readonly fixedList: Int32Array; // the variables at a bound, for the dual direction
  private readonly np: Float64Array; // the normal of the constraint being added
  private readonly w: Float64Array; // N'H_F n+ over the active general rows, first k entries
  private readonly tmp: Float64Array; // n+ - N r
  private iterations = 0;
  // the constraint to add next (consider) and the multiplier it has gathered so far
  private p = -1;
  private pClass = 3;
  private pViol = 0;
  private up = 0;

  constructor(private readonly q: QpInput) {
    const { dim, base, eq, ineq, eqRhs, ineqRhs, lower, upper } = q;
    this.dim = dim;
    this.base = base;
    this.eq = eq;
    this.ineq = ineq;
    this.eqRhs = eqRhs;
    this.ineqRhs = ineqRhs;
    this.lower = lower;
    this.upper = upper;
    const nE = (this.nE = eq.length);
    const nI = (this.nI = ineq.length);
    this.offL = nE + nI;
    this.offU = this.offL + dim;
    const total = this.offU + dim;
    this.maxIt = q.maxIterations ?? 10 * (total + 10);
    this.HF = q.hessian.reduced();
    this.isActive = new Uint8Array(total);
    this.skipped = new Uint8Array(total);
    this.warm = new Uint8Array(total);
    if (q.warm) for (let k = 0; k < q.warm.length; k++) if (q.warm[k] >= 0 && q.warm[k] < total) this.warm[q.warm[k]] = 1;
    this.eqSign = new Float64Array(nE).fill(1);
    this.fixedSide = new Int8Array(dim);
    this.uB = new Float64Array(dim);
    this.s = new Float64Array(dim);
    this.vEq = new Float64Array(nE);
    this.vIn = new Float64Array(nI);
    this.hn = new Float64Array(dim);
    this.z = new Float64Array(dim);
    this.bz = new Float64Array(dim);
    this.unit = new Float64Array(dim);
    this.fixedList = new Int32Array(dim);
    this.np = new Float64Array(dim);
    this.w = new Float64Array(nE + nI);
    this.tmp = new Float64Array(dim);
  }

  private rhsOf(key: number, eRhs = this.eqRhs, iRhs = this.ineqRhs): number {
    const { nE, offL, offU } = this;
    if (key < nE) return this.eqSign[key] * eRhs[key];
    if (key < offL) return iRhs[key - nE];
    if (key < offU) return -this.lower[key - offL];
    return this.upper[key - offU];
  }

  private normalDot(key: number, v: Float64Array): number {
    const { nE, offL, offU } = this;
    if (key < nE) return this.eqSign[key] * rowDot(this.eq[key], v, this.base);
    if (key < offL) return rowDot(this.ineq[key - nE], v, this.base);
    if (key < offU) return -v[key - offL];
    return v[key - offU];
  }

  private normalAxpy(key: number, alpha: number, out: Float64Array): void {
    const { nE, offL, offU } = this;
    if (key < nE) rowAxpy(this.eq[key], alpha * this.eqSign[key], out, this.base);
    else if (key < offL) rowAxpy(this.ineq[key - nE], alpha, out, this.base);
    else if (key < offU) out[key - offL] -= alpha;
    else out[key - offU] += alpha;
  }

  private violation(key: number): number {
    const { nE, offL, offU, s } = this;
    if (key < nE) return Math.abs(this.vEq[key] - this.eqRhs[key]);
    if (key < offL) return this.vIn[key - nE] - this.ineqRhs[key - nE];
    if (key < offU) return this.lower[key - offL] - s[key - offL];
    return s[key - offU] - this.upper[key - offU];
  }

  private tolOf(key: number): number {
    return 1e-11 * (1 + Math.abs(this.rhsOf(key)));
  }

  /** w = N' H_F e_j for the active general rows, and (H_F)_jj. */
  private boundColumn(j: number): { w: Float64Array; hjj: number } {
    const { unit, hn, active } = this;
    unit.fill(0);
    unit[j] = 1;
    this.HF.apply(unit, hn);
    const w = new Float64Array(active.length);
    for (let a = 0; a < active.length; a++) w[a] = this.normalDot(active[a], hn);
    return { w, hjj: hn[j] };
  }

  /** S = N'H_F N from scratch (after a failed downdate); rows that became dependent are released. */
  private refactor(): void {
    const { chol, active, u, hn } = this;
    chol.clear();
    const keep: number[] = [];
    const keepU: number[] = [];
    const np = new Float64Array(this.dim);
    for (let a = 0; a < active.length; a++) {
      np.fill(0);
      this.normalAxpy(active[a], 1, np);
      this.HF.apply(np, hn);
      const w = new Float64Array(keep.length);
      for (let b = 0; b < keep.length; b++) w[b] = this.normalDot(keep[b], hn);
      const y = chol.forward(w);
      let d2 = this.normalDot(active[a], hn);
      for (let b = 0; b < y.length; b++) d2 -= y[b] * y[b];
      if (d2 > 1e-12 * Math.abs(this.normalDot(active[a], hn))) {
        chol.append(y, Math.sqrt(d2));
        keep.push(active[a]);
        keepU.push(u[a]);
      } else this.isActive[active[a]] = 0;
    }
    active.length = 0;
    appendAll(active, keep);
    u.length = 0;
    appendAll(u, keepU);
  }

  /** Fix bound j; w = N'H_F e_j (up to sign) and hjj = (H_F)_jj come from the caller's step. */
  private fixBound(j: number, side: number, w: Float64Array, hjj: number): void {
    this.HF.fix(j);
    this.fixedSide[j] = side;
    this.s[j] = side < 0 ? this.lower[j] : this.upper[j];
    if (this.active.length > 0) {
      if (!(hjj > 0)) this.refactor();
      else {
        const v = Float64Array.from(w);
        for (let a = 0; a < v.length; a++) v[a] /= Math.sqrt(hjj);
        if (!this.chol.rankOneDowndate(v)) this.refactor();
      }
    }
  }

  private freeBound(j: number): void {
    this.HF.free(j);
    this.fixedSide[j] = 0;
    this.uB[j] = 0;
    if (this.active.length > 0) {
      const { w, hjj } = this.boundColumn(j);
      if (hjj > 0) {
        for (let a = 0; a < w.length; a++) w[a] /= Math.sqrt(hjj);
        this.chol.rankOneUpdate(w);
      } else this.refactor();
    }
  }

  private dropGeneral(pos: number): void {
    this.isActive[this.active[pos]] = 0;
    this.active.splice(pos, 1);
    this.u.splice(pos, 1);
    this.chol.remove(pos);
  }

  /** The equality-constrained solution for new right-hand sides with the final active set (QpOutput.resolve). */
  private resolve(eRhs: Float64Array, iRhs: Float64Array): Float64Array {
    const { dim, fixedSide, lower, upper, q, HF, active } = this;
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
    for (let a = 0; a < k; a++) rhs[a] = -this.normalDot(active[a], h) - this.rhsOf(active[a], eRhs, iRhs) + this.normalDot(active[a], sB);
    const sol = k > 0 ? this.chol.solve(rhs) : rhs;
    for (let a = 0; a < k; a++) this.normalAxpy(active[a], sol[a], r);
    HF.apply(r, out);
    for (let j = 0; j < dim; j++) out[j] = fixedSide[j] !== 0 ? sB[j] : -out[j];
    return out;
  }

  private finish(status: QpOutput["status"]): QpOutput {
    const { dim, nE, nI, active, u, eqSign, fixedSide, q, offL, offU } = this;
    const out: QpOutput = {
      status,
      s: this.s,
      eq: new Float64Array(nE),
      ineq: new Float64Array(nI),
      lower: new Float64Array(dim),
      upper: new Float64Array(dim),
      active: active.slice(),
      iterations: this.iterations,
      resolve: (eRhs, iRhs) => this.resolve(eRhs, iRhs),
    };
    for (let a = 0; a < active.length; a++) {
      const key = active[a];
      if (key < nE) out.eq[key] = eqSign[key] * u[a];
      else out.ineq[key - nE] = u[a];
    }
    // bound multipliers from stationarity (more accurate than the running values)
    const r = new Float64Array(dim);
    q.hessian.applyB(this.s, r);
    for (let i = 0; i < dim; i++) r[i] += q.g[i];
    for (let a = 0; a < active.length; a++) this.normalAxpy(active[a], u[a], r);
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
  }

  /**
   * Warm start in bulk: every equality row and warm inequality row active and every warm bound
   * fixed at once, S = N'H_F N factored once, the equality-constrained QP solved; then rows and
   * bounds whose multipliers come out negative are released (all together) and the solve
   * repeated until none is. The result is a valid dual-feasible start for Goldfarb-Idnani at
   * about a third of the cost of adding the same constraints one by one.
   */
  private startFromWarmSet(): void {
    const { dim, nE, offL, offU, warm, lower, upper, fixedSide, HF, active, u, isActive, q, s, uB } = this;
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
    this.refactor();
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
      for (let a = 0; a < k; a++) rhs[a] = -this.normalDot(active[a], h) - this.rhsOf(active[a]) + this.normalDot(active[a], sB);
      const sol = k > 0 ? this.chol.solve(rhs) : rhs;
      for (let a = 0; a < k; a++) {
        u[a] = sol[a];
        this.normalAxpy(active[a], sol[a], r);
      }
      HF.apply(r, s);
      for (let j = 0; j < dim; j++) s[j] = fixedSide[j] !== 0 ? sB[j] : -s[j];
      // multipliers of the bounds from stationarity: r = B s + g + N u
      q.hessian.applyB(s, r);
      for (let j = 0; j < dim; j++) r[j] += q.g[j];
      for (let a = 0; a < k; a++) this.normalAxpy(active[a], u[a], r);
      const giveUp = round >= 30;
      let released = 0;
      for (let a = k - 1; a >= 0; a--) {
        if (active[a] >= nE && (u[a] < 0 || giveUp)) {
          this.dropGeneral(a);
          released++;
        }
      }
      for (let j = 0; j < dim; j++) {
        if (fixedSide[j] === 0) continue;
        const mult = fixedSide[j] < 0 ? r[j] : -r[j];
        if (mult < 0 || giveUp) {
          this.freeBound(j);
          released++;
        } else uB[j] = mult;
      }
      if (released === 0) return;
      uB.fill(0);
    }
  }

  private consider(key: number, cls: number): void {
    const v = this.violation(key);
    if (!(v > this.tolOf(key)) || this.skipped[key]) return;
    if (cls < this.pClass || (cls === this.pClass && v > this.pViol)) {
      this.p = key;
      this.pClass = cls;
      this.pViol = v;
    }
  }

  /** Moves the multipliers by t along the dual direction: r for the active rows, side_j (tmp - Bz)_j for the bounds. */
  private dualStep(t: number, r: Float64Array): void {
    const { u, uB, fixedSide, tmp, bz, dim } = this;
    for (let a = 0; a < r.length; a++) u[a] -= t * r[a];
    for (let j = 0; j < dim; j++) if (fixedSide[j] !== 0) uB[j] = Math.max(0, uB[j] - t * fixedSide[j] * (tmp[j] - bz[j]));
    this.up += t;
  }

  private dropBlocking(lBound: number, lGen: number): void {
    if (lBound >= 0) this.freeBound(lBound);
    else this.dropGeneral(lGen);
  }

  solve(): QpOutput {
    const { dim, base, eq, ineq, nE, nI, offL, offU, eqRhs, lower, upper, warm, isActive, fixedSide, eqSign, vEq, vIn, s } = this;
    const { HF, active, u, chol, np, hn, z, bz, w, tmp, uB, q } = this;
    this.startFromWarmSet();
    for (let i = 0; i < nE; i++) vEq[i] = rowDot(eq[i], s, base);
    for (let i = 0; i < nI; i++) vIn[i] = rowDot(ineq[i], s, base);

    for (;;) {
      // choose the next violated constraint: equalities, then the warm set, then the rest
      this.p = -1;
      this.pClass = 3;
      this.pViol = 0;
      for (let i = 0; i < nE; i++) if (!isActive[i]) this.consider(i, 0);
      if (this.p < 0) {
        for (let key = nE; key < offL; key++) if (!isActive[key]) this.consider(key, warm[key] ? 1 : 2);
        for (let j = 0; j < dim; j++) {
          if (fixedSide[j] !== 0) continue;
          if (lower[j] > -Infinity) this.consider(offL + j, warm[offL + j] ? 1 : 2);
          if (upper[j] < Infinity) this.consider(offU + j, warm[offU + j] ? 1 : 2);
        }
      }
      const p = this.p;
      if (p < 0) return this.finish("optimal");
      if (p < nE) eqSign[p] = vEq[p] - eqRhs[p] >= 0 ? 1 : -1;
      const pBound = p >= offL ? (p < offU ? p - offL : p - offU) : -1;

      this.up = 0;
      for (;;) {
        if (++this.iterations > this.maxIt) return this.finish("iteration-limit");
        np.fill(0);
        this.normalAxpy(p, 1, np);
        HF.apply(np, hn);
        const k = active.length;
        for (let a = 0; a < k; a++) w[a] = this.normalDot(active[a], hn);
        const y = chol.forward(w);
        const r = chol.backward(y);
        for (let i = 0; i < dim; i++) tmp[i] = np[i]; // a loop: TypedArray.set costs more at these sizes
        for (let a = 0; a < k; a++) this.normalAxpy(active[a], -r[a], tmp);
        HF.apply(tmp, z);
        const nz = this.normalDot(p, z);
        const nHn = this.normalDot(p, hn);
        const viol = this.normalDot(p, s) - this.rhsOf(p);
        // dual direction of the fixed bounds: r_j = side_j * (tmp - B z)_j, read on them alone
        if (q.hessian.applyBRows) {
          let nFixed = 0;
          for (let j = 0; j < dim; j++) if (fixedSide[j] !== 0) this.fixedList[nFixed++] = j;
          q.hessian.applyBRows(z, this.fixedList, nFixed, bz);
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
            if (viol <= 1e-8 * (1 + Math.abs(this.rhsOf(p)))) {
              this.skipped[p] = 1;
              break;
            }
            return this.finish("infeasible");
          }
          this.dualStep(t1, r);
          if (lGen >= 0) u[lGen] = 0;
          this.dropBlocking(lBound, lGen);
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
        this.dualStep(t, r);
        if (t2 <= t1) {
          if (pBound >= 0) {
            this.fixBound(pBound, p < offU ? -1 : 1, w.subarray(0, k), nHn);
            uB[pBound] = this.up;
          } else {
            chol.append(y, Math.sqrt(nz));
            active.push(p);
            u.push(this.up);
            isActive[p] = 1;
          }
          break;
        }
        if (lGen >= 0) u[lGen] = 0;
        this.dropBlocking(lBound, lGen);
      }
    }
  }
}
