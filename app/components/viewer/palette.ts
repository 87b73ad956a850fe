// Utilization bands and force-sense colours of the viewer, legend and tables. The colours
// are the design tokens of app/app.css (--color-util-*, --color-tension, --color-compression);
// the browser reads them from the stylesheet so the tokens stay the one source of truth.

export interface UtilBand {
  token: string; // CSS custom property
  className: string; // Tailwind background class for legends and table chips
  label: string;
  upTo: number; // upper bound of the band (inclusive), Infinity for the last
}

// A member at its limit reads 1.000 give or take solver tolerance, so "over" starts a
// little above 1 (half a per cent) rather than at the first rounding digit.
export const OVER_LIMIT = 1.005;

export const UTIL_BANDS: UtilBand[] = [
  { token: "--color-util-0", className: "bg-util-0", label: "below 50 %", upTo: 0.5 },
  { token: "--color-util-1", className: "bg-util-1", label: "50–75 %", upTo: 0.75 },
  { token: "--color-util-2", className: "bg-util-2", label: "75–90 %", upTo: 0.9 },
  { token: "--color-util-3", className: "bg-util-3", label: "90–100 %", upTo: OVER_LIMIT },
  { token: "--color-util-4", className: "bg-util-4", label: "over the limit", upTo: Infinity },
];

export function utilBandIndex(utilization: number): number {
  if (!Number.isFinite(utilization)) return UTIL_BANDS.length - 1;
  const u = Math.max(0, utilization);
  const i = UTIL_BANDS.findIndex((band) => u < band.upTo);
  return i === -1 ? UTIL_BANDS.length - 1 : i;
}

export type ForceSense = "tension" | "compression" | "idle";

// A member carrying less than this share of the largest force in the load case is drawn as idle
const IDLE_SHARE = 1e-3;

export function forceSense(force: number, maxAbsForce: number): ForceSense {
  if (!Number.isFinite(force) || maxAbsForce <= 0 || Math.abs(force) <= IDLE_SHARE * maxAbsForce) return "idle";
  return force > 0 ? "tension" : "compression";
}

export const SENSE_TOKENS: Record<ForceSense, { token: string; className: string; label: string }> = {
  tension: { token: "--color-tension", className: "bg-tension", label: "tension" },
  compression: { token: "--color-compression", className: "bg-compression", label: "compression" },
  idle: { token: "--color-ink-muted", className: "bg-ink-muted", label: "nearly unloaded" },
};

/** Resolve a CSS custom property in the browser; the neutral ink when it is missing. */
export function cssColor(token: string, fallback = "#6b7683"): string {
  if (typeof document === "undefined") return fallback;
  const v = getComputedStyle(document.documentElement).getPropertyValue(token).trim();
  return v || fallback;
}
