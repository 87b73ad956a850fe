// Null-space steps (sqp/reduced-space.ts) on the equality-constrained problems of the
// Hock-Schittkowski table (source: Hock & Schittkowski 1981, "Test Examples for Nonlinear
// Programming Codes"; optimal values from memory, re-checked with scipy in
// slsqp-crosscheck.test.ts). The last nEq variables are declared states, their Jacobian block
// is factored densely here, and each problem must reach the published optimum as the full
// subproblem does.
import { Matrix, LuDecomposition } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { minimize, type SqpProblem } from "~/engine/sqp";
import { barChain } from "../../../bench/sqp-bar-chain";
import { compile, hockSchittkowski, toSqpProblem, type HsProblem } from "./hock-schittkowski";

/**
 * The problem with its variables reordered so that `states` come last, declared as states;
 * their Jacobian block is factored densely with ml-matrix.
 */
function withStates(p: HsProblem, states: number[]): SqpProblem {
  const base = toSqpProblem(p);
  const eq = (p.eq ?? []).map((c) => c.jac.map(compile));
  const nD = p.n - eq.length;
  const order = [...Array.from({ length: p.n }, (_, j) => j).filter((j) => !states.includes(j)), ...states];
  const toOriginal = (x: Float64Array) => {
    const y = new Float64Array(p.n);
    order.forEach((j, k) => (y[j] = x[k]));
    return y;
  };
  const permute = (v: ArrayLike<number> | undefined, fill: number) => (v ? Float64Array.from(order, (j) => v[j]) : new Float64Array(p.n).fill(fill));
  const permuteRow = (r: Float64Array) => Float64Array.from(order, (j) => r[j]);
  return {
    ...base,
    x0: permute(base.x0, 0),
    lower: permute(base.lower, -Infinity),
    upper: permute(base.upper, Infinity),
    evaluate: (x) => base.evaluate(toOriginal(x)),
    derivatives: (x, rows) => {
      const d = base.derivatives(toOriginal(x), rows);
      return { grad: permuteRow(d.grad), eq: (d.eq ?? []).map((r) => permuteRow(r as Float64Array)), ineq: (d.ineq ?? []).map((r) => permuteRow(r as Float64Array)) };
    },
    names: { variables: order.map((j) => `x[${j}]`) },
    stateEquations: {
      nDesign: nD,
      factor(x) {
        const xs = Array.from(toOriginal(x));
        const block = new Matrix(eq.map((row) => states.map((j) => row[j](xs))));
        const lu = new LuDecomposition(block);
        const luT = new LuDecomposition(block.transpose());
        if (lu.isSingular()) throw new Error("singular state block");
        const solveWith = (f: LuDecomposition, r: Float64Array) => Float64Array.from(f.solve(Matrix.columnVector(Array.from(r))).getColumn(0));
        return { solve: (r) => solveWith(lu, r), solveTransposed: (r) => solveWith(luT, r) };
      },
    },
  };
}

// Equality-constrained problems with a choice of states whose Jacobian block stays
// nonsingular from the start to the optimum (the role the stiffness matrix plays for trusses).
const cases: [string, number[]][] = [
  ["HS006", [1]],
  ["HS028", [2]],
  ["HS048", [0, 2]],
  ["HS051", [0, 2, 4]],
  ["HS079", [2, 3, 4]],
];

describe("null-space steps on Hock-Schittkowski problems with equalities", () => {
  it.each(cases.map(([id, states]) => [id, hockSchittkowski.find((p) => p.id === id)!, states] as const))("%s reaches the published optimum", (_id, p, states) => {
    const problem = withStates(p, states);
    const reduced = minimize(problem, {});
    expect(reduced.status, reduced.message).toBe("optimal");
    expect(Math.abs(reduced.f - p.fStar) / Math.max(1, Math.abs(p.fStar))).toBeLessThan(1e-6);
    expect(reduced.maxViolation).toBeLessThan(1e-6);
    // the same multipliers as the full subproblem (sign convention of types.ts)
    const full = minimize(problem, { reducedSpace: false });
    expect(full.status).toBe("optimal");
    for (let i = 0; i < reduced.multipliers.eq.length; i++)
      expect(Math.abs(reduced.multipliers.eq[i] - full.multipliers.eq[i])).toBeLessThan(1e-4 * Math.max(1, Math.abs(full.multipliers.eq[i])));
  });

  it("refuses a declared structure that does not fit the problem, naming it", () => {
    const p = hockSchittkowski.find((q) => q.id === "HS028")!;
    const bad = { ...withStates(p, [2]), stateEquations: { nDesign: 1, factor: withStates(p, [2]).stateEquations!.factor } };
    const r = minimize(bad, {});
    expect(r.status).toBe("failed");
    expect(r.message).toMatch(/nDesign = 1 does not leave one state variable per equality/);
    const bounded = { ...withStates(p, [2]), lower: [-Infinity, -Infinity, 0] };
    expect(minimize(bounded, {}).message).toMatch(/state variable x\[2\] has a bound/);
  });

  it("reports a state block that cannot be factored as a failure with the point", () => {
    const p = hockSchittkowski.find((q) => q.id === "HS028")!;
    const base = withStates(p, [2]);
    const r = minimize({ ...base, stateEquations: { nDesign: 2, factor: () => { throw new Error("the stiffness matrix is singular"); } } }, {});
    expect(r.status).toBe("failed");
    expect(r.message).toMatch(/could not be factored at .*the stiffness matrix is singular/);
  });
});

describe("restored trial points with the state-equation residual alone", () => {
  // HS048 and HS051 have linear equalities, so their states may be declared linearInStates and
  // every trial point is restored (sqp/restoration.ts). Given stateEquations.residual, the
  // restoration reads c from it and evaluates each restored point once instead of twice: the
  // same run to the last bit, with fewer evaluations. Published optima as above.
  it.each([["HS048", [0, 2]], ["HS051", [0, 2, 4]]] as const)("%s: same iterates, fewer evaluations", (id, states) => {
    const p = hockSchittkowski.find((q) => q.id === id)!;
    const problem = withStates(p, [...states]);
    const restoring = { ...problem, stateEquations: { ...problem.stateEquations!, linearInStates: true } };
    const withResidual = { ...restoring, stateEquations: { ...restoring.stateEquations, residual: (x: Float64Array) => restoring.evaluate(x).eq! } };
    const twice = minimize(restoring, {});
    const once = minimize(withResidual, {});
    expect(once.status, once.message).toBe("optimal");
    expect(Math.abs(once.f - p.fStar) / Math.max(1, Math.abs(p.fStar))).toBeLessThan(1e-6);
    expect(once.iterations).toBe(twice.iterations);
    expect(Array.from(once.x)).toEqual(Array.from(twice.x));
    expect(once.evaluations).toBeLessThan(twice.evaluations);
  });
});

describe("null-space steps on the bar chain (simultaneous formulation of a determinate truss)", () => {
  // Closed form (common practice): a statically determinate chain's minimum-volume design is
  // fully stressed, a_j = P (N - j) / s_max, volume P / s_max * N (N + 1) / 2 (bench/sqp-bar-chain.ts).
  it.each([5, 20, 50])("N = %i reaches the fully stressed volume", (N) => {
    const { problem, volume } = barChain(N, 1, 0.01, true);
    const r = minimize(problem, { maxIterations: 100 });
    expect(r.status, r.message).toBe("optimal");
    expect(Math.abs(r.f - volume) / volume).toBeLessThan(1e-9);
    for (let j = 0; j < N; j++) expect(r.x[j]).toBeCloseTo((N - j) / 0.01, 6);
  });
});
