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

  it("writes residuals in exponent form and ratios as percentages", () => {
    expect(fmtSci(3.1e-9)).toBe("3.10e-9");
    expect(fmtPercent(0.953)).toBe("95.3 %");
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
