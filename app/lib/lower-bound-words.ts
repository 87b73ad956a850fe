// The words and the gauge scale of the least-mass bound (result field lowerBound), one home for
// the job page, the job lists, the compare view and the report.
import type { LowerBound } from "~/engine/design/result-types";
import { formatNumber, formatPercent } from "~/lib/format";

/**
 * Below this the design sits on the bound within the LP's and the optimizer's tolerances; a gap
 * this small (or a tiny negative one from rounding) is shown as 0.0 %.
 */
export const GAP_NOISE = 1e-5;

/** The gap as shown: "0.4 %", or "0.0 %" within the noise. */
export function formatGap(gap: number | null | undefined): string {
  if (gap === null || gap === undefined || !Number.isFinite(gap)) return "–";
  return formatPercent(Math.abs(gap) < GAP_NOISE ? 0 : gap, gap >= 0.1 ? 1 : 2);
}

/**
 * One line for the gauge: how far the design is above the bound, in words.
 * `limitsMet`: whether the re-analysis found every limit met (a design that breaks a limit can
 * even lie below the bound, so then the comparison is only reported).
 */
export function gapSentence(lb: LowerBound, kind: "mass" | "compliance", unit: string, limitsMet: boolean): string {
  const least = kind === "mass" ? "the least mass" : "the least compliance";
  const scope = kind === "mass" ? "under these loads and stress limits" : "under these loads and this volume";
  const where = lb.geometry === "final" ? " at its final node positions" : "";
  const value = `${formatNumber(lb.value)} ${unit}`;
  if (!limitsMet) return `This design does not meet every limit, so the comparison says little: ${least} any truss on these members can have${where} is ${value}.`;
  if (Math.abs(lb.gap) < GAP_NOISE) return `This design reaches ${least} any truss on these members can have${where} ${scope} (${value}): none can do better.`;
  const within = `This design is within ${formatGap(lb.gap)} of ${least} any truss on these members can have${where} ${scope}`;
  const leftOut = leftOutWords(lb);
  if (kind === "mass" && leftOut) {
    return (
      `${within} alone (${value}). The bound leaves out ${leftOut} this run also meets; they can only add mass, ` +
      "so a large gap is expected here and shows what those limits cost, not a poor design."
    );
  }
  return `${within} (${value}).`;
}

/** The label beside the gap figure: which bound it is measured from. */
export function gapLabel(lb: LowerBound): string {
  // only a design that breaks a limit lies below the bound: "−95 % above" would read as nonsense
  const side = lb.gap < -GAP_NOISE ? "below" : "above";
  return lb.leftOut?.length ? `${side} the stress-only bound` : `${side} the bound`;
}

/** The gauge's headline figure: the size of the gap, its side said by gapLabel. */
export function gapMagnitude(gap: number): string {
  return formatGap(Math.abs(gap));
}

/** "the buckling and displacement limits": the run's limits the bound leaves out, or null. */
export function leftOutWords(lb: LowerBound): string | null {
  const kinds = lb.leftOut ?? [];
  if (kinds.length === 0) return null;
  const list = kinds.length === 1 ? kinds[0] : `${kinds.slice(0, -1).join(", ")} and ${kinds[kinds.length - 1]}`;
  return `the ${list} ${kinds.length === 1 ? "limit" : "limits"}`;
}

/** Position on the gauge, 0..1: a log scale from 0.1 % to 100 %, so 0.4 % and 40 % both read. */
export function gaugePosition(gap: number): number {
  const g = Math.max(gap, 0);
  if (g <= GAUGE_TICKS[0]) return 0;
  const lo = Math.log10(GAUGE_TICKS[0]);
  const hi = Math.log10(GAUGE_TICKS[GAUGE_TICKS.length - 1]);
  return Math.min(1, (Math.log10(g) - lo) / (hi - lo));
}

export const GAUGE_TICKS = [0.001, 0.01, 0.1, 1] as const;
