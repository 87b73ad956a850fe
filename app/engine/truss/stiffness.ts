// Global stiffness of a pin-jointed truss: the dof numbering (reverse Cuthill-McKee over the
// nodes), assembly into skyline storage for the factorization, and into CSR for callers that
// need the matrix itself. Each member adds (E A / L) [n n^T, -n n^T; -n n^T, n n^T], n = unit axis.
import { describeMode, MechanismError, type MechanismInfo } from "./mechanism";
import { csrFromTriplets, type CsrMatrix } from "./sparse/csr";
import { graphFromEdges, reverseCuthillMcKee } from "./sparse/ordering";
import { choleskyInPlace, SkylineMatrix } from "./sparse/skyline";
import { freeDofs, memberLengths, type Structure } from "./structure";

/** How free dofs map onto skyline rows; depends only on topology and supports, so it is cached. */
export interface DofPattern {
  nFree: number;
  dofToRow: Int32Array; // nNodes*3, -1 where the dof is restrained or its node unconnected
  rowToDof: Int32Array; // nFree
  first: Int32Array; // skyline row starts
}

const patternCache = new WeakMap<Structure, DofPattern>();

export function dofPattern(s: Structure): DofPattern {
  const cached = patternCache.get(s);
  if (cached) return cached;
  const nNodes = s.nodeIds.length;
  const active = new Uint8Array(nNodes);
  for (let i = 0; i < nNodes; i++) {
    if (s.connected[i] && !(s.fixed[3 * i] && s.fixed[3 * i + 1] && s.fixed[3 * i + 2])) active[i] = 1;
  }
  const g = graphFromEdges(nNodes, s.start, s.end, (e) => active[s.start[e]] === 1 && active[s.end[e]] === 1);
  const order = reverseCuthillMcKee(g, active);
  const dofToRow = new Int32Array(nNodes * 3).fill(-1);
  const nodeFirstRow = new Int32Array(nNodes).fill(-1);
  let row = 0;
  for (let k = 0; k < order.length; k++) {
    const v = order[k];
    nodeFirstRow[v] = row;
    for (let a = 0; a < 3; a++) if (!s.fixed[3 * v + a]) dofToRow[3 * v + a] = row++;
  }
  const nFree = row;
  const rowToDof = new Int32Array(nFree);
  for (let d = 0; d < nNodes * 3; d++) if (dofToRow[d] >= 0) rowToDof[dofToRow[d]] = d;
  const first = new Int32Array(nFree);
  for (let k = 0; k < order.length; k++) {
    const v = order[k];
    let f = nodeFirstRow[v];
    for (let p = g.ptr[v]; p < g.ptr[v + 1]; p++) {
      const w = nodeFirstRow[g.adj[p]];
      if (w < f) f = w;
    }
    for (let a = 0; a < 3; a++) {
      const r = dofToRow[3 * v + a];
      if (r >= 0) first[r] = f;
    }
  }
  const pattern = { nFree, dofToRow, rowToDof, first };
  patternCache.set(s, pattern);
  return pattern;
}

/** Checks areas and geometry before assembly so a bad value is named instead of becoming NaN. */
export function checkMemberValues(s: Structure, areas: Float64Array, lengths: Float64Array): void {
  for (let e = 0; e < lengths.length; e++) {
    if (!(lengths[e] > 0) || !Number.isFinite(lengths[e])) {
      throw new RangeError(`member ${s.memberIds[e]} has zero or invalid length (its nodes ${s.nodeIds[s.start[e]]} and ${s.nodeIds[s.end[e]]} coincide)`);
    }
    if (!(areas[e] > 0) || !Number.isFinite(areas[e])) {
      throw new RangeError(`member ${s.memberIds[e]} has area ${areas[e]}; areas must be positive and finite`);
    }
  }
}

/** Assembles K on the free dofs into a fresh skyline matrix in the pattern's row numbering. */
export function assembleSkyline(s: Structure, p: DofPattern, areas: Float64Array, coords: Float64Array, lengths: Float64Array): SkylineMatrix {
  const K = new SkylineMatrix(p.first);
  const { data, rowStart, first } = K;
  const rows = new Int32Array(6);
  const n = new Float64Array(3);
  const m = s.start.length;
  for (let e = 0; e < m; e++) {
    const i = 3 * s.start[e];
    const j = 3 * s.end[e];
    const L = lengths[e];
    n[0] = (coords[j] - coords[i]) / L;
    n[1] = (coords[j + 1] - coords[i + 1]) / L;
    n[2] = (coords[j + 2] - coords[i + 2]) / L;
    const k = (s.E[e] * areas[e]) / L;
    for (let a = 0; a < 3; a++) {
      rows[a] = p.dofToRow[i + a];
      rows[a + 3] = p.dofToRow[j + a];
    }
    for (let a = 0; a < 6; a++) {
      const ra = rows[a];
      if (ra < 0) continue;
      const base = rowStart[ra] - first[ra];
      for (let b = 0; b < 6; b++) {
        const rb = rows[b];
        if (rb < 0 || rb > ra) continue;
        const v = k * n[a % 3] * n[b % 3];
        data[base + rb] += (a < 3) === (b < 3) ? v : -v;
      }
    }
  }
  return K;
}

/** Maps zero pivots of a factorization back to named mechanisms. */
export function mechanismsFromPivots(s: Structure, p: DofPattern, zeros: { mode: Float64Array }[]): MechanismInfo[] {
  return zeros.map((z) => {
    const full = new Float64Array(s.nodeIds.length * 3);
    for (let r = 0; r < z.mode.length; r++) full[p.rowToDof[r]] = z.mode[r];
    return describeMode(s, full);
  });
}

/**
 * Stability check: the mechanisms of the structure with the given areas (empty when stable).
 * Free directions of nodes that no member connects are reported too when they carry load.
 */
export function findMechanisms(s: Structure, opts: { areas?: Float64Array; coords?: Float64Array; max?: number } = {}): MechanismInfo[] {
  const areas = opts.areas ?? s.areas;
  const coords = opts.coords ?? s.coords;
  const p = dofPattern(s);
  const lengths = memberLengths(s, coords);
  checkMemberValues(s, areas, lengths);
  const K = assembleSkyline(s, p, areas, coords, lengths);
  const zeros = choleskyInPlace(K, { maxZeroPivots: opts.max ?? 5 });
  return [...loadedUnconnectedNodes(s), ...mechanismsFromPivots(s, p, zeros)];
}

/** Loads on free directions of nodes no member connects cannot be carried at all. */
export function loadedUnconnectedNodes(s: Structure): MechanismInfo[] {
  const out: MechanismInfo[] = [];
  const axes = ["x", "y", "z"] as const;
  for (let i = 0; i < s.nodeIds.length; i++) {
    if (s.connected[i]) continue;
    for (let a = 0; a < 3; a++) {
      if (s.fixed[3 * i + a]) continue;
      const lc = s.loads.findIndex((f) => f[3 * i + a] !== 0);
      if (lc >= 0) {
        const node = s.nodeIds[i];
        out.push({
          node, axis: axes[a], nodes: [node], kind: "free-node",
          message: `node ${node} carries a load in ${axes[a]} (load case ${s.loadCaseIds[lc]}) but no member connects it, so it can move freely in ${axes[a]}: connect it with members or support it`,
        });
        break;
      }
    }
  }
  return out;
}

export function throwIfMechanisms(list: MechanismInfo[]): void {
  if (list.length > 0) throw new MechanismError(list);
}

/**
 * K on the free dofs as a CSR matrix (both triangles), rows and columns in the order of
 * freeDofs(s) (ascending full dof index). For the simultaneous formulation's equilibrium rows.
 */
export function assembleStiffness(s: Structure, areas: Float64Array = s.areas, coords: Float64Array = s.coords): CsrMatrix {
  const free = freeDofs(s);
  const index = new Int32Array(s.nodeIds.length * 3).fill(-1);
  free.forEach((d, k) => (index[d] = k));
  const lengths = memberLengths(s, coords);
  checkMemberValues(s, areas, lengths);
  const m = s.start.length;
  const ti = new Int32Array(m * 36);
  const tj = new Int32Array(m * 36);
  const tv = new Float64Array(m * 36);
  let t = 0;
  const dofs = new Int32Array(6);
  const n = new Float64Array(3);
  for (let e = 0; e < m; e++) {
    const i = 3 * s.start[e];
    const j = 3 * s.end[e];
    const L = lengths[e];
    for (let a = 0; a < 3; a++) {
      n[a] = (coords[j + a] - coords[i + a]) / L;
      dofs[a] = index[i + a];
      dofs[a + 3] = index[j + a];
    }
    const k = (s.E[e] * areas[e]) / L;
    for (let a = 0; a < 6; a++) {
      if (dofs[a] < 0) continue;
      for (let b = 0; b < 6; b++) {
        if (dofs[b] < 0) continue;
        const v = k * n[a % 3] * n[b % 3];
        ti[t] = dofs[a];
        tj[t] = dofs[b];
        tv[t++] = (a < 3) === (b < 3) ? v : -v;
      }
    }
  }
  return csrFromTriplets(free.length, free.length, ti, tj, tv, t);
}
