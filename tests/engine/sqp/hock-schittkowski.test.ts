// Our solver on the Hock-Schittkowski table (source: Hock & Schittkowski 1981, "Test Examples
// for Nonlinear Programming Codes"; optimal values from memory, re-checked with scipy in
// slsqp-crosscheck.test.ts). Each problem from its published start point must reach the
// published optimum to 1e-6 relative (absolute where the optimum is 0), with status optimal.
import { describe, expect, it } from "vitest";
import { minimize } from "~/engine/sqp";
import { compile, hockSchittkowski, toSqpProblem } from "./hock-schittkowski";

function relErr(f: number, fStar: number): number {
  return Math.abs(f - fStar) / Math.max(1, Math.abs(fStar));
}

describe("Hock-Schittkowski table itself", () => {
  it("holds at least 20 problems, HS071 among them", () => {
    expect(hockSchittkowski.length).toBeGreaterThanOrEqual(20);
    expect(hockSchittkowski.map((p) => p.id)).toContain("HS071");
  });

  // guards the problem table: hand-derived gradients against central differences at x0
  it.each(hockSchittkowski.map((p) => [p.id, p] as const))("%s gradients match central differences", (_id, p) => {
    const x = p.x0.map((v, i) => v + 0.1 * (i + 1)); // off the start point, so zeros do not hide errors
    const check = (fn: string, dfn: string[]) => {
      const f = compile(fn);
      dfn.forEach((d, j) => {
        const h = 1e-6 * Math.max(1, Math.abs(x[j]));
        const xp = x.slice();
        const xm = x.slice();
        xp[j] += h;
        xm[j] -= h;
        const fd = (f(xp) - f(xm)) / (2 * h);
        expect(Math.abs(compile(d)(x) - fd)).toBeLessThan(1e-5 * Math.max(1, Math.abs(fd)));
      });
    };
    check(p.f, p.grad);
    for (const c of [...(p.eq ?? []), ...(p.ineq ?? [])]) check(c.c, c.jac);
  });

  it.each(hockSchittkowski.filter((p) => p.xStar).map((p) => [p.id, p] as const))("%s published x* gives the published f*", (_id, p) => {
    // xStar is rounded in the publication: agreement to 1e-5 relative is what it supports
    expect(relErr(compile(p.f)(p.xStar as number[]), p.fStar)).toBeLessThan(1e-5);
  });
});

for (const hessian of ["bfgs", "lbfgs"] as const) {
  describe(`minimize (${hessian}) on Hock-Schittkowski problems`, () => {
    it.each(hockSchittkowski.map((p) => [p.id, p] as const))("%s reaches the published optimum", (_id, p) => {
      const r = minimize(toSqpProblem(p), { hessian });
      expect(r.status, r.message).toBe("optimal");
      expect(relErr(r.f, p.fStar)).toBeLessThan(1e-6);
      expect(r.maxViolation).toBeLessThan(1e-6);
      for (let j = 0; j < p.n; j++) {
        const lo = p.lower?.[j] ?? -Infinity;
        const hi = p.upper?.[j] ?? Infinity;
        expect(r.x[j]).toBeGreaterThanOrEqual(lo ?? -Infinity);
        expect(r.x[j]).toBeLessThanOrEqual(hi ?? Infinity);
      }
      expect(r.history.length).toBe(r.iterations + 1);
    });
  });
}
