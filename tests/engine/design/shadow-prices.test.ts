// Shadow prices against finite-difference re-solves: relax one limit by a small step, solve
// again, and compare the change of the optimum with the reported price (sensitivity theorem of
// nonlinear programming: d f* / d b = -lambda for a constraint g <= b; common practice).
import { describe, expect, it } from "vitest";
import { minimize } from "~/engine/sqp";
import { buildResult, prepareRun, type OptimizeOptions } from "~/engine/design/result";
import type { TrussModel } from "~/engine/truss";
import { fixture } from "./models";

function solve(model: TrussModel, options: OptimizeOptions, relax?: { ids: string[]; delta: number }) {
  const run = prepareRun(model, { ...options, maxIterations: 400 });
  if (relax) {
    const hit = run.design.limits.filter((l) => relax.ids.includes(l.id));
    expect(hit.length).toBeGreaterThan(0);
    for (const l of hit) l.limit += relax.delta;
  }
  return buildResult(run, minimize(run.sqp, run.sqpOptions), 0);
}

// Limits that bind together by symmetry are relaxed together: their multipliers are not
// unique one by one, only their sum is.
const cases: { name: string; file: string; ids: string[]; relative: number }[] = [
  { name: "ten-bar: tip deflection limit (lb per in)", file: "ten-bar.truss.json", ids: ["displacement:1:y:LC1"], relative: 1e-3 },
  { name: "three-bar: stress allowances of the outer bars (kg per kN/cm2)", file: "three-bar.truss.json", ids: ["stress:3:left", "stress:1:right"], relative: 1e-3 },
  { name: "determinate compliance: volume limit (kip in per in3)", file: "determinate-compliance.truss.json", ids: ["volume"], relative: 1e-3 },
  { name: "two-bar with apex height: stress allowances (t per MPa)", file: "two-bar-shape.truss.json", ids: ["stress:LC:P", "stress:RC:P"], relative: 1e-3 },
];

describe("shadow prices match finite-difference re-solves", () => {
  for (const c of cases) {
    for (const formulation of ["nested", "simultaneous"] as const) {
      it(`${c.name} (${formulation})`, () => {
        const model = fixture(c.file);
        const base = solve(model, { formulation });
        expect(base.status).toBe("optimal");
        const active = base.activeConstraints.filter((a) => c.ids.includes(a.id));
        expect(active.length, `${c.ids.join(", ")} should be active`).toBe(c.ids.length);
        const price = active.reduce((s, a) => s + a.multiplier, 0);
        const limit = prepareRun(model, { formulation }).design.limits.find((l) => l.id === c.ids[0])!.limit;
        const delta = c.relative * limit;
        const up = solve(model, { formulation }, { ids: c.ids, delta });
        const down = solve(model, { formulation }, { ids: c.ids, delta: -delta });
        for (const r of [up, down]) {
          expect(r.status).toBe("optimal");
          expect(r.verification!.allLimitsMet).toBe(true);
        }
        const saving = (down.objective.final - up.objective.final) / (2 * delta);
        expect(price).toBeGreaterThan(0);
        expect(Math.abs(saving - price) / price).toBeLessThan(2e-3);
        for (const a of active.filter((a) => a.multiplier > 0)) {
          const sp = base.shadowPrices!.find((s) => s.constraint === a.id)!;
          expect(sp.multiplier).toBe(a.multiplier);
          expect(sp.unit).toMatch(/ per /);
        }
      });
    }
  }

  it("puts the three most expensive limits into plain words", () => {
    const r = solve(fixture("ten-bar.truss.json"), {});
    const worded = r.shadowPrices!.filter((s) => s.sentence);
    expect(worded.length).toBe(3);
    expect(worded[0].sentence).toMatch(/^The displacement limit of node 1 along y under Tip loads \(LC1\) governs: relaxing it by 1 in would save about [0-9.]+ lb of material/);
    expect(r.shadowPrices![0].unit).toBe("lb per in");
  });
});
