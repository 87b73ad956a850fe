// Adjoint sensitivities of the analysis responses with respect to member areas and node
// coordinates. For a response r(u, A, x) with K(A, x) u = f and loads independent of A and x:
//   dr/dp = dr/dp|_u - lambda^T (dK/dp) u,   K lambda = dr/du.
// Per member, lambda^T k_e u = (E A / L) d_l d_u with d_a = n.(a_end - a_start), so
//   d/dA_e      = (E / L) d_l d_u
//   d/dx_end    = (E A / L^2) (d_u D_l + d_l D_u - 3 d_l d_u n),   d/dx_start = -d/dx_end
// where D_a = a_end - a_start (vectors) and n the member's unit axis.
import type { Analysis } from "./analysis";
import type { Structure } from "./structure";

export interface Gradient {
  areas: Float64Array; // nMembers
  coords: Float64Array; // nNodes*3 (z entries zero in 2D)
}

function loadCaseIndex(s: Structure, loadCase: number | string): number {
  const k = typeof loadCase === "number" ? loadCase : s.loadCaseIds.indexOf(loadCase);
  if (!(k >= 0 && k < s.loads.length)) throw new RangeError(`unknown load case ${String(loadCase)}`);
  return k;
}

/** Adds scale * d(lambda^T K u)/dp to g (areas and coordinates). */
function addBilinearDerivative(s: Structure, a: Analysis, lambda: Float64Array, u: Float64Array, scale: number, g: Gradient): void {
  const { coords, areas, lengths } = a;
  const m = s.start.length;
  for (let e = 0; e < m; e++) {
    const i = 3 * s.start[e];
    const j = 3 * s.end[e];
    const L = lengths[e];
    let du = 0;
    let dl = 0;
    const n0 = (coords[j] - coords[i]) / L;
    const n1 = (coords[j + 1] - coords[i + 1]) / L;
    const n2 = (coords[j + 2] - coords[i + 2]) / L;
    const U0 = u[j] - u[i], U1 = u[j + 1] - u[i + 1], U2 = u[j + 2] - u[i + 2];
    const L0 = lambda[j] - lambda[i], L1 = lambda[j + 1] - lambda[i + 1], L2 = lambda[j + 2] - lambda[i + 2];
    du = n0 * U0 + n1 * U1 + n2 * U2;
    dl = n0 * L0 + n1 * L1 + n2 * L2;
    if (du === 0 && dl === 0) continue;
    g.areas[e] += (scale * s.E[e] * du * dl) / L;
    const c = (scale * s.E[e] * areas[e]) / (L * L);
    const t = 3 * dl * du;
    const gx = c * (du * L0 + dl * U0 - t * n0);
    const gy = c * (du * L1 + dl * U1 - t * n1);
    const gz = c * (du * L2 + dl * U2 - t * n2);
    g.coords[j] += gx; g.coords[j + 1] += gy; g.coords[j + 2] += gz;
    g.coords[i] -= gx; g.coords[i + 1] -= gy; g.coords[i + 2] -= gz;
  }
}

function emptyGradient(s: Structure): Gradient {
  return { areas: new Float64Array(s.start.length), coords: new Float64Array(s.nodeIds.length * 3) };
}

function flatten2d(s: Structure, g: Gradient): Gradient {
  if (s.dim === 2) for (let i = 2; i < g.coords.length; i += 3) g.coords[i] = 0;
  return g;
}

/** Compliance f.u of one load case: self-adjoint, dC/dp = -u^T (dK/dp) u. */
export function complianceGradient(s: Structure, a: Analysis, loadCase: number | string): Gradient {
  const k = loadCaseIndex(s, loadCase);
  const u = a.displacements[k];
  const g = emptyGradient(s);
  addBilinearDerivative(s, a, u, u, -1, g);
  return flatten2d(s, g);
}

/** Displacement component u[dof] (dof = node*3 + axis) of one load case. */
export function displacementGradient(s: Structure, a: Analysis, loadCase: number | string, dof: number): Gradient {
  const k = loadCaseIndex(s, loadCase);
  if (!(dof >= 0 && dof < s.nodeIds.length * 3)) throw new RangeError(`dof ${dof} is outside the structure's ${s.nodeIds.length * 3} dofs`);
  const g = emptyGradient(s);
  if (s.fixed[dof] || !s.connected[Math.floor(dof / 3)]) return g; // restrained: always zero
  const rhs = new Float64Array(s.nodeIds.length * 3);
  rhs[dof] = 1;
  const lambda = a.solve(rhs);
  addBilinearDerivative(s, a, lambda, a.displacements[k], -1, g);
  return flatten2d(s, g);
}

/** Stress sigma = E n.(u_end - u_start) / L of one member in one load case. */
export function stressGradient(s: Structure, a: Analysis, loadCase: number | string, member: number): Gradient {
  const k = loadCaseIndex(s, loadCase);
  if (!(member >= 0 && member < s.start.length)) throw new RangeError(`member index ${member} is outside 0..${s.start.length - 1}`);
  const { coords, lengths } = a;
  const u = a.displacements[k];
  const i = 3 * s.start[member];
  const j = 3 * s.end[member];
  const L = lengths[member];
  const E = s.E[member];
  const n = [0, 1, 2].map((c) => (coords[j + c] - coords[i + c]) / L);
  const D = [0, 1, 2].map((c) => u[j + c] - u[i + c]);
  const delta = n[0] * D[0] + n[1] * D[1] + n[2] * D[2];
  // adjoint load: dsigma/du
  const rhs = new Float64Array(s.nodeIds.length * 3);
  for (let c = 0; c < 3; c++) {
    rhs[j + c] = (E * n[c]) / L;
    rhs[i + c] = (-E * n[c]) / L;
  }
  const lambda = a.solve(rhs);
  const g = emptyGradient(s);
  addBilinearDerivative(s, a, lambda, u, -1, g);
  // explicit geometric part at fixed u: dsigma/dx_end = (E / L^2) (D - 2 delta n)
  for (let c = 0; c < 3; c++) {
    const v = (E / (L * L)) * (D[c] - 2 * delta * n[c]);
    g.coords[j + c] += v;
    g.coords[i + c] -= v;
  }
  return flatten2d(s, g);
}

/** Volume sum A L: dV/dA = L, dV/dx_end = A n. */
export function volumeGradient(s: Structure, a: Analysis): Gradient {
  const g = emptyGradient(s);
  const { coords, areas, lengths } = a;
  for (let e = 0; e < s.start.length; e++) {
    const i = 3 * s.start[e];
    const j = 3 * s.end[e];
    g.areas[e] = lengths[e];
    for (let c = 0; c < 3; c++) {
      const v = (areas[e] * (coords[j + c] - coords[i + c])) / lengths[e];
      g.coords[j + c] += v;
      g.coords[i + c] -= v;
    }
  }
  return flatten2d(s, g);
}

/** Mass sum rho A L: the volume gradient weighted by each member's density. */
export function massGradient(s: Structure, a: Analysis): Gradient {
  const g = emptyGradient(s);
  const { coords, areas, lengths } = a;
  for (let e = 0; e < s.start.length; e++) {
    const i = 3 * s.start[e];
    const j = 3 * s.end[e];
    const rho = s.density[e];
    g.areas[e] = rho * lengths[e];
    for (let c = 0; c < 3; c++) {
      const v = (rho * areas[e] * (coords[j + c] - coords[i + c])) / lengths[e];
      g.coords[j + c] += v;
      g.coords[i + c] -= v;
    }
  }
  return flatten2d(s, g);
}
