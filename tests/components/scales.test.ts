// Axis scales of the convergence plot. Tick steps of 1, 2 or 5 times a power of ten are
// common practice for chart axes; a log axis labels whole decades.
import { describe, expect, it } from "vitest";
import { linearScale, linePath, logScale, niceStep, tickLabel } from "~/components/charts/scales";

describe("linear scale", () => {
  it("rounds the domain out to 1-2-5 steps and maps its ends onto the range", () => {
    const s = linearScale([0.287, 0.412], [200, 0], 5);
    expect(s.domain[0]).toBeLessThanOrEqual(0.287);
    expect(s.domain[1]).toBeGreaterThanOrEqual(0.412);
    expect(s(s.domain[0])).toBeCloseTo(200, 9);
    expect(s(s.domain[1])).toBeCloseTo(0, 9);
    const step = s.ticks[1]! - s.ticks[0]!;
    expect([0.01, 0.02, 0.05, 0.1]).toContainEqual(Number(step.toPrecision(6)));
  });

  it("widens a flat series instead of dividing by zero", () => {
    const s = linearScale([3, 3, 3], [100, 0]);
    expect(Number.isFinite(s(3))).toBe(true);
    expect(s.domain[0]).toBeLessThan(3);
    expect(s.domain[1]).toBeGreaterThan(3);
  });

  it("picks nice steps", () => {
    expect(niceStep(0.013)).toBeCloseTo(0.02, 12);
    expect(niceStep(3.2)).toBe(5);
    expect(niceStep(70)).toBe(100);
  });
});

describe("log scale", () => {
  it("covers the values with whole decades: 1e-10 … 1 for residuals from 2e-10 to 0.8", () => {
    const s = logScale([0.8, 0.21, 2e-10, 6e-8], [300, 0]);
    expect(s.domain[0]).toBeCloseTo(1e-10, 20);
    expect(s.domain[1]).toBe(1);
    expect(s(1)).toBeCloseTo(0, 9);
    expect(s(1e-10)).toBeCloseTo(300, 9);
    // log10 is linear in the exponent: 1e-5 sits halfway between 1e-10 and 1
    expect(s(1e-5)).toBeCloseTo(150, 9);
    expect(s.ticks.every((t) => Number.isInteger(Math.round(Math.log10(t))))).toBe(true);
    expect(s.ticks.length).toBeLessThanOrEqual(7);
  });

  it("puts zero (a feasible point's violation) on the floor of the axis", () => {
    const s = logScale([0, 1e-3, 1], [100, 0]);
    expect(s(0)).toBe(100);
  });

  it("labels decades as 1eN", () => {
    expect(tickLabel(1e-6, true)).toBe("1e-6");
    expect(tickLabel(1, true)).toBe("1");
  });
});

describe("line path", () => {
  it("breaks the line at missing values", () => {
    expect(linePath([{ x: 0, y: 1 }, { x: 1, y: null }, { x: 2, y: 3 }, { x: 3, y: 4 }])).toBe("M0.0,1.0M2.0,3.0L3.0,4.0");
  });
});
