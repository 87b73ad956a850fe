// Member-level kinematics and the derivatives the design formulations need.
//
// Notation for one member e from node i to node j (3 components even in 2D, z stays 0):
//   d  = x_j - x_i, L = |d|, du = u_j - u_i, e = d . du (elongation times L)
//   axial force N = A E e / L^2, stress sigma = E e / L^2
//   nodal internal force p_j = A E e d / L^3, p_i = -p_j   (K u assembled from these)
// Writing everything in terms of d (not unit vectors) keeps the coordinate derivatives short.

export interface MemberTopology {
  start: Int32Array;
  end: Int32Array;
  E: Float64Array;
}

/** Lengths of every member for the given node coordinates (nNodes*3). */
export function memberLengths(t: MemberTopology, coords: Float64Array, out?: Float64Array): Float64Array {
  const m = t.start.length;
  const L = out ?? new Float64Array(m);
  for (let e = 0; e < m; e++) {
    const i = 3 * t.start[e], j = 3 * t.end[e];
    const dx = coords[j] - coords[i], dy = coords[j + 1] - coords[i + 1], dz = coords[j + 2] - coords[i + 2];
    L[e] = Math.sqrt(dx * dx + dy * dy + dz * dz);
  }
  return L;
}

/** d = x_j - x_i written into out[0..2]. */
export function memberVector(t: MemberTopology, coords: ArrayLike<number>, e: number, out: Float64Array): void {
  const i = 3 * t.start[e], j = 3 * t.end[e];
  out[0] = coords[j] - coords[i];
  out[1] = coords[j + 1] - coords[i + 1];
  out[2] = coords[j + 2] - coords[i + 2];
}

/** du = u_j - u_i for member e (full nNodes*3 displacement vector). */
export function memberRelative(t: MemberTopology, u: ArrayLike<number>, e: number, out: Float64Array): void {
  const i = 3 * t.start[e], j = 3 * t.end[e];
  out[0] = u[j] - u[i];
  out[1] = u[j + 1] - u[i + 1];
  out[2] = u[j + 2] - u[i + 2];
}

/** Stress E (d.du)/L^2 of member e. */
export function memberStress(t: MemberTopology, coords: ArrayLike<number>, u: ArrayLike<number>, e: number): number {
  const i = 3 * t.start[e], j = 3 * t.end[e];
  let dd = 0, de = 0;
  for (let a = 0; a < 3; a++) {
    const d = coords[j + a] - coords[i + a];
    dd += d * d;
    de += d * (u[j + a] - u[i + a]);
  }
  return (t.E[e] * de) / dd;
}

/**
 * The adjoint product phi = lambda^T (k_e u) of one member, and its partial derivatives with
 * respect to the member area and to d, holding u and lambda fixed:
 *   phi      = A E (d.du)(d.dl) / L^3
 *   dphi/dA  = E (d.du)(d.dl) / L^3
 *   dphi/dd  = A E [du (d.dl) + dl (d.du)] / L^3 - 3 A E (d.du)(d.dl) d / L^5
 * Returns dphi/dA; writes dphi/dd into gd (3 entries) when gd is given.
 */
export function adjointProduct(
  A: number, E: number, d: Float64Array, du: Float64Array, dl: Float64Array, gd?: Float64Array,
): number {
  const L2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
  const L = Math.sqrt(L2);
  const L3 = L2 * L;
  const eu = d[0] * du[0] + d[1] * du[1] + d[2] * du[2];
  const el = d[0] * dl[0] + d[1] * dl[1] + d[2] * dl[2];
  if (gd) {
    const c = (A * E) / L3;
    const c2 = (3 * A * E * eu * el) / (L3 * L2);
    for (let a = 0; a < 3; a++) gd[a] = c * (du[a] * el + dl[a] * eu) - c2 * d[a];
  }
  return (E * eu * el) / L3;
}

/**
 * Derivative of the internal force p_j = A E (d.du) d / L^3 with respect to d (3x3, row-major
 * into out): A E [d du^T + (d.du) I] / L^3 - 3 A E (d.du) d d^T / L^5.
 */
export function internalForceByGeometry(A: number, E: number, d: Float64Array, du: Float64Array, out: Float64Array): void {
  const L2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
  const L = Math.sqrt(L2);
  const L3 = L2 * L;
  const eu = d[0] * du[0] + d[1] * du[1] + d[2] * du[2];
  const c = (A * E) / L3;
  const c2 = (3 * A * E * eu) / (L3 * L2);
  for (let r = 0; r < 3; r++) {
    for (let s = 0; s < 3; s++) {
      out[3 * r + s] = c * (d[r] * du[s] + (r === s ? eu : 0)) - c2 * d[r] * d[s];
    }
  }
}
