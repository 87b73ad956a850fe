// Units: every number of a model is in the units it declares; these helpers convert between
// unit systems (display formatting lives in app/lib/format.ts). Factors are exact by definition (NIST SP 811,
// appendix B): 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 lb = 0.45359237 kg, standard gravity
// 9.80665 m/s^2, so 1 lbf = 4.4482216152605 N; 1 kip = 1000 lbf; 1 t = 1000 kg.
import type { ForceUnit, LengthUnit, MassUnit, Units } from "./schema";

export const LENGTH_IN_M: Record<LengthUnit, number> = { m: 1, cm: 0.01, mm: 0.001, in: 0.0254, ft: 0.3048 };
export const FORCE_IN_N: Record<ForceUnit, number> = { N: 1, kN: 1e3, MN: 1e6, lbf: 0.45359237 * 9.80665, kip: 1000 * 0.45359237 * 9.80665 };
export const MASS_IN_KG: Record<MassUnit, number> = { kg: 1, t: 1000, lb: 0.45359237 };

/** Quantities the engine reports, each as powers of (length, force, mass). */
export const QUANTITIES = {
  length: [1, 0, 0],
  force: [0, 1, 0],
  mass: [0, 0, 1],
  area: [2, 0, 0],
  volume: [3, 0, 0],
  stress: [-2, 1, 0], // also modulus
  density: [-3, 0, 1],
  stiffness: [-1, 1, 0], // force per length
  compliance: [1, 1, 0], // work: force times length
} as const;
export type Quantity = keyof typeof QUANTITIES;

/** SI value of one unit of the quantity in the given system. */
export function siFactor(quantity: Quantity, units: Units): number {
  const [l, f, m] = QUANTITIES[quantity];
  return LENGTH_IN_M[units.length] ** l * FORCE_IN_N[units.force] ** f * MASS_IN_KG[units.mass] ** m;
}

function asUnits(quantity: Quantity, u: Units | string): Units {
  if (typeof u !== "string") return u;
  const base: Units = { length: "m", force: "N", mass: "kg" };
  if (quantity === "force" && u in FORCE_IN_N) return { ...base, force: u as ForceUnit };
  if (quantity === "mass" && u in MASS_IN_KG) return { ...base, mass: u as MassUnit };
  if ((quantity === "length" || quantity === "area" || quantity === "volume") && u in LENGTH_IN_M) return { ...base, length: u as LengthUnit };
  throw new RangeError(`"${u}" is not a ${quantity} unit; give a unit system { length, force, mass } for derived quantities`);
}

/**
 * Converts value of a quantity from one unit system to another. Base quantities (and area,
 * volume) accept a unit name such as "kN" or "ft"; derived ones need a { length, force, mass } system.
 */
export function convertUnit(value: number, quantity: Quantity, from: Units | string, to: Units | string): number {
  const a = siFactor(quantity, asUnits(quantity, from));
  const b = siFactor(quantity, asUnits(quantity, to));
  return a === b ? value : (value * a) / b;
}

/** Display label of a quantity's unit in a system, with the usual stress names where they exist. */
export function unitLabel(quantity: Quantity, u: Units): string {
  switch (quantity) {
    case "length":
      return u.length;
    case "force":
      return u.force;
    case "mass":
      return u.mass;
    case "area":
      return `${u.length}²`;
    case "volume":
      return `${u.length}³`;
    case "stress": {
      const named = STRESS_NAMES[`${u.force}/${u.length}`];
      return named ?? `${u.force}/${u.length}²`;
    }
    case "density":
      return `${u.mass}/${u.length}³`;
    case "stiffness":
      return `${u.force}/${u.length}`;
    case "compliance":
      return `${u.force}·${u.length}`;
  }
}

// common practice: 1 N/mm² = 1 MPa, 1 kN/m² = 1 kPa, 1 kip/in² = 1 ksi, 1 lbf/in² = 1 psi
const STRESS_NAMES: Record<string, string> = {
  "N/m": "Pa",
  "kN/m": "kPa",
  "MN/m": "MPa",
  "N/mm": "MPa",
  "kN/mm": "GPa",
  "lbf/in": "psi",
  "kip/in": "ksi",
  "lbf/ft": "psf",
  "kip/ft": "ksf",
};
