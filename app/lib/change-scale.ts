// Strutwise's diverging scale for a change (the compare view: the change in a member's area
// between two runs). Lighter toward no change, darker toward the largest change; smaller areas
// lean to a slate blue, larger ones to a burnt orange — a blue/orange pair that colour-blind
// readers tell apart — and the sign is also written in the legend and the hover text, so it
// reads in black-and-white print. Interpolated in OKLab like the utilization scale; the two
// scales never share a hue (utilization runs sand → indigo).
import { oklabToHex } from "./utilization-scale";

type Lab = [number, number, number];
const SMALLER: Lab = [0.42, -0.02, -0.12];
const SAME: Lab = [0.96, 0, 0.004];
const LARGER: Lab = [0.5, 0.1, 0.12];

function mix(a: Lab, b: Lab, t: number): Lab {
  return [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1]), a[2] + t * (b[2] - a[2])];
}

/** The colour of a change against the largest change shown (`limit` > 0): −limit darkest blue, +limit darkest orange. */
export function changeColor(change: number, limit: number): string {
  if (!Number.isFinite(change) || !(limit > 0)) return oklabToHex(SAME);
  const t = Math.max(-1, Math.min(1, change / limit));
  return oklabToHex(t < 0 ? mix(SAME, SMALLER, -t) : mix(SAME, LARGER, t));
}

/** CSS gradient from −limit (left) to +limit (right), for the legend. */
export function changeGradientCss(): string {
  const steps = [-1, -0.75, -0.5, -0.25, 0, 0.25, 0.5, 0.75, 1].map((t) => `${changeColor(t, 1)} ${((t + 1) / 2) * 100}%`);
  return `linear-gradient(to right, ${steps.join(", ")})`;
}

/**
 * Changes in area smaller than this share of the largest area shown are "the same": two runs
 * that reach one design differ by the solver's tolerance (±2e-6 mm² on 500 mm²), which must not
 * paint the view in both colours.
 */
export const SAME_AREA_SHARE = 1e-6;

/** A round limit for the legend: the largest change, up to 1, 2 or 5 times a power of ten. */
export function niceLimit(largest: number): number {
  if (!(largest > 0) || !Number.isFinite(largest)) return 1;
  const p = 10 ** Math.floor(Math.log10(largest));
  const f = largest / p;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10) * p;
}
