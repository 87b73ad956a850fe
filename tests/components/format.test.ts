// The one formatter (app/lib/format.ts). Engineering notation (exponent a multiple of three)
// and significant figures are common practice; unit factors are NIST SP 811 appendix B.
import { describe, expect, it } from "vitest";
import {
  csvNumber,
  formatDate,
  formatDateTime,
  formatDuration,
  formatNumber,
  formatPercent,
  formatResidual,
  linearAxis,
  logAxis,
  MINUS,
  noiseFloor,
  plottedViolation,
  quantityFormatter,
  VIOLATION_MET,
  withUnit,
} from "~/lib/format";

const read = (t: string) => Number(t.replace(/,/g, "").replace(MINUS, "-"));

describe("numbers", () => {
  it("never shows NaN or Infinity", () => {
    expect(formatNumber(Number.NaN)).toBe("–");
    expect(formatNumber(Infinity)).toBe("–");
    expect(formatResidual(null)).toBe("–");
    expect(formatPercent(undefined)).toBe("–");
  });

  it("four significant figures with grouping; engineering notation outside 1e-3 to 1e6", () => {
    expect(formatNumber(0.287)).toBe("0.2870");
    expect(formatNumber(4000)).toBe("4,000");
    expect(formatNumber(812.4)).toBe("812.4");
    expect(formatNumber(-25000)).toBe(`${MINUS}25,000`);
    expect(formatNumber(36600000)).toBe("36.60e6");
    expect(formatNumber(3.1e-9)).toBe("3.100e-9");
    expect(formatNumber(1.202e-5)).toBe("12.02e-6");
    expect(formatNumber(999999.7)).toBe("1.000e6"); // decided after rounding
    expect(formatNumber(134999.99999999837, { sig: 6 })).toBe("135,000");
  });

  it("prints noise against a column's scale as 0", () => {
    const coords = [0, 1.202e-15, 4000, 12000];
    const floor = noiseFloor(coords);
    expect(formatNumber(1.202e-15, { zeroBelow: floor })).toBe("0");
    expect(formatNumber(-3e-13, { zeroBelow: floor })).toBe("0");
    expect(formatNumber(0.5, { zeroBelow: floor })).toBe("0.5000");
  });

  it("engineering exponents are multiples of three and read back within half a unit of the last figure", () => {
    for (let e = -15; e <= 15; e++)
      for (const m of [1, 1.005, 2.5, 6.12, 9.994, 9.9996]) {
        for (const x of [m * 10 ** e, -m * 10 ** e]) {
          const t = formatNumber(x);
          const exp = /e(-?\d+)$/.exec(t);
          if (exp) expect(Math.abs(Number(exp[1]) % 3), `${x} → ${t}`).toBe(0);
          expect(t, String(x)).not.toMatch(/e\+|e-0|NaN/);
          expect(Math.abs(read(t) / x - 1), `${x} → ${t}`).toBeLessThanOrEqual(5e-4);
        }
      }
  });

  it("residuals and multipliers: three figures, plain from 1e-3 below 1e4", () => {
    expect(formatResidual(6.12e-7)).toBe("612e-9");
    expect(formatResidual(6.1234)).toBe("6.12");
    expect(formatResidual(0.0452)).toBe("0.0452");
    expect(formatResidual(12345)).toBe("12.3e3");
    expect(formatResidual(0)).toBe("0");
  });

  it("percentages with a true minus sign, and no negative zero", () => {
    expect(formatPercent(0.953)).toBe("95.3 %");
    expect(formatPercent(-0.128)).toBe(`${MINUS}12.8 %`);
    expect(formatPercent(-0.00001)).toBe("0.0 %");
  });

  it("CSV keeps twelve significant figures, no grouping, no unit", () => {
    expect(csvNumber(134999.99999999837)).toBe("135000");
    expect(csvNumber(0.1 + 0.2)).toBe("0.3");
    expect(csvNumber(1.23456789012345e-7)).toBe("1.23456789012e-7");
    expect(csvNumber(Number.NaN)).toBe("");
    expect(withUnit("area", "mm²")).toBe("area (mm²)");
  });
});

describe("quantities in the reader's units (NIST SP 811 factors)", () => {
  const model = { length: "mm", force: "N", mass: "kg" } as const;
  it("keeps the model's units by default", () => {
    const q = quantityFormatter(model);
    expect(q.text(235, "stress")).toBe("235.0 MPa");
    expect(q.unit("area")).toBe("mm²");
  });
  it("converts N and mm to kN and m on display only", () => {
    const q = quantityFormatter(model, "kN-m");
    expect(q.text(12_345, "force")).toBe("12.35 kN");
    expect(q.text(8_000, "length")).toBe("8.000 m");
    expect(q.text(2_500, "area")).toBe("0.002500 m²");
    expect(q.unit("stress")).toBe("kPa");
    expect(q.convert(235, "stress")).toBeCloseTo(235_000, 6); // 235 MPa = 235,000 kPa
  });
  it("converts a noise floor with the value", () => {
    const q = quantityFormatter(model, "kN-m");
    expect(q.number(1e-12, "length", { zeroBelow: 1e-6 })).toBe("0");
  });
});

describe("dates and durations", () => {
  it("writes UTC the same on server and browser", () => {
    expect(formatDateTime("2026-12-01T20:05:42.000Z")).toBe("2026-12-01 20:05 UTC");
    expect(formatDateTime(new Date("2026-12-01T20:05:42.000Z"), { seconds: true })).toBe("2026-12-01 20:05:42 UTC");
    expect(formatDate("2026-12-01T20:05:42.000Z")).toBe("2026-12-01");
    expect(formatDateTime(null)).toBe("–");
  });
  it("writes durations in words an engineer skims", () => {
    expect(formatDuration(420)).toBe("420 ms");
    expect(formatDuration(42_000)).toBe("42 s");
    expect(formatDuration(185_000)).toBe("3 min 05 s");
    expect(formatDuration(4_320_000)).toBe("1 h 12 min");
  });
});

describe("axis ticks (d3-scale)", () => {
  it("rounds a linear domain out to 1-2-5 steps and maps its ends onto the range", () => {
    const s = linearAxis([0.287, 0.412], [200, 0]);
    expect(s.domain[0]).toBeLessThanOrEqual(0.287);
    expect(s.domain[1]).toBeGreaterThanOrEqual(0.412);
    expect(s(s.domain[0])).toBeCloseTo(200, 9);
    const step = s.ticks[1]! - s.ticks[0]!;
    expect([0.01, 0.02, 0.05, 0.1]).toContainEqual(Number(step.toPrecision(6)));
  });
  it("widens a flat series and keeps whole iterations", () => {
    expect(Number.isFinite(linearAxis([3, 3, 3], [100, 0])(3))).toBe(true);
    expect(linearAxis([0, 3], [0, 100], { count: 10, integer: true }).ticks.every(Number.isInteger)).toBe(true);
  });
  it("labels whole decades and draws values under the floor on it", () => {
    const s = logAxis([1e-15, 1e-3, 2], [100, 0], { floor: 1e-9 });
    expect(s.domain[0]).toBe(1e-9);
    expect(s(1e-15)).toBeCloseTo(100, 9);
    expect(s.label(1e-6)).toBe(`1e${MINUS}6`);
    expect(s.label(1)).toBe("1");
  });
  it("draws a converged run's violations on the met level, so its line never climbs at the end", () => {
    // the last steps of a run that met every limit: rounding wanders between 1e-12 and 3e-8
    const tail = [2.4e-2, 3.1e-4, 8.0e-7, 1e-12, 4.1e-9, 3.2e-8].map(plottedViolation);
    expect(tail.slice(3)).toEqual([VIOLATION_MET, VIOLATION_MET, VIOLATION_MET]);
    for (let k = 1; k < tail.length; k++) expect(tail[k]!).toBeLessThanOrEqual(tail[k - 1]!);
    // a broken limit is drawn where it is
    expect(plottedViolation(0.013)).toBe(0.013);
  });
});

describe("tick labels", () => {
  it("drop trailing zeros", () => {
    expect(formatNumber(0.004, { sig: 6, trim: true })).toBe("0.004");
    expect(formatNumber(2, { sig: 6, trim: true })).toBe("2");
    expect(formatNumber(12_000_000, { sig: 6, trim: true })).toBe("12e6");
    expect(linearAxis([0, 6], [0, 100], { integer: true }).ticks.map((t) => linearAxis([0, 6], [0, 100]).label(t))).toContain("3");
  });
});
