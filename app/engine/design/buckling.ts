// The Euler check of one member, compressive stress against the Euler stress
// sigma_E = pi^2 E I / ((k L)^2 A), written as a stress difference over a fixed reference
// stress (problem.ts):  value = (-sigma - sigma_E(A)) / sigma_ref  <= 0.
// With sigma = E (d.du) / L^2 and q(A) = I / A:
//   value = -E / (sigma_ref L^2) * ((d.du) + pi^2 q(A) / k^2)
// Why not the ratio -sigma / sigma_E - 1: with I = ratio A^2, sigma_E shrinks in proportion to
// A, so the ratio grows like 1/A and curves like 1/A^3 at small areas. A member at its minimum
// area whose strain the rest of the structure sets then has a row whose linearization is
// wrong after a 1 % change of any area, and the solver crawled there (KKT measure stuck at
// 1e-2 on ungrouped buckling-limited space grids, steps of 1e-4). The difference form is
// linear in A for I = ratio A^2, as smooth in the strain as a stress row, and has the same
// zero set (sigma_E > 0).
// I comes from one of three places: the chosen section (catalogue designs: fixed per member),
// a fit I = a A^b over the model's sections, or I = sectionRatio A^2 (a = ratio, b = 2).
import type { SectionFit } from "../sections/fit";

export interface BucklingModel {
  a: number;
  b: number;
  /** effective-length factor per member (members[].bucklingFactor, else the design's factor) */
  k: Float64Array;
  /** I per member when fixed by a chosen section (catalogue checks); null: I = a A^b */
  memberI: Float64Array | null;
  /** where a and b came from */
  source: "sectionRatio" | "fit";
  fit?: SectionFit;
}

/** Second moment of area of member e at area A. */
export function secondMoment(b: BucklingModel, e: number, A: number): number {
  return b.memberI ? b.memberI[e] : b.a * A ** b.b;
}

/**
 * pi^2 q(A) / k^2 with q = I / A (the Euler stress times L^2 / E) and its derivative by A
 * (0 when I is fixed by a chosen section: A is then fixed too).
 */
export function eulerStrainTerm(b: BucklingModel, e: number, A: number): { w: number; dwdA: number } {
  const c = (Math.PI * Math.PI) / (b.k[e] * b.k[e]);
  if (b.memberI) return { w: (c * b.memberI[e]) / A, dwdA: 0 };
  const w = c * b.a * A ** (b.b - 1);
  return { w, dwdA: ((b.b - 1) * w) / A };
}

/** Euler stress pi^2 E I / ((k L)^2 A), positive. */
export function eulerStress(b: BucklingModel, e: number, E: number, A: number, L: number): number {
  const kL = b.k[e] * L;
  return (Math.PI * Math.PI * E * secondMoment(b, e, A)) / (kL * kL * A);
}
