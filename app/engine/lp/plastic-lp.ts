// The plastic-design LP in the solver's terms, in one of two exact forms:
//
// - compact (one case, no own weight, every member its own area): the classical layout LP over
//   tension and compression parts t, c >= 0 of each force, with area t/sigma_t + c/sigma_c:
//     minimize sum rho L (t/sigma_t + c/sigma_c)  subject to  B (t - c) = f
//   one row per free dof, so thousands of members solve in about a second;
// - full (several cases, own weight, shared areas): areas and one force per member and case,
//     minimize sum c_v A_v  subject to  B q_k + s_k W A = f_k,  q_k <= sigma_t A,  q_k >= -sigma_c A
//   with two stress rows per member and case (a side without a limit becomes a free row).
//
// Both are solved in scaled units (forces by the largest load, areas by that load over the
// largest allowable, costs by the largest cost) so the solver's absolute tolerances mean the same
// in mm/N/t as in ft/kip/lb.
import type { LinearProgram } from "./solver";
import type { PlasticDesignInput } from "./plastic-input";

export interface BuiltLp {
  lp: LinearProgram;
  form: "compact" | "full";
  objectiveScale: number;
  unscale(x: Float64Array): { varAreas: Float64Array; memberAreas: Float64Array; forces: Float64Array[] };
}

interface Geometry {
  lengths: Float64Array;
  cosines: Float64Array; // 3 per member, start -> end
  eqRow: Int32Array; // dof -> equilibrium row (-1: restrained, or on a node no member joins)
  nEq: number;
}

interface Scales {
  sigmaRef: number;
  forceRef: number;
  areaRef: number;
}

export function buildLp(input: PlasticDesignInput): BuiltLp {
  const g = geometry(input);
  const sc = scales(input, g);
  const compact = input.cases.length === 1 && input.cases[0].selfWeight === 0 && input.varIds.length === input.memberIds.length && isIdentity(input.memberVar);
  return compact ? compactLp(input, g, sc) : fullLp(input, g, sc);
}

function isIdentity(map: Int32Array): boolean {
  for (let e = 0; e < map.length; e++) if (map[e] !== e) return false;
  return true;
}

function geometry(input: PlasticDesignInput): Geometry {
  const { coords, start, end } = input;
  const m = start.length;
  const lengths = new Float64Array(m);
  const cosines = new Float64Array(3 * m);
  for (let e = 0; e < m; e++) {
    const i = 3 * start[e], j = 3 * end[e];
    const dx = coords[j] - coords[i], dy = coords[j + 1] - coords[i + 1], dz = coords[j + 2] - coords[i + 2];
    const L = Math.hypot(dx, dy, dz);
    lengths[e] = L;
    cosines[3 * e] = dx / L;
    cosines[3 * e + 1] = dy / L;
    cosines[3 * e + 2] = dz / L;
  }
  const nNodes = input.nodeIds.length;
  const connected = new Uint8Array(nNodes);
  for (let e = 0; e < m; e++) connected[start[e]] = connected[end[e]] = 1;
  const eqRow = new Int32Array(3 * nNodes).fill(-1);
  let nEq = 0;
  for (let n = 0; n < nNodes; n++) {
    if (!connected[n]) continue;
    for (let a = 0; a < 3; a++) if (!input.fixed[3 * n + a]) eqRow[3 * n + a] = nEq++;
  }
  return { lengths, cosines, eqRow, nEq };
}

function scales(input: PlasticDesignInput, g: Geometry): Scales {
  let sigmaRef = 0;
  for (let e = 0; e < input.start.length; e++) {
    for (const s of [input.allowTension[e], input.allowCompression[e]]) if (Number.isFinite(s)) sigmaRef = Math.max(sigmaRef, s);
  }
  if (!(sigmaRef > 0)) sigmaRef = 1;
  let forceRef = 0;
  for (const c of input.cases) for (const v of c.loads) forceRef = Math.max(forceRef, Math.abs(v));
  if (!(forceRef > 0)) {
    // only own weight loads it: the members' weight at unit area sets the force scale
    let weight = 0;
    for (let e = 0; e < input.start.length; e++) weight += input.density[e] * g.lengths[e];
    forceRef = weight * input.weightPerMass || 1;
  }
  return { sigmaRef, forceRef, areaRef: forceRef / sigmaRef };
}

/** Member e's column entries in the equilibrium rows of one case (times sign), sorted by row. */
function equilibriumEntries(input: PlasticDesignInput, g: Geometry, e: number, base: number, sign: number): [number, number][] {
  const out: [number, number][] = [];
  for (let a = 0; a < 3; a++) {
    const c = g.cosines[3 * e + a];
    if (c === 0) continue;
    const ri = g.eqRow[3 * input.start[e] + a], rj = g.eqRow[3 * input.end[e] + a];
    if (ri >= 0) out.push([base + ri, -sign * c]);
    if (rj >= 0) out.push([base + rj, sign * c]);
  }
  return out.sort((x, y) => x[0] - y[0]);
}

function rhs(input: PlasticDesignInput, g: Geometry, k: number, forceRef: number, into: Float64Array, base: number): void {
  const f = input.cases[k].loads;
  for (let d = 0; d < g.eqRow.length; d++) if (g.eqRow[d] >= 0) into[base + g.eqRow[d]] = f[d] / forceRef;
}

function compactLp(input: PlasticDesignInput, g: Geometry, sc: Scales): BuiltLp {
  const m = input.start.length;
  // a column for each side a member can work on (an allowable of zero: no column)
  const colMember: number[] = [];
  const colSign: number[] = [];
  const colCost: number[] = [];
  for (const sign of [1, -1]) {
    for (let e = 0; e < m; e++) {
      const allow = sign > 0 ? input.allowTension[e] : input.allowCompression[e];
      if (!(allow > 0)) continue;
      colMember.push(e);
      colSign.push(sign);
      // mass per unit scaled force: rho L F / sigma (no limit on this side: free)
      colCost.push(Number.isFinite(allow) ? (input.density[e] * g.lengths[e] * sc.forceRef) / allow : 0);
    }
  }
  const nCols = colMember.length;
  let costRef = 0;
  for (const c of colCost) costRef = Math.max(costRef, c);
  if (!(costRef > 0)) costRef = 1;
  const starts = new Int32Array(nCols + 1);
  const rows: number[] = [];
  const values: number[] = [];
  for (let j = 0; j < nCols; j++) {
    for (const [r, v] of equilibriumEntries(input, g, colMember[j], 0, colSign[j])) {
      rows.push(r);
      values.push(v);
    }
    starts[j + 1] = rows.length;
  }
  const b = new Float64Array(g.nEq);
  rhs(input, g, 0, sc.forceRef, b, 0);
  const lp: LinearProgram = {
    nCols, nRows: g.nEq,
    cost: Float64Array.from(colCost, (c) => c / costRef),
    colLower: new Float64Array(nCols),
    colUpper: new Float64Array(nCols).fill(Infinity),
    rowLower: b, rowUpper: b.slice(),
    matrix: { starts, rows: Int32Array.from(rows), values: Float64Array.from(values) },
  };
  return {
    lp,
    form: "compact",
    objectiveScale: costRef,
    unscale(x) {
      const memberAreas = new Float64Array(m);
      const q = new Float64Array(m);
      for (let j = 0; j < nCols; j++) {
        const e = colMember[j];
        const part = Math.max(0, x[j]) * sc.forceRef;
        const allow = colSign[j] > 0 ? input.allowTension[e] : input.allowCompression[e];
        q[e] += colSign[j] * part;
        if (Number.isFinite(allow)) memberAreas[e] += part / allow;
      }
      return { varAreas: memberAreas.slice(), memberAreas, forces: [q] };
    },
  };
}

function fullLp(input: PlasticDesignInput, g: Geometry, sc: Scales): BuiltLp {
  const { memberVar, cases, dim } = input;
  const m = input.start.length;
  const nVar = input.varIds.length;
  const nCases = cases.length;
  const perCase = g.nEq + 2 * m;
  const nRows = nCases * perCase;
  const nCols = nVar + nCases * m;

  const varCost = new Float64Array(nVar);
  for (let e = 0; e < m; e++) varCost[memberVar[e]] += input.density[e] * g.lengths[e];
  let costRef = 0;
  for (let v = 0; v < nVar; v++) costRef = Math.max(costRef, varCost[v] * sc.areaRef);
  if (!(costRef > 0)) costRef = 1;
  const cost = new Float64Array(nCols);
  for (let v = 0; v < nVar; v++) cost[v] = (varCost[v] * sc.areaRef) / costRef;
  const colLower = new Float64Array(nCols).fill(-Infinity);
  const colUpper = new Float64Array(nCols).fill(Infinity);
  for (let v = 0; v < nVar; v++) colLower[v] = 0;

  const rowLower = new Float64Array(nRows);
  const rowUpper = new Float64Array(nRows);
  for (let k = 0; k < nCases; k++) {
    const base = k * perCase;
    rhs(input, g, k, sc.forceRef, rowLower, base);
    rhs(input, g, k, sc.forceRef, rowUpper, base);
    for (let e = 0; e < m; e++) {
      const t = base + g.nEq + 2 * e;
      rowLower[t] = -Infinity;
      rowUpper[t] = Number.isFinite(input.allowTension[e]) ? 0 : Infinity;
      rowLower[t + 1] = Number.isFinite(input.allowCompression[e]) ? 0 : -Infinity;
      rowUpper[t + 1] = Infinity;
    }
  }

  const gravityAxis = dim === 2 ? 1 : 2;
  const membersOf: number[][] = Array.from({ length: nVar }, () => []);
  for (let e = 0; e < m; e++) membersOf[memberVar[e]].push(e);
  const starts = new Int32Array(nCols + 1);
  const rows: number[] = [];
  const values: number[] = [];
  const entries = new Map<number, number>(); // row -> value, one area column at a time
  for (let v = 0; v < nVar; v++) {
    entries.clear();
    for (let k = 0; k < nCases; k++) {
      const base = k * perCase;
      const sw = cases[k].selfWeight;
      for (const e of membersOf[v]) {
        const t = base + g.nEq + 2 * e;
        if (Number.isFinite(input.allowTension[e])) entries.set(t, -input.allowTension[e] / sc.sigmaRef);
        if (Number.isFinite(input.allowCompression[e])) entries.set(t + 1, input.allowCompression[e] / sc.sigmaRef);
        if (sw === 0) continue;
        // own weight: B q = f - s w A/2 at each end (downwards), so +s w/2 on the area's side
        const half = (0.5 * sw * input.density[e] * g.lengths[e] * input.weightPerMass * sc.areaRef) / sc.forceRef;
        for (const n of [input.start[e], input.end[e]]) {
          const r = g.eqRow[3 * n + gravityAxis];
          if (r >= 0) entries.set(base + r, (entries.get(base + r) ?? 0) + half);
        }
      }
    }
    for (const r of [...entries.keys()].sort((a, b) => a - b)) {
      const val = entries.get(r)!;
      if (val === 0) continue;
      rows.push(r);
      values.push(val);
    }
    starts[v + 1] = rows.length;
  }
  for (let k = 0; k < nCases; k++) {
    const base = k * perCase;
    for (let e = 0; e < m; e++) {
      for (const [r, val] of equilibriumEntries(input, g, e, base, 1)) {
        rows.push(r);
        values.push(val);
      }
      const t = base + g.nEq + 2 * e;
      rows.push(t, t + 1);
      values.push(1, 1);
      starts[nVar + k * m + e + 1] = rows.length;
    }
  }

  const lp: LinearProgram = {
    nCols, nRows, cost, colLower, colUpper, rowLower, rowUpper,
    matrix: { starts, rows: Int32Array.from(rows), values: Float64Array.from(values) },
  };
  return {
    lp,
    form: "full",
    objectiveScale: costRef,
    unscale(x) {
      const varAreas = new Float64Array(nVar);
      for (let v = 0; v < nVar; v++) varAreas[v] = Math.max(0, x[v]) * sc.areaRef;
      const memberAreas = new Float64Array(m);
      for (let e = 0; e < m; e++) memberAreas[e] = varAreas[memberVar[e]];
      const forces = cases.map((_, k) => {
        const q = new Float64Array(m);
        for (let e = 0; e < m; e++) q[e] = x[nVar + k * m + e] * sc.forceRef;
        return q;
      });
      return { varAreas, memberAreas, forces };
    },
  };
}
