// Cross-check against scipy.optimize.minimize(method="SLSQP") (Debian's python3-scipy or any
// python3 with scipy), run by tests/python/slsqp_hs.py on the same table expressions:
//  - scipy's optimum must agree with the published one (double-checks each value we wrote
//    from memory of Hock & Schittkowski 1981),
//  - our optimum must agree with scipy's to 1e-6 relative,
//  - our iteration count must stay within a small factor of scipy's (both are quasi-Newton SQP).
// Without scipy the check is skipped with a loud console message.
import { describe, expect, it } from "vitest";
import { minimize } from "~/engine/sqp";
import { hockSchittkowski, toSqpProblem } from "./hock-schittkowski";
import { findScipy, loudSkip, runSlsqp } from "./scipy-reference";

// Where scipy SLSQP (1.10 and 1.17 seen) ends elsewhere from the published start, with why.
const scipyEndsElsewhere: Record<string, string> = {
  // SLSQP reports success at f = 4.94 with x1 = -1.21 on the bound x2 = 1.5, a point that is not
  // the published minimizer (1.2244, 1.5), f = 0.0504; our solver reaches the published one.
  HS002: "other point",
};

const scipy = findScipy();
if (!scipy) loudSkip("SLSQP cross-check (tests/engine/sqp/slsqp-crosscheck.test.ts)");

describe.skipIf(!scipy)(`cross-check with scipy ${scipy?.version ?? ""} SLSQP`, () => {
  const runs = scipy ? runSlsqp(hockSchittkowski) : [];
  const byId = new Map(runs.map((r) => [r.id, r]));

  it.each(hockSchittkowski.map((p) => [p.id, p] as const))("%s: published optimum, scipy and ours agree", (_id, p) => {
    const ref = byId.get(p.id);
    expect(ref, "scipy result").toBeDefined();
    if (!ref) return;
    const scale = Math.max(1, Math.abs(p.fStar));
    const ours = minimize(toSqpProblem(p));
    expect(ours.status).toBe("optimal");
    if (scipyEndsElsewhere[p.id]) {
      expect(Math.abs(ref.fun - p.fStar) / scale).toBeGreaterThan(1e-6); // still true, else drop the exception
      expect(Math.abs(ours.f - p.fStar) / scale).toBeLessThan(1e-6);
      return;
    }
    // scipy SLSQP reaches the value we recorded from the publication (even where it stops
    // with a line-search or iteration-limit message, as on HS007 and HS010 with ftol 1e-12)
    expect(Math.abs(ref.fun - p.fStar) / scale, ref.message).toBeLessThan(1e-6);
    expect(Math.abs(ours.f - ref.fun) / scale).toBeLessThan(1e-6);
    // iteration counts: same family of method, so within 3x + 5 of scipy's where it converged
    if (ref.success) expect(ours.iterations).toBeLessThanOrEqual(3 * ref.nit + 5);
  });
});
