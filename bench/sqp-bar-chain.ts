// A simultaneous-formulation test problem with a closed-form optimum (invented): a chain of N
// bars along one axis, node 0 fixed, load P at every other node; variables are the N bar
// areas a_j and the N node displacements u_i (stiffness E/L = 1). Equilibrium K(a) u = f is an
// equality row per node; each bar's strain (u_{j+1} - u_j) <= s_max is an inequality row.
// Minimum volume sum a_j: the fully stressed design (statically determinate chain, common
// practice) a_j = P (N - j) / s_max, volume P / s_max * N (N + 1) / 2.
import type { SqpProblem } from "../app/engine/sqp";

/**
 * withStates: equilibrium declared as state equations (SqpProblem.stateEquations); d(eq)/du is
 * the chain's tridiagonal stiffness matrix (diagonal a_{i-1} + a_i, off-diagonal -a_i),
 * solved by the Thomas algorithm, so the solver takes null-space steps.
 */
export function barChain(N: number, P = 1, sMax = 0.01, withStates = false): { problem: SqpProblem; volume: number } {
  const n = 2 * N; // x = [a_0..a_{N-1}, u_1..u_N]
  const A = (j: number) => j;
  const U = (i: number) => N + i - 1; // i = 1..N
  const disp = (x: Float64Array, i: number) => (i === 0 ? 0 : x[U(i)]);
  // start: unit areas and the displacements that satisfy equilibrium for them (as an
  // analysis would give), u_i = sum_{j<i} P (N - j) / a_j
  const x0 = new Array(n).fill(0);
  let acc = 0;
  for (let j = 0; j < N; j++) {
    x0[A(j)] = 1;
    acc += P * (N - j);
    x0[U(j + 1)] = acc;
  }
  const lower = new Array(n).fill(-Infinity);
  for (let j = 0; j < N; j++) lower[A(j)] = 1e-3;
  const problem: SqpProblem = {
    n, nEq: N, nIneq: N, x0, lower,
    evaluate(x) {
      let f = 0;
      for (let j = 0; j < N; j++) f += x[A(j)];
      const eq = new Float64Array(N);
      for (let i = 1; i <= N; i++) {
        // internal force of bar i-1 minus that of bar i, minus the load
        const left = x[A(i - 1)] * (disp(x, i) - disp(x, i - 1));
        const right = i < N ? x[A(i)] * (disp(x, i + 1) - disp(x, i)) : 0;
        eq[i - 1] = left - right - P;
      }
      const ineq = new Float64Array(N);
      for (let j = 0; j < N; j++) ineq[j] = (disp(x, j + 1) - disp(x, j)) / sMax - 1;
      return { f, eq, ineq };
    },
    derivatives(x, rows) {
      const grad = new Float64Array(n);
      for (let j = 0; j < N; j++) grad[A(j)] = 1;
      const eq = [];
      for (let i = 1; i <= N; i++) {
        const idx: number[] = [];
        const val: number[] = [];
        const add = (k: number, v: number) => {
          idx.push(k);
          val.push(v);
        };
        add(A(i - 1), disp(x, i) - disp(x, i - 1));
        if (i < N) add(A(i), -(disp(x, i + 1) - disp(x, i)));
        // d/du_i, d/du_{i-1}, d/du_{i+1}
        add(U(i), x[A(i - 1)] + (i < N ? x[A(i)] : 0));
        if (i > 1) add(U(i - 1), -x[A(i - 1)]);
        if (i < N) add(U(i + 1), -x[A(i)]);
        eq.push({ index: Int32Array.from(idx), value: Float64Array.from(val) });
      }
      const ineq = Array.from(rows, (j) => {
        const idx = [U(j + 1)];
        const val = [1 / sMax];
        if (j > 0) {
          idx.push(U(j));
          val.push(-1 / sMax);
        }
        return { index: Int32Array.from(idx), value: Float64Array.from(val) };
      });
      return { grad, eq, ineq };
    },
  };
  if (withStates) {
    problem.stateEquations = {
      nDesign: N,
      factor(x) {
        const diag = new Float64Array(N), off = new Float64Array(N); // off[k]: entry (k, k+1)
        for (let k = 0; k < N; k++) {
          diag[k] = x[A(k)] + (k + 1 < N ? x[A(k + 1)] : 0);
          if (k + 1 < N) off[k] = -x[A(k + 1)];
        }
        const solve = (r: Float64Array) => {
          const c = new Float64Array(N), d = new Float64Array(N);
          for (let k = 0; k < N; k++) {
            const m = diag[k] - (k > 0 ? off[k - 1] * c[k - 1] : 0);
            c[k] = off[k] / m;
            d[k] = (r[k] - (k > 0 ? off[k - 1] * d[k - 1] : 0)) / m;
          }
          for (let k = N - 2; k >= 0; k--) d[k] -= c[k] * d[k + 1];
          return d;
        };
        return { solve, solveTransposed: solve }; // symmetric
      },
    };
  }
  return { problem, volume: ((P / sMax) * N * (N + 1)) / 2 };
}
