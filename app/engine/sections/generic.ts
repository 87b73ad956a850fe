// The built-in generic section catalogue, generated from dimensions with geometric formulas.
// No manufacturer's or standard's table is copied: every area and second moment below is
// computed here from an outer size and a wall thickness.
//
//   circular hollow (CHS), outer diameter D, wall t, d = D - 2t:
//     A = pi (D^2 - d^2) / 4,   I = pi (D^4 - d^4) / 64
//   square hollow (SHS), outer width B, wall t, sharp corners, b = B - 2t:
//     A = B^2 - b^2,            I = (B^4 - b^4) / 12
//     (real square tubes have rounded corners, a few per cent less of both: the catalogue is
//     generic, for studies; a project's own catalogue replaces it for construction)
//   solid round (RND), diameter D:
//     A = pi D^2 / 4,           I = pi D^4 / 64
//
// The dimension series (outer sizes and wall thicknesses, in mm) are common practice for
// structural tubes and bars; the wall limits keep the sections compact enough for an axial
// member (CHS: D/t from 10 to 50; SHS: B/t from 8 to 40).
import type { LengthUnit } from "../truss/schema";
import { LENGTH_IN_M } from "../truss/units";

export type GenericFamily = "CHS" | "SHS" | "RND";

export interface CatalogueSection {
  id: string;
  family: GenericFamily;
  area: number;
  I: number;
  /** outer size and wall, in the catalogue's length unit (wall omitted for solid rounds) */
  dimensions: { outer: number; wall?: number };
}

/** Outer diameters of circular hollow sections, mm (common practice). */
export const CHS_DIAMETERS = [21.3, 26.9, 33.7, 42.4, 48.3, 60.3, 76.1, 88.9, 114.3, 139.7, 168.3, 193.7, 219.1, 244.5, 273, 323.9, 355.6, 406.4];
/** Outer widths of square hollow sections, mm (common practice). */
export const SHS_WIDTHS = [40, 50, 60, 70, 80, 90, 100, 120, 140, 150, 160, 180, 200, 250, 300];
/** Wall thicknesses of hollow sections, mm (common practice). */
export const HOLLOW_WALLS = [2.6, 3.2, 4, 5, 6.3, 8, 10, 12.5, 16];
/** Diameters of solid rounds, mm (common practice). */
export const ROUND_DIAMETERS = [10, 12, 16, 20, 25, 30, 36, 40, 50, 60];

const CHS_RATIO = { min: 10, max: 50 };
const SHS_RATIO = { min: 8, max: 40 };

export function circularHollow(D: number, t: number): { area: number; I: number } {
  const d = D - 2 * t;
  return { area: (Math.PI * (D * D - d * d)) / 4, I: (Math.PI * (D ** 4 - d ** 4)) / 64 };
}

export function squareHollow(B: number, t: number): { area: number; I: number } {
  const b = B - 2 * t;
  return { area: B * B - b * b, I: (B ** 4 - b ** 4) / 12 };
}

export function solidRound(D: number): { area: number; I: number } {
  return { area: (Math.PI * D * D) / 4, I: (Math.PI * D ** 4) / 64 };
}

const label = (v: number) => String(Number(v.toFixed(1)));

/**
 * The generic catalogue in a model's length unit (areas in unit^2, I in unit^4), sorted by
 * family and area. Ids keep the millimetre dimensions: "CHS 88.9x4", "SHS 100x5", "RND 20".
 */
export function genericCatalogue(length: LengthUnit = "mm", families: readonly GenericFamily[] = ["CHS", "SHS", "RND"]): CatalogueSection[] {
  const k = 0.001 / LENGTH_IN_M[length]; // model length units per mm
  const out: CatalogueSection[] = [];
  const push = (family: GenericFamily, id: string, outer: number, wall: number | undefined, p: { area: number; I: number }) =>
    out.push({ id, family, area: p.area * k * k, I: p.I * k ** 4, dimensions: { outer: outer * k, ...(wall !== undefined ? { wall: wall * k } : {}) } });
  if (families.includes("CHS")) {
    for (const D of CHS_DIAMETERS) {
      for (const t of HOLLOW_WALLS) {
        if (D / t < CHS_RATIO.min || D / t > CHS_RATIO.max) continue;
        push("CHS", `CHS ${label(D)}x${label(t)}`, D, t, circularHollow(D, t));
      }
    }
  }
  if (families.includes("SHS")) {
    for (const B of SHS_WIDTHS) {
      for (const t of HOLLOW_WALLS) {
        if (B / t < SHS_RATIO.min || B / t > SHS_RATIO.max) continue;
        push("SHS", `SHS ${label(B)}x${label(t)}`, B, t, squareHollow(B, t));
      }
    }
  }
  if (families.includes("RND")) {
    for (const D of ROUND_DIAMETERS) push("RND", `RND ${label(D)}`, D, undefined, solidRound(D));
  }
  const order: Record<GenericFamily, number> = { CHS: 0, SHS: 1, RND: 2 };
  return out.sort((a, b) => order[a.family] - order[b.family] || a.area - b.area);
}
