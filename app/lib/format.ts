// The one formatter of Strutwise: numbers, quantities with their units, percentages, dates,
// durations and axis ticks, for the pages, the CSV downloads, the PDF report and the mail.
// Isomorphic (no DOM, no Node API), so the server render and the browser agree on the text.
//
// Rules (docs/decisions/0015-one-formatter-one-state-sentence.md):
// - significant figures, not decimals: 4 for measured values, 3 for residuals and multipliers;
// - plain notation with thousands grouping from 1e-3 up to (not including) 1e6; outside it
//   engineering notation, the exponent a multiple of three ("12.3e-6", "4.50e9");
// - a value smaller than `zeroBelow` (numerical noise against its column's scale) prints "0";
// - a true minus sign (U+2212) in display text; CSV keeps plain JavaScript numbers;
// - never "NaN" or "Infinity" on screen: "–".
import { scaleLinear, scaleLog } from "d3-scale";
import { convertUnit, unitLabel, type Quantity } from "~/engine/truss/units";
import type { ForceUnit, LengthUnit, MassUnit, Units } from "~/engine/truss/schema";
import { maxOf, minOf } from "~/engine/util/extent";

export const MINUS = "−";
const DASH = "–";

export interface NumberOptions {
  /** significant figures (default 4) */
  sig?: number;
  /** magnitudes below this print as "0" (noise against the column's scale) */
  zeroBelow?: number;
  /** plain notation up to this magnitude (default 1e6), engineering notation beyond */
  plainBelow?: number;
  /** drop trailing zeros of the decimals (axis ticks: "0.004", not "0.004000") */
  trim?: boolean;
}

/** "812.4", "4,000", "0.2870", "12.30e-6", "−25,000"; "–" for a missing or non-finite value. */
export function formatNumber(value: number | null | undefined, opts: NumberOptions = {}): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  const sig = opts.sig ?? 4;
  const abs = Math.abs(value);
  if (value === 0 || (opts.zeroBelow !== undefined && abs < opts.zeroBelow)) return "0";
  // decide the notation on the rounded value, so 999,999.7 becomes "1.000e6", not "1,000,000"
  const rounded = Math.abs(Number(value.toPrecision(sig)));
  let text = rounded >= 1e-3 && rounded < (opts.plainBelow ?? 1e6) ? plain(value, sig) : engineering(value, sig);
  if (opts.trim) text = text.replace(/(\.\d*?)0+(?=e|$)/, "$1").replace(/\.(?=e|$)/, "");
  return value < 0 ? MINUS + text.replace(/^-/, "") : text;
}

/** Residuals, violations and multipliers: three significant figures, plain below 1e4. */
export function formatResidual(value: number | null | undefined): string {
  return formatNumber(value, { sig: 3, plainBelow: 1e4 });
}

/** A ratio as a percentage with one decimal (utilization 0.953 → "95.3 %"). */
export function formatPercent(ratio: number | null | undefined, decimals = 1): string {
  if (ratio === null || ratio === undefined || !Number.isFinite(ratio)) return DASH;
  const text = (ratio * 100).toFixed(decimals);
  return `${text.startsWith("-") && Number(text) !== 0 ? MINUS + text.slice(1) : text.replace(/^-/, "")} %`;
}

function plain(value: number, sig: number): string {
  let text = value.toPrecision(sig);
  // toPrecision switches to exponent form when the integer part has more digits than sig;
  // the figures beyond sig become zeros (188,680 → "188,700")
  if (text.includes("e")) text = String(Number(text));
  const decimals = text.includes(".") ? text.split(".")[1]!.length : 0;
  return Number(text).toLocaleString("en-US", { minimumFractionDigits: decimals, maximumFractionDigits: decimals });
}

function engineering(value: number, sig: number): string {
  let exp = Math.floor(Math.log10(Math.abs(value)) / 3) * 3;
  let mantissa = value / 10 ** exp;
  // rounding may carry the mantissa to 1000: move to the next group
  if (Math.abs(Number(mantissa.toPrecision(sig))) >= 1000) {
    exp += 3;
    mantissa = value / 10 ** exp;
  }
  const m = Number(mantissa.toPrecision(sig));
  const intDigits = Math.abs(m) >= 100 ? 3 : Math.abs(m) >= 10 ? 2 : 1;
  return `${m.toFixed(Math.max(0, sig - intDigits))}e${exp}`;
}

// ---------------------------------------------------------------------------------------------
// Quantities and display units

export type { Quantity };

/** The unit systems a user can read results in; "model" keeps each model's declared units. */
export const DISPLAY_UNIT_CHOICES = {
  model: { label: "as the model declares", units: null },
  "N-mm": { label: "N, mm, kg (stress in MPa)", units: { force: "N", length: "mm", mass: "kg" } },
  "kN-m": { label: "kN, m, kg (stress in kPa)", units: { force: "kN", length: "m", mass: "kg" } },
  "kN-mm": { label: "kN, mm, kg (stress in GPa)", units: { force: "kN", length: "mm", mass: "kg" } },
  "kN-m-t": { label: "kN, m, t (stress in kPa)", units: { force: "kN", length: "m", mass: "t" } },
  "kip-in": { label: "kip, in, lb (stress in ksi)", units: { force: "kip", length: "in", mass: "lb" } },
} as const satisfies Record<string, { label: string; units: { force: ForceUnit; length: LengthUnit; mass: MassUnit } | null }>;
export type DisplayUnitChoice = keyof typeof DISPLAY_UNIT_CHOICES;

export function isDisplayUnitChoice(v: unknown): v is DisplayUnitChoice {
  return typeof v === "string" && Object.hasOwn(DISPLAY_UNIT_CHOICES, v);
}

/**
 * Values in a model's units, shown in the reader's chosen units. Conversion happens on display
 * only: stored results, the result JSON and the CSV stay in the model's units.
 */
export interface QuantityFormatter {
  units: Units;
  /** the unit symbol of a quantity in the display system ("kN", "mm²", "MPa") */
  unit(q: Quantity): string;
  /** the value converted to the display system */
  convert(value: number, q: Quantity): number;
  /** "12.35 kN" */
  text(value: number | null | undefined, q: Quantity, opts?: NumberOptions): string;
  /** "12.35" (the unit is in the column header) */
  number(value: number | null | undefined, q: Quantity, opts?: NumberOptions): string;
}

export function quantityFormatter(modelUnits: Units | { length: string; force: string; mass: string }, choice: DisplayUnitChoice = "model"): QuantityFormatter {
  const from = modelUnits as Units;
  const to: Units = DISPLAY_UNIT_CHOICES[choice]?.units ?? from;
  const same = from.length === to.length && from.force === to.force && from.mass === to.mass;
  const convert = (v: number, q: Quantity) => (same ? v : convertUnit(v, q, from, to));
  const number = (v: number | null | undefined, q: Quantity, opts?: NumberOptions) => {
    if (v === null || v === undefined || !Number.isFinite(v)) return DASH;
    const zeroBelow = opts?.zeroBelow !== undefined ? Math.abs(convert(opts.zeroBelow, q)) : undefined;
    return formatNumber(convert(v, q), { ...opts, zeroBelow });
  };
  return {
    units: to,
    unit: (q) => unitLabel(q, to),
    convert,
    number,
    text: (v, q, opts) => {
      const n = number(v, q, opts);
      return n === DASH ? n : `${n} ${unitLabel(q, to)}`;
    },
  };
}

/** A quantity in its own units: "12.35 kN". */
export function formatQuantity(value: number | null | undefined, q: Quantity, units: Units, opts?: NumberOptions): string {
  return quantityFormatter(units).text(value, q, opts);
}

/** The noise floor of a column: values a billion times smaller than its largest print as 0. */
export function noiseFloor(values: Iterable<number>, relative = 1e-9): number {
  let max = 0;
  for (const v of values) if (Number.isFinite(v)) max = Math.max(max, Math.abs(v));
  return max * relative;
}

// ---------------------------------------------------------------------------------------------
// CSV: full precision (12 significant figures: far finer than any solver tolerance, and free of
// binary rounding tails such as 134999.99999999837), plain JavaScript
// number text that spreadsheets read, no grouping, no unit (the unit is in the header).

export function csvNumber(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "";
  return String(Number(value.toPrecision(12)));
}

/** "area (mm²)" */
export function withUnit(label: string, unit: string | null | undefined): string {
  return unit ? `${label} (${unit})` : label;
}

// ---------------------------------------------------------------------------------------------
// Dates and durations: UTC with a fixed pattern, so server and browser, page and PDF agree.

export function toDate(value: Date | string | number | null | undefined): Date | null {
  if (value === null || value === undefined || value === "") return null;
  const d = value instanceof Date ? value : new Date(value);
  return Number.isNaN(d.getTime()) ? null : d;
}

/** "2026-12-01 20:05 UTC"; with seconds: "2026-12-01 20:05:42 UTC". */
export function formatDateTime(value: Date | string | number | null | undefined, opts: { seconds?: boolean } = {}): string {
  const d = toDate(value);
  if (!d) return DASH;
  const iso = d.toISOString();
  return `${iso.slice(0, 10)} ${iso.slice(11, opts.seconds ? 19 : 16)} UTC`;
}

/** "2026-12-01" */
export function formatDate(value: Date | string | number | null | undefined): string {
  const d = toDate(value);
  return d ? d.toISOString().slice(0, 10) : DASH;
}

/** Elapsed time in words an engineer skims: "420 ms", "42 s", "3 min 05 s", "1 h 12 min". */
export function formatDuration(ms: number | null | undefined): string {
  if (ms === null || ms === undefined || !Number.isFinite(ms) || ms < 0) return DASH;
  if (ms < 1000) return `${Math.round(ms)} ms`;
  const s = Math.round(ms / 1000);
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${String(s % 60).padStart(2, "0")} s`;
  return `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, "0")} min`;
}

export function formatBytes(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return DASH;
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${formatNumber(bytes / 1024, { sig: 3 })} KB`;
  return `${formatNumber(bytes / (1024 * 1024), { sig: 3 })} MB`;
}

/** Short form of a long hex digest for tables; the full value goes in a title attribute. */
export function shortHash(hex: string, n = 12): string {
  return hex.length > n ? `${hex.slice(0, n)}…` : hex;
}

// ---------------------------------------------------------------------------------------------
// Axis ticks (d3-scale), the same for the page's SVG plot and the PDF's vector plot.

export interface Axis {
  (v: number): number;
  ticks: number[];
  domain: [number, number];
  log: boolean;
  label(v: number): string;
}

/** A linear axis rounded out to 1-2-5 steps with about `count` ticks; `integer` keeps whole ticks only. */
export function linearAxis(values: number[], range: [number, number], opts: { count?: number; integer?: boolean } = {}): Axis {
  const finite = values.filter(Number.isFinite);
  let lo = finite.length ? minOf(finite) : 0;
  let hi = finite.length ? maxOf(finite) : 1;
  if (lo === hi) {
    const pad = Math.abs(lo) * 0.05 || 1;
    lo -= pad;
    hi += pad;
  }
  const count = opts.count ?? 5;
  const s = scaleLinear().domain([lo, hi]).range(range).nice(count);
  let ticks = s.ticks(count);
  if (opts.integer) ticks = ticks.filter(Number.isInteger);
  const f = ((v: number) => s(v)) as Axis;
  f.ticks = ticks;
  f.domain = s.domain() as [number, number];
  f.log = false;
  f.label = (v) => formatNumber(v, { sig: 6, trim: true, zeroBelow: Math.abs(f.domain[1] - f.domain[0]) * 1e-9 });
  return f;
}

/**
 * A base-10 log axis over whole decades covering the positive values. Values below `floor`
 * (and zeros) are clamped to it; callers that must not show a floor drop those points first.
 */
export function logAxis(values: number[], range: [number, number], opts: { floor?: number; maxTicks?: number } = {}): Axis {
  const pos = values.filter((v) => Number.isFinite(v) && v > 0);
  let lo = pos.length ? Math.floor(Math.log10(minOf(pos))) : -6;
  let hi = pos.length ? Math.ceil(Math.log10(maxOf(pos))) : 0;
  if (lo === hi) hi = lo + 1;
  if (opts.floor !== undefined) lo = Math.max(lo, Math.floor(Math.log10(opts.floor)));
  const s = scaleLog().domain([10 ** lo, 10 ** hi]).range(range).clamp(true);
  const every = Math.max(1, Math.ceil((hi - lo) / (opts.maxTicks ?? 6)));
  const ticks: number[] = [];
  for (let e = lo; e <= hi; e += every) ticks.push(10 ** e);
  const f = ((v: number) => s(v > 0 ? v : 10 ** lo)) as Axis;
  f.ticks = ticks;
  f.domain = [10 ** lo, 10 ** hi];
  f.log = true;
  f.label = (v) => {
    const e = Math.round(Math.log10(v));
    return e === 0 ? "1" : `1e${e < 0 ? MINUS + String(-e) : e}`;
  };
  return f;
}

/**
 * Violations are relative to each limit; below one part in a billion they are rounding noise,
 * so plots draw them on this floor (labelled as met) instead of at 1e-15 climbing to 1e-12.
 */
export const VIOLATION_FLOOR = 1e-9;

/**
 * A relative violation at or below one part in a million is a limit met: far inside the
 * independent re-analysis's own 1e-4 (engine/design/verify.ts). Plots draw such points on this
 * level, so a converged run's line does not seem to climb from 1e-9 to 1e-8 in its last steps.
 */
export const VIOLATION_MET = 1e-6;

/** Where a plot draws a relative violation: on the "met" level when it is at most that. */
export function plottedViolation(v: number): number {
  return v <= VIOLATION_MET ? VIOLATION_MET : v;
}
