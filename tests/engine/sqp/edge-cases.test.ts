// Edge cases of minimize(): each expected value is a closed-form solution worked out beside the
// check, or a Hock-Schittkowski optimum (Hock & Schittkowski 1981, values from memory, also
// re-checked against scipy in slsqp-crosscheck.test.ts).
import { describe, expect, it } from "vitest";
import { minimize, type SqpProblem } from "~/engine/sqp";
import { hockSchittkowski, toSqpProblem } from "./hock-schittkowski";

const hs = (id: string) => {
  const p = hockSchittkowski.find((q) => q.id === id);
  if (!p) throw new Error(id);
  return p;
};
const HS071_F = 17.0140173; // Hock & Schittkowski 1981, problem 71 (from memory)

/** Records every point the solver asks the user's functions about. */
function recording(p: SqpProblem): { problem: SqpProblem; points: Float64Array[] } {
  const points: Float64Array[] = [];
  return {
    points,
    problem: {
      ...p,
      evaluate: (x) => {
        points.push(Float64Array.from(x));
        return p.evaluate(x);
      },
      derivatives: (x, rows) => {
        points.push(Float64Array.from(x));
        return p.derivatives(x, rows);
      },
    },
  };
}

describe("infeasible problems come back infeasible", () => {
  it("disk x^2 + y^2 <= 1 against half-plane x + y >= 3 (closed form: no common point)", () => {
    const r = minimize({
      n: 2, x0: [0, 0], nIneq: 2,
      evaluate: (x) => ({ f: x[0] + 2 * x[1], ineq: Float64Array.of(x[0] ** 2 + x[1] ** 2 - 1, 3 - x[0] - x[1]) }),
      derivatives: (x, rows) => ({
        grad: Float64Array.of(1, 2),
        ineq: Array.from(rows, (i) => (i === 0 ? Float64Array.of(2 * x[0], 2 * x[1]) : Float64Array.of(-1, -1))),
      }),
      names: { ineq: (i) => (i === 0 ? "disk" : "half-plane") },
    });
    expect(r.status).toBe("infeasible");
    expect(r.maxViolation).toBeGreaterThan(0.1);
    // least violation of the l1 sum: the point of the disk nearest the line, (1/sqrt2, 1/sqrt2),
    // leaves the half-plane off by 3 - sqrt2 (closed form); accept the neighbourhood of it
    expect(r.x[0] + r.x[1]).toBeGreaterThan(1.3);
    expect(r.message).toMatch(/disk|half-plane/);
    expect(r.hint.length).toBeGreaterThan(10);
    expect(Number.isFinite(r.f)).toBe(true);
  });

  it("contradictory linear rows x <= 0 and x >= 1", () => {
    const r = minimize({
      n: 1, x0: [5], nIneq: 2,
      evaluate: (x) => ({ f: x[0] ** 2, ineq: Float64Array.of(x[0], 1 - x[0]) }),
      derivatives: (x, rows) => ({ grad: Float64Array.of(2 * x[0]), ineq: Array.from(rows, (i) => Float64Array.of(i === 0 ? 1 : -1)) }),
    });
    expect(r.status).toBe("infeasible");
    // least total violation max(0,x) + max(0,1-x) = 1 on all of [0, 1] (closed form)
    expect(r.x[0]).toBeGreaterThanOrEqual(-1e-6);
    expect(r.x[0]).toBeLessThanOrEqual(1 + 1e-6);
  });

  it("equality outside the bounds: x^2 = 4 with 0 <= x <= 1", () => {
    const r = minimize({
      n: 1, x0: [0.5], lower: [0], upper: [1], nEq: 1,
      evaluate: (x) => ({ f: x[0], eq: Float64Array.of(x[0] ** 2 - 4) }),
      derivatives: (x) => ({ grad: Float64Array.of(1), eq: [Float64Array.of(2 * x[0])] }),
    });
    expect(r.status).toBe("infeasible");
    expect(r.x[0]).toBeCloseTo(1, 6); // nearest admissible point to x = 2 (closed form)
  });
});

describe("redundant and degenerate constraints", () => {
  it("HS028 with its equality repeated and doubled", () => {
    const base = toSqpProblem(hs("HS028"));
    const r = minimize({
      ...base, nEq: 3,
      evaluate: (x) => {
        const c = base.evaluate(x).eq?.[0] ?? 0;
        return { f: base.evaluate(x).f, eq: Float64Array.of(c, c, 2 * c) };
      },
      derivatives: (x, rows) => {
        const d = base.derivatives(x, rows);
        const j = d.eq?.[0] as Float64Array;
        return { grad: d.grad, eq: [j, Float64Array.from(j), j.map((v) => 2 * v)] };
      },
    });
    expect(r.status, r.message).toBe("optimal");
    expect(Math.abs(r.f)).toBeLessThan(1e-6); // HS028: f* = 0 at (0.5, -0.5, 0.5)
    expect(r.x[0]).toBeCloseTo(0.5, 5);
  });

  it("HS048 plus the sum of its two equalities as a third row", () => {
    const base = toSqpProblem(hs("HS048"));
    const r = minimize({
      ...base, nEq: 3,
      evaluate: (x) => {
        const e = base.evaluate(x);
        const c = e.eq as Float64Array;
        return { f: e.f, eq: Float64Array.of(c[0], c[1], c[0] + c[1]) };
      },
      derivatives: (x, rows) => {
        const d = base.derivatives(x, rows);
        const [a, b] = d.eq as Float64Array[];
        return { grad: d.grad, eq: [a, b, a.map((v, k) => v + b[k])] };
      },
    });
    expect(r.status, r.message).toBe("optimal");
    expect(Math.abs(r.f)).toBeLessThan(1e-6); // HS048: f* = 0 at x = 1
  });

  it("three constraints active at one point of the plane: x + y <= 1, x <= 0.5, y <= 0.5", () => {
    // min (x-1)^2 + (y-1)^2: projection of (1,1) onto the set is (0.5, 0.5), f = 0.5 (closed form)
    const r = minimize({
      n: 2, x0: [-2, 0], nIneq: 3,
      evaluate: (x) => ({ f: (x[0] - 1) ** 2 + (x[1] - 1) ** 2, ineq: Float64Array.of(x[0] + x[1] - 1, x[0] - 0.5, x[1] - 0.5) }),
      derivatives: (x, rows) => ({
        grad: Float64Array.of(2 * (x[0] - 1), 2 * (x[1] - 1)),
        ineq: Array.from(rows, (i) => [Float64Array.of(1, 1), Float64Array.of(1, 0), Float64Array.of(0, 1)][i]),
      }),
    });
    expect(r.status, r.message).toBe("optimal");
    expect(r.f).toBeCloseTo(0.5, 8);
    expect(r.x[0]).toBeCloseTo(0.5, 7);
    expect(r.x[1]).toBeCloseTo(0.5, 7);
  });

  it("a bound and an identical inequality row active together", () => {
    // min -x s.t. x <= 2 (row) and x <= 2 (bound): x = 2, f = -2 (closed form)
    const r = minimize({
      n: 1, x0: [0], upper: [2], nIneq: 1,
      evaluate: (x) => ({ f: -x[0], ineq: Float64Array.of(x[0] - 2) }),
      derivatives: () => ({ grad: Float64Array.of(-1), ineq: [Float64Array.of(1)] }),
    });
    expect(r.status).toBe("optimal");
    expect(r.x[0]).toBeCloseTo(2, 10);
    // multipliers split between row and bound but sum to 1 (stationarity: -1 + l + u = 0)
    expect(r.multipliers.ineq[0] + r.multipliers.upper[0]).toBeCloseTo(1, 8);
  });
});

describe("start points", () => {
  it("at the optimum of HS071: no or one iteration", () => {
    const first = minimize(toSqpProblem(hs("HS071")), { tolerance: 1e-12 });
    const r = minimize({ ...toSqpProblem(hs("HS071")), x0: first.x });
    expect(r.status).toBe("optimal");
    expect(r.iterations).toBeLessThanOrEqual(1);
    expect(Math.abs(r.f - HS071_F) / HS071_F).toBeLessThan(1e-6);
  });

  it("at the unconstrained minimum of the Rosenbrock function (1, 1): zero iterations", () => {
    const p = toSqpProblem(hs("HS001"));
    const r = minimize({ ...p, lower: undefined, x0: [1, 1] });
    expect(r.status).toBe("optimal");
    expect(r.iterations).toBe(0);
    expect(r.f).toBe(0);
  });

  it("outside the bounds: projected, and no point outside the bounds is ever evaluated", () => {
    const base = toSqpProblem(hs("HS071"));
    const rec = recording({ ...base, x0: [-10, 20, 6, 0] }); // projects onto the published start (1, 5, 5, 1)
    const r = minimize(rec.problem);
    expect(r.status, r.message).toBe("optimal");
    expect(Math.abs(r.f - HS071_F) / HS071_F).toBeLessThan(1e-6);
    for (const x of rec.points) for (const v of x) {
      expect(v).toBeGreaterThanOrEqual(1);
      expect(v).toBeLessThanOrEqual(5);
    }
  });

  it("every point requested on the bounded table problems lies inside the bounds", () => {
    for (const p of hockSchittkowski.filter((q) => q.lower || q.upper)) {
      for (const hessian of ["bfgs", "lbfgs"] as const) {
        const rec = recording(toSqpProblem(p));
        minimize(rec.problem, { hessian });
        for (const x of rec.points)
          x.forEach((v, j) => {
            expect(v).toBeGreaterThanOrEqual(p.lower?.[j] ?? -Infinity);
            expect(v).toBeLessThanOrEqual(p.upper?.[j] ?? Infinity);
          });
      }
    }
  });
});

describe("badly scaled problems", () => {
  // HS071 in variables x_j = s_j z_j with s = (1e-6, 1e6, 1e-6, 1e6), objective times 1e9,
  // constraints times 1e-7 and 1e5: the same optimum after unscaling.
  const s = [1e-6, 1e6, 1e-6, 1e6];
  const base = toSqpProblem(hs("HS071"));
  const z = (x: Float64Array) => Float64Array.from(x, (v, j) => v / s[j]);
  const scaled: SqpProblem = {
    n: 4, nEq: 1, nIneq: 1,
    x0: [1, 5, 5, 1].map((v, j) => v * s[j]),
    lower: s.map((v) => v), upper: s.map((v) => 5 * v),
    evaluate: (x) => {
      const e = base.evaluate(z(x));
      return { f: 1e9 * e.f, eq: Float64Array.of(1e-7 * (e.eq as Float64Array)[0]), ineq: Float64Array.of(1e5 * (e.ineq as Float64Array)[0]) };
    },
    derivatives: (x, rows) => {
      const d = base.derivatives(z(x), rows);
      const chain = (r: Float64Array, k: number) => r.map((v, j) => (k * v) / s[j]);
      return {
        grad: chain(d.grad, 1e9),
        eq: [chain(d.eq?.[0] as Float64Array, 1e-7)],
        ineq: (d.ineq ?? []).map((r) => chain(r as Float64Array, 1e5)),
      };
    },
  };
  for (const hessian of ["bfgs", "lbfgs"] as const)
    it(`HS071 with variables near 1e-6 and 1e6 (${hessian})`, () => {
      const r = minimize(scaled, { hessian });
      expect(r.status, r.message).toBe("optimal");
      expect(Math.abs(r.f / 1e9 - HS071_F) / HS071_F).toBeLessThan(1e-6);
      expect(r.x[1] / 1e6).toBeCloseTo(4.742994, 4); // published x* of HS071
      expect(r.x[0]).toBeGreaterThanOrEqual(1e-6);
    });
});

describe("non-finite values from the user's functions", () => {
  it("objective NaN at the start: failed, naming the objective", () => {
    const r = minimize({ n: 2, x0: [1, 2], evaluate: () => ({ f: NaN }), derivatives: () => ({ grad: new Float64Array(2) }), names: { variables: ["width", "depth"] } });
    expect(r.status).toBe("failed");
    expect(r.message).toMatch(/objective/);
    expect(r.message).toMatch(/NaN/);
    expect(r.message).toMatch(/width = 1/);
    for (const v of r.x) expect(Number.isFinite(v)).toBe(true);
    expect(Number.isNaN(r.f)).toBe(false);
  });

  it("objective NaN everywhere beyond x > 3 on the way to the minimum at 5: failed, never NaN", () => {
    const r = minimize({
      n: 1, x0: [0],
      evaluate: (x) => ({ f: x[0] > 3 ? NaN : (x[0] - 5) ** 2 }),
      derivatives: (x) => ({ grad: Float64Array.of(2 * (x[0] - 5)) }),
    });
    expect(r.status).toBe("failed");
    expect(r.message).toMatch(/objective returned NaN/);
    expect(Number.isFinite(r.f)).toBe(true);
    expect(r.x[0]).toBeLessThanOrEqual(3);
  });

  it("a constraint returning Infinity is named", () => {
    const r = minimize({
      n: 1, x0: [1], nIneq: 1,
      evaluate: (x) => ({ f: x[0], ineq: Float64Array.of(1 / (x[0] - 1)) }),
      derivatives: () => ({ grad: Float64Array.of(1), ineq: [Float64Array.of(0)] }),
      names: { ineq: () => "stress:AB:LC1" },
    });
    expect(r.status).toBe("failed");
    expect(r.message).toMatch(/stress:AB:LC1/);
  });

  it("a gradient entry NaN is named with its variable", () => {
    const r = minimize({
      n: 2, x0: [1, 1],
      evaluate: (x) => ({ f: x[0] + x[1] }),
      derivatives: () => ({ grad: Float64Array.of(1, NaN) }),
      names: { variables: ["area-top", "area-diag"] },
    });
    expect(r.status).toBe("failed");
    expect(r.message).toMatch(/gradient with respect to area-diag/);
  });

  it("bounds in the wrong order fail at once, naming the variable", () => {
    const r = minimize({ n: 1, x0: [0], lower: [2], upper: [1], evaluate: (x) => ({ f: x[0] }), derivatives: () => ({ grad: Float64Array.of(1) }), names: { variables: ["chord-area"] } });
    expect(r.status).toBe("failed");
    expect(r.message).toMatch(/chord-area/);
    expect(r.evaluations).toBe(0);
  });
});

describe("control: abort, progress, limits, determinism", () => {
  it("an aborted signal throws AbortError and nothing else", () => {
    const ac = new AbortController();
    ac.abort();
    expect(() => minimize(toSqpProblem(hs("HS071")), { signal: ac.signal })).toThrowError(expect.objectContaining({ name: "AbortError" }));
  });

  it("aborting from the progress callback stops within the iteration", () => {
    const ac = new AbortController();
    let calls = 0;
    const run = () =>
      minimize(toSqpProblem(hs("HS001")), {
        signal: ac.signal,
        onProgress: (p) => {
          calls++;
          if (p.iteration === 3) ac.abort();
        },
      });
    expect(run).toThrowError(expect.objectContaining({ name: "AbortError" }));
    expect(calls).toBe(4);
  });

  it("progress is reported once per iteration, in order, matching the history", () => {
    const seen: number[] = [];
    const r = minimize(toSqpProblem(hs("HS071")), { onProgress: (p) => seen.push(p.iteration) });
    expect(seen).toEqual(r.history.map((h) => h.iteration));
    expect(seen).toEqual(Array.from({ length: r.iterations + 1 }, (_, i) => i));
    expect(r.history.at(-1)?.kktResidual).toBe(r.kktResidual);
  });

  it("the iteration limit gives not-converged with the best point and a sentence", () => {
    const r = minimize(toSqpProblem(hs("HS001")), { maxIterations: 3 });
    expect(r.status).toBe("not-converged");
    expect(r.iterations).toBe(3);
    expect(r.message).toMatch(/limit of 3 iterations/);
    expect(r.f).toBeLessThanOrEqual(Math.min(...r.history.map((h) => h.f)));
  });

  it("a time limit gives not-converged with a time-limit sentence", () => {
    const r = minimize(toSqpProblem(hs("HS001")), { timeLimitMs: 0 });
    expect(r.status).toBe("not-converged");
    expect(r.message).toMatch(/time limit of 0 ms/);
    expect(Number.isFinite(r.f)).toBe(true);
  });

  it("two runs give bit-identical results", () => {
    for (const id of ["HS071", "HS078", "HS043"]) {
      const a = minimize(toSqpProblem(hs(id)));
      const b = minimize(toSqpProblem(hs(id)));
      expect(Array.from(b.x)).toEqual(Array.from(a.x));
      expect(b.history).toEqual(a.history);
      expect(Array.from(b.multipliers.ineq)).toEqual(Array.from(a.multipliers.ineq));
    }
  });
});

describe("multipliers and screening", () => {
  it("min x subject to x >= 1: multiplier 1 as a row and as a bound (closed form)", () => {
    const row = minimize({
      n: 1, x0: [3], nIneq: 1,
      evaluate: (x) => ({ f: x[0], ineq: Float64Array.of(1 - x[0]) }),
      derivatives: () => ({ grad: Float64Array.of(1), ineq: [Float64Array.of(-1)] }),
    });
    expect(row.status).toBe("optimal");
    expect(row.multipliers.ineq[0]).toBeCloseTo(1, 10);
    const bound = minimize({ n: 1, x0: [3], lower: [1], evaluate: (x) => ({ f: x[0] }), derivatives: () => ({ grad: Float64Array.of(1) }) });
    expect(bound.status).toBe("optimal");
    expect(bound.multipliers.lower[0]).toBeCloseTo(1, 10);
  });

  it("screened rows: only near-active rows are differentiated, yet every row holds at the end", () => {
    // max sum x_j over 0 <= x_j, with x_j <= 1 (rows 0..9), a coupling row x_0 + x_1 <= 1.5
    // (row 10, far at the start), and 300 far-away rows sum x <= 100 + k. Optimum (closed
    // form): sum = 9.5 with x_0 + x_1 = 1.5.
    const n = 10;
    const nIneq = n + 1 + 300;
    const requested: number[] = [];
    const value = (x: Float64Array) => {
      const c = new Float64Array(nIneq);
      let sum = 0;
      for (let j = 0; j < n; j++) {
        c[j] = x[j] - 1;
        sum += x[j];
      }
      c[n] = x[0] + x[1] - 1.5;
      for (let k = 0; k < 300; k++) c[n + 1 + k] = sum - 100 - k;
      return c;
    };
    const r = minimize(
      {
        n, nIneq, x0: new Array(n).fill(0), lower: new Array(n).fill(0),
        evaluate: (x) => ({ f: -x.reduce((a, b) => a + b, 0), ineq: value(x) }),
        derivatives: (_x, rows) => {
          requested.push(rows.length);
          return {
            grad: new Float64Array(n).fill(-1),
            ineq: Array.from(rows, (i) => {
              if (i < n) return { index: Int32Array.of(i), value: Float64Array.of(1) };
              if (i === n) return { index: Int32Array.of(0, 1), value: Float64Array.of(1, 1) };
              return new Float64Array(n).fill(1);
            }),
          };
        },
      },
      { screening: 1.2 },
    );
    expect(r.status, r.message).toBe("optimal");
    expect(r.f).toBeCloseTo(-9.5, 8);
    expect(r.maxViolation).toBeLessThan(1e-8);
    for (const v of r.ineq) expect(v).toBeLessThanOrEqual(1e-8);
    // after the first (calibrating) call, the 300 far rows are never requested
    expect(Math.max(...requested.slice(1))).toBeLessThanOrEqual(n + 1);
  });
});
