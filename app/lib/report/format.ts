// Number and date formatting for the report: significant figures, a true minus sign, and UTC
// timestamps so a printed record reads the same wherever it is opened.
import { fmtSci } from "~/components/ui/format";

const MINUS = "−";

export function num(v: number | null | undefined, sig = 4): string {
  if (v === null || v === undefined) return "–";
  if (Number.isNaN(v)) return "not a number";
  if (!Number.isFinite(v)) return v > 0 ? "+inf" : `${MINUS}inf`;
  if (v === 0) return "0";
  const a = Math.abs(v);
  let s: string;
  if (a >= 1e-3 && a < 1e7) {
    s = Number(v.toPrecision(sig)).toString();
    if (s.includes("e")) s = v.toExponential(sig - 1);
  } else {
    s = v.toExponential(sig - 1).replace("e+", "e");
  }
  return s.replace(/^-/, MINUS);
}

/** Residuals, violations and multipliers, three figures: the pages' rule (plain from 1e-3 to 1e4, else "6.12e-7"). */
export function sci(v: number | null | undefined): string {
  if (v === null || v === undefined) return "–";
  if (!Number.isFinite(v)) return num(v);
  return fmtSci(v).replace(/^-/, MINUS);
}

export function pct(ratio: number): string {
  if (!Number.isFinite(ratio)) return num(ratio);
  return `${(ratio * 100).toFixed(1)} %`.replace(/^-/, MINUS);
}

export function utc(d: Date | null | undefined): string {
  if (!d) return "–";
  return `${d.toISOString().slice(0, 19).replace("T", " ")} UTC`;
}

export function day(d: Date): string {
  return d.toISOString().slice(0, 10);
}
