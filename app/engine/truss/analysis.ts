// Linear-elastic analysis by the direct stiffness method: one factorization of K on the free
// dofs, shared by every load case (and by later adjoint solves through Analysis.solve).
import { MechanismError } from "./mechanism";
import { choleskyInPlace, choleskySolveInPlace } from "./sparse/skyline";
import { assembleSkyline, checkMemberValues, dofPattern, loadedUnconnectedNodes, mechanismsFromPivots } from "./stiffness";
import { caseLoads, memberLengths, type Structure } from "./structure";
import { combineVectors } from "./loading";
import { appendAll } from "../util/extent";

export interface Analysis {
  areas: Float64Array;
  coords: Float64Array;
  lengths: Float64Array;
  // The per-response arrays below hold the load cases, then the combinations (s.responseIds);
  // a combination's entry is the factored sum of its cases' entries.
  displacements: Float64Array[]; // nNodes*3 (zeros on restrained dofs)
  forces: Float64Array[]; // per member; tension positive
  stresses: Float64Array[];
  reactions: Float64Array[]; // nNodes*3 (non-zero only on restrained dofs)
  /** applied loads, own weight included, nNodes*3 */
  loads: Float64Array[];
  compliance: number[]; // per load case only, f.u
  volume: number;
  mass: number;
  /** max over load cases of |K u - f|_inf / |f|_inf on the free dofs, K u rebuilt from member forces */
  equilibriumResidual: number;
  /** K^-1 rhs on full nNodes*3 vectors (restrained entries of rhs ignored, of the result zero) */
  solve(rhs: Float64Array): Float64Array;
  /** stored entries of the factor: a measure of the work and memory of the solve */
  profile: number;
}

export interface AnalyzeOptions {
  areas?: Float64Array;
  coords?: Float64Array;
}

/** One factorization of K on the free dofs at the given areas and coordinates. */
export interface StiffnessFactor {
  lengths: Float64Array;
  /** K^-1 rhs on full nNodes*3 vectors (restrained entries of rhs ignored, of the result zero) */
  solve(rhs: Float64Array): Float64Array;
  /** stored entries of the factor */
  profile: number;
}

/** Assembles and factors K; a mechanism throws MechanismError naming the nodes and directions. */
export function factorStiffness(s: Structure, areas: Float64Array, coords: Float64Array): StiffnessFactor {
  const nNodes = s.nodeIds.length;
  const nMembers = s.start.length;
  if (areas.length !== nMembers) throw new RangeError(`analyze: ${areas.length} areas given for ${nMembers} members`);
  if (coords.length !== nNodes * 3) throw new RangeError(`analyze: ${coords.length} coordinates given for ${nNodes} nodes (3 per node expected)`);
  const lengths = memberLengths(s, coords);
  checkMemberValues(s, areas, lengths);

  const unconnected = loadedUnconnectedNodes(s);
  if (unconnected.length) throw new MechanismError(unconnected);
  const p = dofPattern(s);
  const K = assembleSkyline(s, p, areas, coords, lengths);
  const zeros = choleskyInPlace(K, { maxZeroPivots: 3 });
  if (zeros.length) throw new MechanismError(mechanismsFromPivots(s, p, zeros));

  const work = new Float64Array(p.nFree);
  const solve = (rhs: Float64Array): Float64Array => {
    for (let r = 0; r < p.nFree; r++) work[r] = rhs[p.rowToDof[r]];
    choleskySolveInPlace(K, work);
    const u = new Float64Array(nNodes * 3);
    for (let r = 0; r < p.nFree; r++) u[p.rowToDof[r]] = work[r];
    return u;
  };
  return { lengths, solve, profile: K.profile };
}

export function analyze(s: Structure, opts: AnalyzeOptions = {}): Analysis {
  const areas = opts.areas ?? s.areas;
  const coords = opts.coords ?? s.coords;
  const nNodes = s.nodeIds.length;
  const nMembers = s.start.length;
  const p = dofPattern(s);
  const { lengths, solve, profile } = factorStiffness(s, areas, coords);

  const displacements: Float64Array[] = [];
  const forces: Float64Array[] = [];
  const stresses: Float64Array[] = [];
  const reactions: Float64Array[] = [];
  const compliance: number[] = [];
  let residual = 0;
  const applied = caseLoads(s, areas, lengths);
  for (const f of applied) {
    const u = solve(f);
    const N = memberForces(s, areas, coords, lengths, u);
    const sig = new Float64Array(nMembers);
    for (let e = 0; e < nMembers; e++) sig[e] = N[e] / areas[e];
    const internal = internalForces(s, coords, lengths, N);
    const r = new Float64Array(nNodes * 3);
    let fMax = 0;
    let resMax = 0;
    let c = 0;
    for (let d = 0; d < nNodes * 3; d++) {
      fMax = Math.max(fMax, Math.abs(f[d]));
      c += f[d] * u[d];
      if (p.dofToRow[d] >= 0) resMax = Math.max(resMax, Math.abs(internal[d] - f[d]));
      else if (s.fixed[d]) r[d] = internal[d] - f[d];
    }
    residual = Math.max(residual, fMax > 0 ? resMax / fMax : resMax);
    displacements.push(u);
    forces.push(N);
    stresses.push(sig);
    reactions.push(r);
    compliance.push(c);
  }

  const loads = [...applied];
  if (s.combinations.length > 0) {
    for (const [all, perCase] of [[displacements, displacements.slice()], [forces, forces.slice()], [stresses, stresses.slice()], [reactions, reactions.slice()], [loads, applied]] as const) {
      appendAll(all as unknown[], combineVectors(s.combinations, perCase));
    }
  }

  let volume = 0;
  let mass = 0;
  for (let e = 0; e < nMembers; e++) {
    const v = areas[e] * lengths[e];
    volume += v;
    mass += s.density[e] * v;
  }
  return { areas, coords, lengths, displacements, forces, stresses, reactions, loads, compliance, volume, mass, equilibriumResidual: residual, solve, profile };
}

/** Axial forces N = (E A / L) n.(u_end - u_start), tension positive. */
export function memberForces(s: Structure, areas: Float64Array, coords: Float64Array, lengths: Float64Array, u: Float64Array): Float64Array {
  const m = s.start.length;
  const N = new Float64Array(m);
  for (let e = 0; e < m; e++) {
    const i = 3 * s.start[e];
    const j = 3 * s.end[e];
    const L = lengths[e];
    let ext = 0;
    for (let a = 0; a < 3; a++) ext += (coords[j + a] - coords[i + a]) * (u[j + a] - u[i + a]);
    N[e] = (s.E[e] * areas[e] * ext) / (L * L);
  }
  return N;
}

/** The nodal forces the members exert back, sum of B^T N: equals K u, and f + reactions at equilibrium. */
export function internalForces(s: Structure, coords: Float64Array, lengths: Float64Array, N: Float64Array): Float64Array {
  const out = new Float64Array(s.nodeIds.length * 3);
  for (let e = 0; e < N.length; e++) {
    const i = 3 * s.start[e];
    const j = 3 * s.end[e];
    const q = N[e] / lengths[e];
    for (let a = 0; a < 3; a++) {
      const v = q * (coords[j + a] - coords[i + a]);
      out[i + a] -= v;
      out[j + a] += v;
    }
  }
  return out;
}
