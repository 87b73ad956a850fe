// The user's problem seen in the solver's scaled space, with every value checked.
//
// Scaling (fixed once, at the projected start point x0):
//   variables     x = d .* xs, d_j = |x0_j| if nonzero, else the larger finite bound magnitude,
//                 else 1 — so variables of size 1e-6 and 1e6 both become O(1);
//   objective     fs = f * sf, sf = 1/||grad fs||inf (clamped to [1e-8, 1e6]; 1 if that norm
//                 is below 1e-6, i.e. the start is already nearly stationary);
//   constraints   cs_i = c_i * sc_i, sc_i = 1/||grad cs_i||inf (clamped to [1e-8, 1e8]; 1 for
//                 a row with zero gradient) — a scaled value is then roughly the distance to
//                 the constraint's boundary in scaled variables. Inequality rows are
//                 amplified at most 10 times (sc_i <= MAX_INEQUALITY_SCALE, thresholds.ts).
// Results are mapped back (x, f, constraint values, multipliers) before they leave the solver.
import { type QpRow, scaleUserRow, userRowNormInf } from "./rows";
import { MAX_INEQUALITY_SCALE } from "./thresholds";
import type { Row, SqpProblem } from "./types";

export interface ScaledPoint {
  f: number;
  ce: Float64Array;
  ci: Float64Array;
  fRaw: number;
  eqRaw: Float64Array;
  ineqRaw: Float64Array;
}

export interface ScaledDerivatives {
  g: Float64Array;
  je: QpRow[];
  /** Indexed by inequality row; null where the row was not requested. */
  ji: (QpRow | null)[];
}

export type Checked<T> = { ok: true; value: T } | { ok: false; message: string };

function clamp(v: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, v));
}

export class ScaledProblem {
  readonly n: number;
  readonly nEq: number;
  readonly nIneq: number;
  readonly d: Float64Array;
  readonly lo: Float64Array;
  readonly hi: Float64Array;
  fScale = 1;
  eqScale: Float64Array;
  inScale: Float64Array;
  evaluations = 0;
  derivativeEvaluations = 0;

  constructor(readonly problem: SqpProblem, x0: Float64Array, lower: Float64Array, upper: Float64Array) {
    const n = (this.n = problem.n);
    this.nEq = problem.nEq ?? 0;
    this.nIneq = problem.nIneq ?? 0;
    this.d = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      let dj = Math.abs(x0[j]);
      if (!(dj > 0)) {
        const b = Math.max(Number.isFinite(lower[j]) ? Math.abs(lower[j]) : 0, Number.isFinite(upper[j]) ? Math.abs(upper[j]) : 0);
        dj = b > 0 ? b : 1;
      }
      this.d[j] = clamp(dj, 1e-300, 1e300);
    }
    this.lo = new Float64Array(n);
    this.hi = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      this.lo[j] = lower[j] / this.d[j];
      this.hi[j] = upper[j] / this.d[j];
    }
    this.eqScale = new Float64Array(this.nEq).fill(1);
    this.inScale = new Float64Array(this.nIneq).fill(1);
  }

  toUser(xs: Float64Array): Float64Array {
    const x = new Float64Array(this.n);
    for (let j = 0; j < this.n; j++) x[j] = xs[j] * this.d[j];
    return x;
  }

  variableName(j: number): string {
    return this.problem.names?.variables?.[j] ?? `x[${j}]`;
  }
  eqName(i: number): string {
    const nm = this.problem.names?.eq?.(i);
    return nm ? `equality constraint '${nm}'` : `equality constraint ${i}`;
  }
  ineqName(i: number): string {
    const nm = this.problem.names?.ineq?.(i);
    return nm ? `inequality constraint '${nm}'` : `inequality constraint ${i}`;
  }

  describePoint(xs: Float64Array): string {
    const x = this.toUser(xs);
    const shown = Math.min(this.n, 6);
    const parts: string[] = [];
    for (let j = 0; j < shown; j++) parts.push(`${this.variableName(j)} = ${x[j].toPrecision(6)}`);
    if (this.n > shown) parts.push(`… (${this.n} variables)`);
    return parts.join(", ");
  }

  /** " at <the point>" for a message; formatted only when a check fails (at every call it cost more than the checks). */
  private at(xs: Float64Array): string {
    return ` at ${this.describePoint(xs)}`;
  }

  private static rethrowAbort(e: unknown): void {
    if (e instanceof Error && e.name === "AbortError") throw e;
  }

  evaluate(xs: Float64Array): Checked<ScaledPoint> {
    const x = this.toUser(xs);
    this.evaluations++;
    let out: ReturnType<SqpProblem["evaluate"]>;
    try {
      out = this.problem.evaluate(x);
    } catch (e) {
      ScaledProblem.rethrowAbort(e);
      return { ok: false, message: `The problem's evaluate() stopped with an error at ${this.describePoint(xs)}: ${e instanceof Error ? e.message : String(e)}.` };
    }
    if (!out || typeof out.f !== "number" || !Number.isFinite(out.f)) return { ok: false, message: `The objective returned ${out ? String(out.f) : "nothing"}${this.at(xs)}.` };
    const eqRaw = out.eq ?? new Float64Array(0);
    const ineqRaw = out.ineq ?? new Float64Array(0);
    if (eqRaw.length !== this.nEq) return { ok: false, message: `evaluate() returned ${eqRaw.length} equality values, but the problem declares nEq = ${this.nEq}.` };
    if (ineqRaw.length !== this.nIneq) return { ok: false, message: `evaluate() returned ${ineqRaw.length} inequality values, but the problem declares nIneq = ${this.nIneq}.` };
    const ce = new Float64Array(this.nEq);
    for (let i = 0; i < this.nEq; i++) {
      if (!Number.isFinite(eqRaw[i])) return { ok: false, message: `The ${this.eqName(i)} returned ${eqRaw[i]}${this.at(xs)}.` };
      ce[i] = eqRaw[i] * this.eqScale[i];
    }
    const ci = new Float64Array(this.nIneq);
    for (let i = 0; i < this.nIneq; i++) {
      if (!Number.isFinite(ineqRaw[i])) return { ok: false, message: `The ${this.ineqName(i)} returned ${ineqRaw[i]}${this.at(xs)}.` };
      ci[i] = ineqRaw[i] * this.inScale[i];
    }
    return { ok: true, value: { f: out.f * this.fScale, ce, ci, fRaw: out.f, eqRaw: Float64Array.from(eqRaw), ineqRaw: Float64Array.from(ineqRaw) } };
  }

  /**
   * The scaled state-equation residual ce at xs from the problem's stateEquations.residual;
   * null when the problem has none or returned a value evaluate() would reject (evaluate then
   * reads the point and names the fault).
   */
  stateResidual(xs: Float64Array): Float64Array | null {
    const residual = this.problem.stateEquations?.residual;
    if (!residual) return null;
    let raw: Float64Array;
    try {
      raw = residual(this.toUser(xs));
    } catch (e) {
      ScaledProblem.rethrowAbort(e);
      return null;
    }
    if (!raw || raw.length !== this.nEq) return null;
    const ce = new Float64Array(this.nEq);
    for (let i = 0; i < this.nEq; i++) {
      if (!Number.isFinite(raw[i])) return null;
      ce[i] = raw[i] * this.eqScale[i];
    }
    return ce;
  }

  private rawDerivatives(xs: Float64Array, rows: Int32Array): Checked<{ grad: Float64Array; eq: Row[]; ineq: Row[] }> {
    const x = this.toUser(xs);
    this.derivativeEvaluations++;
    let out: ReturnType<SqpProblem["derivatives"]>;
    try {
      out = this.problem.derivatives(x, rows);
    } catch (e) {
      ScaledProblem.rethrowAbort(e);
      return { ok: false, message: `The problem's derivatives() stopped with an error at ${this.describePoint(xs)}: ${e instanceof Error ? e.message : String(e)}.` };
    }
    const grad = out?.grad;
    if (!grad || grad.length !== this.n) return { ok: false, message: `derivatives() returned an objective gradient with ${grad ? grad.length : 0} entries instead of ${this.n}.` };
    for (let j = 0; j < this.n; j++) if (!Number.isFinite(grad[j])) return { ok: false, message: `The objective gradient with respect to ${this.variableName(j)} is ${grad[j]}${this.at(xs)}.` };
    const eq = out.eq ?? [];
    const ineq = out.ineq ?? [];
    if (eq.length !== this.nEq) return { ok: false, message: `derivatives() returned ${eq.length} equality gradient rows instead of ${this.nEq}.` };
    if (ineq.length !== rows.length) return { ok: false, message: `derivatives() returned ${ineq.length} inequality gradient rows, but ${rows.length} were requested.` };
    return { ok: true, value: { grad, eq, ineq } };
  }

  /** Fixes the objective and row scales from the derivatives at the start point (all rows). */
  calibrate(xs: Float64Array): Checked<ScaledDerivatives> {
    const all = new Int32Array(this.nIneq);
    for (let i = 0; i < this.nIneq; i++) all[i] = i;
    const raw = this.rawDerivatives(xs, all);
    if (!raw.ok) return raw;
    let gn = 0;
    for (let j = 0; j < this.n; j++) gn = Math.max(gn, Math.abs(raw.value.grad[j] * this.d[j]));
    this.fScale = gn > 1e-6 ? clamp(1 / gn, 1e-8, 1e6) : 1;
    for (let i = 0; i < this.nEq; i++) {
      const r = raw.value.eq[i];
      const m = r ? userRowNormInf(r, this.d) : 0;
      this.eqScale[i] = m > 0 && Number.isFinite(m) ? clamp(1 / m, 1e-8, 1e8) : 1;
    }
    for (let i = 0; i < this.nIneq; i++) {
      const r = raw.value.ineq[i];
      const m = r ? userRowNormInf(r, this.d) : 0;
      // amplified at most MAX_INEQUALITY_SCALE times: a row whose gradient is small at the start
      // is far from binding there (a member's stress at 1 % of its allowable); scaled by
      // 1/|gradient| its violations weighed 100 times in the merit and the line search crawled
      this.inScale[i] = m > 0 && Number.isFinite(m) ? clamp(1 / m, 1e-8, MAX_INEQUALITY_SCALE) : 1;
    }
    return this.scaleDerivatives(xs, raw.value, all);
  }

  derivatives(xs: Float64Array, rows: Int32Array): Checked<ScaledDerivatives> {
    const raw = this.rawDerivatives(xs, rows);
    if (!raw.ok) return raw;
    return this.scaleDerivatives(xs, raw.value, rows);
  }

  private scaleDerivatives(xs: Float64Array, raw: { grad: Float64Array; eq: Row[]; ineq: Row[] }, rows: Int32Array): Checked<ScaledDerivatives> {
    const g = new Float64Array(this.n);
    for (let j = 0; j < this.n; j++) g[j] = raw.grad[j] * this.d[j] * this.fScale;
    const je: QpRow[] = [];
    for (let i = 0; i < this.nEq; i++) {
      const r = scaleUserRow(raw.eq[i], this.n, this.eqScale[i], this.d);
      if (typeof r === "string") return { ok: false, message: `The gradient row of the ${this.eqName(i)} ${r}${this.at(xs)}.` };
      je.push(r);
    }
    const ji: (QpRow | null)[] = new Array(this.nIneq).fill(null);
    for (let k = 0; k < rows.length; k++) {
      const i = rows[k];
      const r = scaleUserRow(raw.ineq[k], this.n, this.inScale[i], this.d);
      if (typeof r === "string") return { ok: false, message: `The gradient row of the ${this.ineqName(i)} ${r}${this.at(xs)}.` };
      ji[i] = r;
    }
    return { ok: true, value: { g, je, ji } };
  }
}
