// The analytic derivatives of both formulations against central finite differences of their
// own function values (the standard check of an adjoint implementation, common practice).
import { describe, expect, it } from "vitest";
import { buildStructure } from "~/engine/truss";
import { buildDesignProblem } from "~/engine/design/problem";
import { nestedFormulation } from "~/engine/design/nested";
import { simultaneousFormulation } from "~/engine/design/simultaneous";
import type { SqpProblem, Row } from "~/engine/sqp/types";
import { fixture, mast3d, parse } from "./models";
import type { TrussModel } from "~/engine/truss";

function dense(row: Row, n: number): Float64Array {
  if (row instanceof Float64Array) return row;
  const out = new Float64Array(n);
  row.index.forEach((c, k) => (out[c] += row.value[k]));
  return out;
}

/** Deterministic pseudo-random numbers in [0, 1). */
function rng(seed: number) {
  let s = seed;
  return () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648);
}

function checkProblem(sp: SqpProblem, x: Float64Array, h: number) {
  const n = sp.n;
  const rows = Int32Array.from({ length: sp.nIneq ?? 0 }, (_, i) => i);
  const d = sp.derivatives(x, rows);
  const nEq = sp.nEq ?? 0, nIn = sp.nIneq ?? 0;
  let worst = 0;
  const scaleOf = (v: Float64Array) => Math.max(1, ...Array.from(v).map(Math.abs));
  for (let j = 0; j < n; j++) {
    const xp = Float64Array.from(x), xm = Float64Array.from(x);
    xp[j] += h; xm[j] -= h;
    const ep = sp.evaluate(xp), em = sp.evaluate(xm);
    const fd = (ep.f - em.f) / (2 * h);
    worst = Math.max(worst, Math.abs(fd - d.grad[j]) / scaleOf(d.grad));
    for (let r = 0; r < nEq; r++) {
      const row = dense(d.eq![r], n);
      const fdr = (ep.eq![r] - em.eq![r]) / (2 * h);
      worst = Math.max(worst, Math.abs(fdr - row[j]) / scaleOf(row));
    }
    for (let r = 0; r < nIn; r++) {
      const row = dense(d.ineq![r], n);
      const fdr = (ep.ineq![r] - em.ineq![r]) / (2 * h);
      worst = Math.max(worst, Math.abs(fdr - row[j]) / scaleOf(row));
    }
  }
  return worst;
}

const cases: [string, () => TrussModel][] = [
  ["ten-bar (stress, displacement)", () => fixture("ten-bar.truss.json")],
  ["two-bar with apex height", () => fixture("two-bar-shape.truss.json")],
  ["three-bar, two load cases", () => fixture("three-bar.truss.json")],
  ["determinate compliance", () => fixture("determinate-compliance.truss.json")],
  ["3D mast: shape, buckling, volume, two load cases", () => parse(mast3d())],
  ["3D mast, compliance objective", () => { const m = mast3d(); m.design!.objective = "compliance"; return parse(m); }],
];

describe("design derivatives match central differences", () => {
  for (const [name, make] of cases) {
    for (const formulation of ["nested", "simultaneous"] as const) {
      it(`${name} (${formulation})`, () => {
        const model = make();
        const p = buildDesignProblem(model, buildStructure(model), { formulation, buckling: true });
        const f = formulation === "nested" ? nestedFormulation(p) : simultaneousFormulation(p);
        const rand = rng(7);
        const x = Float64Array.from(f.problem.x0);
        // move away from the symmetric start so that no derivative vanishes by accident
        for (let k = 0; k < p.areaVars.length; k++) x[k] *= 0.7 + 0.6 * rand();
        for (let k = p.areaVars.length; k < p.nDesign; k++) x[k] = 0.3 * (rand() - 0.5);
        for (let k = p.nDesign; k < x.length; k++) x[k] *= 0.9 + 0.2 * rand();
        expect(checkProblem(f.problem, x, 1e-6)).toBeLessThan(1e-5);
      });
    }
  }
});
