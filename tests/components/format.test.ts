import { describe, expect, it } from "vitest";
import { fmtDateTime, fmtDuration, fmtNum, fmtPercent, fmtSci } from "~/components/ui/format";

describe("display formatting", () => {
  it("never shows NaN or Infinity", () => {
    expect(fmtNum(Number.NaN)).toBe("–");
    expect(fmtNum(Infinity)).toBe("–");
    expect(fmtSci(null)).toBe("–");
    expect(fmtPercent(undefined)).toBe("–");
  });

  it("shows four significant digits with grouping, exponent form for very large or small values", () => {
    expect(fmtNum(0.287)).toBe("0.2870");
    expect(fmtNum(36600000)).toBe("3.660e7");
    expect(fmtNum(4000)).toBe("4,000");
    expect(fmtNum(812.4)).toBe("812.4");
    expect(fmtNum(-25000)).toBe("-25,000");
    expect(fmtNum(3.1e-9)).toBe("3.100e-9");
  });

  it("writes residuals in exponent form only outside 1e-3 to 1e4, and ratios as percentages", () => {
    // three significant figures either way (common practice for residuals and multipliers)
    expect(fmtSci(3.1e-9)).toBe("3.10e-9");
    expect(fmtSci(6.12e-7)).toBe("6.12e-7");
    expect(fmtSci(-2.5e-5)).toBe("-2.50e-5");
    expect(fmtSci(6.1234)).toBe("6.12"); // was "6.12e0"
    expect(fmtSci(1)).toBe("1.00");
    expect(fmtSci(0.0452)).toBe("0.0452");
    expect(fmtSci(0.001)).toBe("0.00100");
    expect(fmtSci(0.000999)).toBe("9.99e-4");
    expect(fmtSci(1234.5)).toBe("1,235"); // integer digits are never dropped
    expect(fmtSci(12345)).toBe("1.23e4");
    expect(fmtSci(9999.7)).toBe("1.00e4"); // the range is decided after rounding
    expect(fmtSci(0)).toBe("0");
    expect(fmtPercent(0.953)).toBe("95.3 %");
  });

  it("never writes an exponent of zero, a plus sign or a leading zero in the exponent", () => {
    for (let e = -12; e <= 12; e++)
      for (const m of [1, 1.005, 2.5, 6.12, 9.994, 9.996]) {
        const v = m * 10 ** e;
        for (const x of [v, -v]) {
          const t = fmtSci(x);
          expect(t, String(x)).not.toMatch(/e0|e\+|e-0/);
          // the text reads back as the value within half a unit of its third figure
          expect(Math.abs(Number(t.replace(/,/g, "")) / x - 1), `${x} → ${t}`).toBeLessThanOrEqual(5e-3);
          const plain = !t.includes("e");
          const a = Math.abs(Number(x.toPrecision(3)));
          expect(plain, `${x} → ${t}`).toBe(a >= 1e-3 && a < 1e4);
        }
      }
  });

  it("writes UTC date-times the same on server and browser", () => {
    expect(fmtDateTime("2026-12-01T20:05:42.000Z")).toBe("2026-12-01 20:05 UTC");
    expect(fmtDateTime(null)).toBe("–");
  });

  it("writes durations in words an engineer skims", () => {
    expect(fmtDuration(420)).toBe("420 ms");
    expect(fmtDuration(42_000)).toBe("42 s");
    expect(fmtDuration(185_000)).toBe("3 min 05 s");
    expect(fmtDuration(4_320_000)).toBe("1 h 12 min");
  });
});
