// The Euler check of one member in ratio form (problem.ts): -sigma / sigma_E - 1 with
// sigma_E = pi^2 E I / ((k L)^2 A). Writing sigma = E (d.du) / L^2, E and L^2 cancel:
//   value = -c (d.du) - 1,   c = k^2 A / (pi^2 I)
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

/** c of the ratio form and dc/dA (0 when I is fixed, A is then fixed too). */
export function bucklingCoefficient(b: BucklingModel, e: number, A: number): { c: number; dcdA: number } {
  const k2 = b.k[e] * b.k[e];
  if (b.memberI) return { c: (k2 * A) / (Math.PI * Math.PI * b.memberI[e]), dcdA: 0 };
  const c = (k2 * A ** (1 - b.b)) / (Math.PI * Math.PI * b.a);
  return { c, dcdA: ((1 - b.b) * c) / A };
}

/** Euler stress pi^2 E I / ((k L)^2 A), positive. */
export function eulerStress(b: BucklingModel, e: number, E: number, A: number, L: number): number {
  const kL = b.k[e] * L;
  return (Math.PI * Math.PI * E * secondMoment(b, e, A)) / (kL * kL * A);
}
