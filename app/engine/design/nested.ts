// Nested formulation: the optimizer sees only the design variables; every evaluation runs one
// stiffness analysis (one factorization shared by all load cases) and the displacements are
// eliminated. Gradients by the adjoint method: for a limit g(A, x, u) with K lambda = dg/du,
//   dg/dp = dg/dp|_u + lambda^T (df/dp - d(K u)/dp)
// where df/dp is the own weight's share (own-weight.ts; zero without own weight), so each requested (screened) limit costs one extra solve with the same factorization;
// limits that share a response (tension/compression/buckling of one member, +-u of one dof)
// share that solve. Compliance is self-adjoint (lambda = u) and costs no solve at all:
// dC/dp = sum_l 2 u_l^T df_l/dp - u_l^T dK/dp u_l. A limit on a combination uses the
// combination's u (the factored sum, from the same factorization); since K u is linear in u
// and the combination's load is the factored sum, the same adjoint formula holds with the
// combination's own-weight factor.
import { analyze, type Analysis } from "../truss";
import type { SqpProblem } from "../sqp";
import { adjointProduct, memberLengths } from "./element";
import { Partials, limitPartials, limitValue, massPartials, objectiveValue, toDesign, type LimitState } from "./limits";
import { designState, type DesignProblem, type Limit } from "./problem";
import { addOwnWeightGradient } from "./own-weight";
import { responseSelfWeight } from "../truss";

export interface Counters {
  analyses: number; // stiffness factorizations: one per evaluation (nested), one per iterate (simultaneous)
  solves: number; // adjoint solves with an existing factorization
}

interface NestedState extends LimitState {
  analysis: Analysis;
}

/** What either formulation hands the driver: the solver problem, its counters and scale. */
export interface Formulation<State> {
  problem: SqpProblem;
  counters: Counters;
  objectiveScale: number;
  /** areas, coordinates and displacements at a point */
  stateAt(z: Float64Array): State;
}

export type NestedFormulation = Formulation<NestedState>;

export function nestedFormulation(p: DesignProblem): NestedFormulation {
  const s = p.structure;
  const m = s.memberIds.length;
  const counters: Counters = { analyses: 0, solves: 0 };
  let cacheKey: Float64Array | null = null;
  let cache: NestedState | null = null;

  function stateAt(z: Float64Array): NestedState {
    if (cacheKey && cache && sameVector(cacheKey, z, p.nDesign)) return cache;
    const { areas, coords } = designState(p, z);
    const analysis = analyze(s, { areas, coords });
    counters.analyses++;
    const lengths = memberLengths(s, coords);
    let volume = 0;
    for (let e = 0; e < m; e++) volume += areas[e] * lengths[e];
    cache = { areas, coords, lengths, volume, displacements: analysis.displacements, loads: analysis.loads, analysis };
    cacheKey = Float64Array.from(z.subarray(0, p.nDesign));
    return cache;
  }

  const z0 = Float64Array.from(p.x0);
  const f0 = objectiveValue(p, stateAt(z0));
  const objectiveScale = f0 > 0 ? f0 : 1;
  const part = new Partials();
  const dv = new Float64Array(3), dU = new Float64Array(3), dL = new Float64Array(3), gd = new Float64Array(3);
  const isShapeMember = new Uint8Array(m);
  for (const e of p.shapeMembers) isShapeMember[e] = 1;
  const selfWeightOf = responseSelfWeight(s.selfWeight, s.combinations);

  /** out -= factor * d(lambda^T K u)/d(design) for one load case's u and a lambda. */
  function subtractAdjoint(st: NestedState, u: ArrayLike<number>, lambda: ArrayLike<number>, factor: number, out: Float64Array) {
    for (let e = 0; e < m; e++) {
      const i = 3 * s.start[e], j = 3 * s.end[e];
      for (let a = 0; a < 3; a++) {
        dv[a] = st.coords[j + a] - st.coords[i + a];
        dU[a] = u[j + a] - u[i + a];
        dL[a] = lambda[j + a] - lambda[i + a];
      }
      const shape = isShapeMember[e] === 1;
      const dA = adjointProduct(st.areas[e], s.E[e], dv, dU, dL, shape ? gd : undefined);
      const v = p.memberVar[e];
      out[v] -= factor * dA * p.areaVars[v].scale;
      if (shape) {
        for (let a = 0; a < 3; a++) {
          const g = factor * gd[a];
          const lj = p.dofShape.get(j + a), li = p.dofShape.get(i + a);
          if (lj) for (const t of lj) out[t.v] -= g * t.c;
          if (li) for (const t of li) out[t.v] += g * t.c;
        }
      }
    }
  }

  /** Limits with one key share one adjoint right-hand side up to a factor (the tension and compression limits of a member, +-u of a dof). */
  const nDof = s.coords.length;
  const adjointKey = (lim: Limit) => ((lim.loadCase + 1) * (m + 1) + lim.member + 1) * (nDof + 1) + lim.dof + 1;

  /**
   * Where this evaluation's adjoint vectors come from. Each distinct right-hand side costs one
   * solve; but a right-hand side touches a few dofs (a stress limit the 4 or 6 of its member's
   * ends, a displacement limit one), so when the requested rows have more distinct right-hand
   * sides than the dofs they touch together, the columns of K^-1 at those dofs are solved once
   * and each adjoint is their combination (the first iterations of a large stress-limited layout
   * ask for thousands of rows over a few hundred dofs). Same vectors either way, to rounding.
   */
  function adjointSource(st: NestedState, rows: Int32Array) {
    const keys = new Set<number>();
    const dofs = new Set<number>();
    for (let k = 0; k < rows.length; k++) {
      const lim = p.limits[rows[k]];
      limitPartials(p, lim, st, part);
      if (part.uIdx.length === 0) continue;
      keys.add(adjointKey(lim));
      for (const dof of part.uIdx) if (!s.fixed[dof]) dofs.add(dof);
    }
    const byColumns = dofs.size < keys.size;
    const columns = new Map<number, Float64Array>();
    const column = (dof: number, rhs: Float64Array): Float64Array => {
      let c = columns.get(dof);
      if (!c) {
        rhs.fill(0);
        rhs[dof] = 1;
        c = st.analysis.solve(rhs);
        counters.solves++;
        columns.set(dof, c);
      }
      return c;
    };
    return {
      /** K^-1 times the vector with entries val at dofs idx; rhs is scratch space */
      lambda(idx: number[], val: number[], rhs: Float64Array): Float64Array {
        if (!byColumns) {
          rhs.fill(0);
          for (let t = 0; t < idx.length; t++) rhs[idx[t]] += val[t];
          counters.solves++;
          return st.analysis.solve(rhs);
        }
        const lambda = new Float64Array(rhs.length);
        for (let t = 0; t < idx.length; t++) {
          if (s.fixed[idx[t]] || val[t] === 0) continue;
          const c = column(idx[t], rhs);
          const f = val[t];
          for (let q = 0; q < lambda.length; q++) lambda[q] += f * c[q];
        }
        return lambda;
      },
    };
  }

  const problem: SqpProblem = {
    n: p.nDesign,
    x0: p.x0,
    lower: p.lower,
    upper: p.upper,
    nEq: 0,
    nIneq: p.limits.length,
    evaluate(z) {
      const st = stateAt(z);
      const ineq = new Float64Array(p.limits.length);
      for (let r = 0; r < p.limits.length; r++) ineq[r] = limitValue(p, p.limits[r], st);
      return { f: objectiveValue(p, st) / objectiveScale, ineq };
    },
    derivatives(z, rows) {
      const st = stateAt(z);
      const grad = new Float64Array(p.nDesign);
      if (p.objective === "mass") {
        massPartials(p, st, part);
        toDesign(p, part, grad);
      } else {
        for (let l = 0; l < s.loads.length; l++) {
          subtractAdjoint(st, st.displacements[l], st.displacements[l], 1, grad);
          if (selfWeightOf[l] !== 0) addOwnWeightGradient(p, st.areas, st.coords, st.lengths, st.displacements[l], 2 * selfWeightOf[l], grad, isShapeMember);
        }
      }
      for (let k = 0; k < grad.length; k++) grad[k] /= objectiveScale;

      const ineq: Float64Array[] = [];
      const coefficientsByCase = new Map<number, AreaAdjointCoefficients>();
      const adjointCoefficients = (state: NestedState, loadCase: number) => {
        let c = coefficientsByCase.get(loadCase);
        if (!c) coefficientsByCase.set(loadCase, (c = areaAdjointCoefficients(p, state, state.displacements[loadCase])));
        return c;
      };
      const lambdaCache = new Map<number, { lambda: Float64Array; ref: number }>();
      const rhs = new Float64Array(s.coords.length);
      const adjoints = adjointSource(st, rows);
      for (let k = 0; k < rows.length; k++) {
        const lim = p.limits[rows[k]];
        const row = new Float64Array(p.nDesign);
        limitPartials(p, lim, st, part);
        toDesign(p, part, row);
        if (part.uIdx.length > 0) {
          const key = adjointKey(lim);
          let entry = lambdaCache.get(key);
          if (!entry) {
            entry = { lambda: adjoints.lambda(part.uIdx, part.uVal, rhs), ref: part.uVal[0] };
            lambdaCache.set(key, entry);
          }
          const factor = part.uVal[0] / entry.ref;
          if (p.shapeMembers.length === 0) subtractAreaAdjoint(adjointCoefficients(st, lim.loadCase), entry.lambda, factor, row);
          else subtractAdjoint(st, st.displacements[lim.loadCase], entry.lambda, factor, row);
          const sw = selfWeightOf[lim.loadCase];
          if (sw !== 0) addOwnWeightGradient(p, st.areas, st.coords, st.lengths, entry.lambda, factor * sw, row, isShapeMember);
        }
        ineq.push(row);
      }
      return { grad, ineq };
    },
    names: {
      variables: [...p.areaVars.map((v) => `area:${v.id}`), ...p.shapeVars.map((v) => `shape:${v.id}`)],
      ineq: (i) => p.limits[i]?.id ?? `limit ${i}`,
    },
  };
  return { problem, counters, objectiveScale, stateAt };
}

/**
 * Per member, what the area part of d(lambda^T K u)/dA needs from u alone (areas only, no shape
 * variables): the member vector d and c = E (d.du) / L^3 times the area variable's scale, so
 * that one adjoint row costs c (d.dlambda) per member (adjointProduct without the square root
 * and the shape terms). Computed once per load case and evaluation, shared by every row.
 */
interface AreaAdjointCoefficients {
  d: Float64Array; // 3 per member
  c: Float64Array;
  start: Int32Array; // 3 * start node
  end: Int32Array; // 3 * end node
  variable: Int32Array;
}

function areaAdjointCoefficients(p: DesignProblem, st: NestedState, u: ArrayLike<number>): AreaAdjointCoefficients {
  const s = p.structure;
  const m = s.memberIds.length;
  const d = new Float64Array(3 * m), c = new Float64Array(m), start = new Int32Array(m), end = new Int32Array(m);
  for (let e = 0; e < m; e++) {
    const i = 3 * s.start[e], j = 3 * s.end[e];
    start[e] = i;
    end[e] = j;
    let eu = 0;
    for (let a = 0; a < 3; a++) {
      const da = st.coords[j + a] - st.coords[i + a];
      d[3 * e + a] = da;
      eu += da * (u[j + a] - u[i + a]);
    }
    const L = st.lengths[e];
    c[e] = ((s.E[e] * eu) / (L * L * L)) * p.areaVars[p.memberVar[e]].scale;
  }
  return { d, c, start, end, variable: p.memberVar };
}

/** out -= factor * d(lambda^T K u)/d(area variables), from the coefficients of u. */
function subtractAreaAdjoint(k: AreaAdjointCoefficients, lambda: ArrayLike<number>, factor: number, out: Float64Array): void {
  const { d, c, start, end, variable } = k;
  for (let e = 0; e < c.length; e++) {
    const i = start[e], j = end[e], q = 3 * e;
    const el = d[q] * (lambda[j] - lambda[i]) + d[q + 1] * (lambda[j + 1] - lambda[i + 1]) + d[q + 2] * (lambda[j + 2] - lambda[i + 2]);
    out[variable[e]] -= factor * c[e] * el;
  }
}

function sameVector(a: Float64Array, b: Float64Array, n: number): boolean {
  for (let i = 0; i < n; i++) if (a[i] !== b[i]) return false;
  return true;
}
