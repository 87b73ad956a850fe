// Number, date and duration formatting shared by every page. Dates are written in UTC with a
// fixed pattern so the server render and the browser's hydration agree on the same text.

/** A measured value with a sensible number of significant digits; never "NaN" on screen. */
export function fmtNum(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "–";
  if (value === 0) return "0";
  const abs = Math.abs(value);
  if (abs >= 1e6 || abs < 1e-3) return value.toExponential(Math.max(0, digits - 1)).replace("e+", "e");
  const text = value.toPrecision(digits);
  // toPrecision may itself switch to exponent form for large integers
  if (text.includes("e")) return Number(text).toLocaleString("en-US", { maximumFractionDigits: 0 });
  return grouped(text);
}

/**
 * Residuals, violations and multipliers span many decades. Between 1e-3 and 1e4 they read in
 * plain notation ("0.0452", "6.12", "1,235"); outside it in exponent form with the same
 * significant digits ("6.12e-7", "3.40e5"), never "e0" or "e+". `digits` are the mantissa's
 * decimals, so the default shows three significant digits.
 */
export function fmtSci(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "–";
  if (value === 0) return "0";
  // the range is decided on the rounded value, so 9999.7 becomes "1.00e4", not "10,000"
  const rounded = Math.abs(Number(value.toExponential(digits)));
  if (rounded < 1e-3 || rounded >= 1e4) return value.toExponential(digits).replace("e+", "e");
  // plain: the significant digits asked for; a value with more integer digits than that
  // keeps them all (toPrecision would switch to exponent form there)
  const text = value.toPrecision(digits + 1);
  return grouped(text.includes("e") ? String(Math.round(value)) : text);
}

/** A plain decimal text with thousands separators, keeping its decimals (trailing zeros too). */
function grouped(text: string): string {
  const decimals = text.includes(".") ? text.split(".")[1]!.length : 0;
  return Number(text).toLocaleString("en-US", { minimumFractionDigits: decimals, maximumFractionDigits: decimals });
}

/** A ratio shown as a percentage (utilization 0.953 → "95.3 %"). */
export function fmtPercent(ratio: number | null | undefined, decimals = 1): string {
  if (ratio === null || ratio === undefined || !Number.isFinite(ratio)) return "–";
  return `${(ratio * 100).toFixed(decimals)} %`;
}

export function toDate(value: Date | string | number | null | undefined): Date | null {
  if (value === null || value === undefined || value === "") return null;
  const d = value instanceof Date ? value : new Date(value);
  return Number.isNaN(d.getTime()) ? null : d;
}

/** "2026-12-01 20:05 UTC" */
export function fmtDateTime(value: Date | string | number | null | undefined): string {
  const d = toDate(value);
  if (!d) return "–";
  const iso = d.toISOString();
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}

/** Elapsed time between two instants in words an engineer skims: "42 s", "3 min 05 s", "1 h 12 min". */
export function fmtDuration(ms: number | null | undefined): string {
  if (ms === null || ms === undefined || !Number.isFinite(ms) || ms < 0) return "–";
  if (ms < 1000) return `${Math.round(ms)} ms`;
  const s = Math.round(ms / 1000);
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${String(s % 60).padStart(2, "0")} s`;
  return `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, "0")} min`;
}

export function fmtBytes(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return "–";
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}

/** Short form of a long hex digest for tables; the full value goes in a title attribute. */
export function shortHash(hex: string, n = 12): string {
  return hex.length > n ? `${hex.slice(0, n)}…` : hex;
}
