// Force-sense colours of the viewer, legend and tables (utilization has its own continuous
// scale: app/lib/utilization-scale.ts). The colours are design tokens of app/app.css;
// the browser reads them from the stylesheet so the tokens stay the one source of truth.

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
