// The noise-floor rule of termination.ts (atNoiseFloor): a point is "optimal to the precision
// rounding allows" when every row holds to tol, complementarity to tol, stationarity only to
// sqrt(tol), the step's predicted merit decrease is below 1e-13 x (1 + |merit|), and the KKT
// measure has stopped falling. These problems pin where it may fire and where it must not.
// Expected values are closed forms worked out beside each check.
import { describe, expect, it } from "vitest";
import { minimize, type SqpProblem } from "~/engine/sqp";

const TOL = 1e-8; // the default scaled KKT tolerance (thresholds.ts)

// min 1e4 + (x0-2)^2 + (x1-1)^2 + (x2-3)^2 + 0.1 x0 x2  s.t.  x0 + x1 + x2 <= 2.
// Closed form: the row is active; stationarity 2(x0-2) + 0.1 x2 + l = 0, 2(x1-1) + l = 0,
// 2(x2-3) + 0.1 x0 + l = 0 and x0 + x1 + x2 = 2 give l = 15.01 / 5.795,
// x0 = (7.4 - 1.9 l) / 3.99, x1 = 1 - l / 2, x2 = (11.6 - 1.9 l) / 3.99.
const LAMBDA = 15.01 / 5.795;
const X_STAR = [(7.4 - 1.9 * LAMBDA) / 3.99, 1 - LAMBDA / 2, (11.6 - 1.9 * LAMBDA) / 3.99];
const offsetQuadratic = (x: ArrayLike<number>) => 1e4 + (x[0] - 2) ** 2 + (x[1] - 1) ** 2 + (x[2] - 3) ** 2 + 0.1 * x[0] * x[2];

function offsetProblem(gradient: (x: Float64Array) => Float64Array): SqpProblem {
  return {
    n: 3, x0: [0.3, 0.4, 0.5], nIneq: 1,
    evaluate: (x) => ({ f: offsetQuadratic(x), ineq: Float64Array.of(x[0] + x[1] + x[2] - 2) }),
    derivatives: (x) => ({ grad: gradient(x), ineq: [Float64Array.of(1, 1, 1)] }),
  };
}

/**
 * Forward differences with step 1e-7. The value is about 1e4, whose rounding unit is 1.8e-12,
 * so each difference quotient carries rounding error up to ~1.8e-12 / 1e-7 = 1.8e-5, different
 * at every point: noise in the gradient that no step can remove. The KKT measure cannot fall
 * below it (tol is 1e-8), while the steps that would chase it change the merit by less than its
 * rounding — the documented case of the noise-floor rule.
 */
const H = 1e-7;
function forwardDifference(x: Float64Array): Float64Array {
  const f0 = offsetQuadratic(x);
  return Float64Array.from(x, (_, j) => {
    const y = Float64Array.from(x);
    y[j] += H;
    return (offsetQuadratic(y) - f0) / H;
  });
}
const exactGradient = (x: Float64Array) => Float64Array.of(2 * (x[0] - 2) + 0.1 * x[2], 2 * (x[1] - 1), 2 * (x[2] - 3) + 0.1 * x[0]);

describe("the noise-floor rule", () => {
  it("fires where finite-difference noise keeps the KKT measure above the tolerance", () => {
    const r = minimize(offsetProblem(forwardDifference));
    expect(r.status, r.message).toBe("optimal");
    expect(r.message).toMatch(/to the precision rounding allows/);
    // the floor: the ordinary test (KKT measure <= tol) was never met
    expect(r.kktResidual).toBeGreaterThan(TOL);
    expect(r.kktResidual).toBeLessThanOrEqual(Math.sqrt(TOL));
    expect(r.maxViolation).toBeLessThanOrEqual(TOL);
    // and the point is the optimum to the noise's size (1.8e-5 over a curvature of about 2)
    for (let j = 0; j < 3; j++) expect(Math.abs(r.x[j] - X_STAR[j])).toBeLessThan(1e-4);
  });

  it("stays silent on the same problem with exact gradients: the ordinary test ends it", () => {
    // the constant 1e4 puts the predicted decrease below the merit's rounding one iteration
    // before the ordinary test holds (KKT measure 4.4e-6, then 4.2e-9): the measure is still
    // falling fast, so the rule's stall condition keeps it from ending the run there
    const r = minimize(offsetProblem(exactGradient));
    expect(r.status).toBe("optimal");
    expect(r.message).not.toMatch(/rounding/);
    expect(r.kktResidual).toBeLessThanOrEqual(TOL);
    for (let j = 0; j < 3; j++) expect(Math.abs(r.x[j] - X_STAR[j])).toBeLessThan(1e-7);
  });

  it("stays silent on a problem that merely converges slowly (a degenerate minimum)", () => {
    // min (x0-1)^4 + (x1-2)^2  s.t.  x1 <= 1, from (3, 0). Closed form: x = (1, 1), multiplier 2.
    // The quartic's curvature vanishes at the minimum, so the error in x0 falls by a factor of
    // about 2/3 per iteration and the KKT measure (4 (x0-1)^3) only linearly: the run spends
    // many iterations with the measure between tol and sqrt(tol), feasible and complementary,
    // where the rule's other conditions hold; the predicted decrease (about the measure times
    // the step, 1e-8 and more) stays measurable, so the run must go on to the ordinary test.
    const progress: { kkt: number; viol: number }[] = [];
    const r = minimize(
      {
        n: 2, x0: [3, 0], nIneq: 1,
        evaluate: (x) => ({ f: (x[0] - 1) ** 4 + (x[1] - 2) ** 2, ineq: Float64Array.of(x[1] - 1) }),
        derivatives: (x) => ({ grad: Float64Array.of(4 * (x[0] - 1) ** 3, 2 * (x[1] - 2)), ineq: [Float64Array.of(0, 1)] }),
      },
      { onProgress: (p) => progress.push({ kkt: p.kktResidual, viol: p.maxViolation }) },
    );
    const inTheRuleRange = progress.filter((p) => p.kkt > TOL && p.kkt <= Math.sqrt(TOL) && p.viol <= TOL);
    expect(inTheRuleRange.length).toBeGreaterThanOrEqual(5);
    expect(r.status).toBe("optimal");
    expect(r.message).not.toMatch(/rounding/);
    expect(r.kktResidual).toBeLessThanOrEqual(TOL);
    expect(Math.abs(r.x[1] - 1)).toBeLessThan(1e-8);
    // 4 (x0-1)^3 <= ~1e-8 leaves x0 within about 1.4e-3 of 1 (scaled units differ by the start's size)
    expect(Math.abs(r.x[0] - 1)).toBeLessThan(1e-2);
    expect(r.multipliers.ineq[0]).toBeCloseTo(2, 6);
  });
});
