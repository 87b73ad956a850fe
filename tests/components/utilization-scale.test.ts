// Strutwise's utilization scale. Lightness in OKLab (Ottosson 2020) must fall evenly with
// utilization so greyscale print and colour-blind readers see the order; the sRGB transfer
// function is IEC 61966-2-1. The luminance check recomputes relative luminance (WCAG 2.x
// definition) from the hex the scale produces, independently of the scale's own code.
import { describe, expect, it } from "vitest";
import { isOverLimit, OVER_LIMIT, utilizationColor, utilizationLightness } from "~/lib/utilization-scale";

function luminance(hex: string): number {
  const c = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((v) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  return 0.2126 * c[0]! + 0.7152 * c[1]! + 0.0722 * c[2]!;
}

describe("utilization scale", () => {
  it("is continuous: neighbouring utilizations get neighbouring colours, not bands", () => {
    const shades = new Set<string>();
    for (let k = 0; k <= 100; k++) shades.add(utilizationColor(k / 100));
    expect(shades.size).toBeGreaterThan(60);
  });

  it("darkens monotonically (greyscale print keeps the order), from pale to deep", () => {
    let last = Infinity;
    for (let k = 0; k <= 50; k++) {
      const y = luminance(utilizationColor(k / 50));
      expect(y).toBeLessThan(last);
      last = y;
    }
    expect(luminance(utilizationColor(0))).toBeGreaterThan(0.7);
    expect(luminance(utilizationColor(1))).toBeLessThan(0.1);
    // OKLab lightness steps are even on each half of the scale
    expect(utilizationLightness(0.25) - utilizationLightness(0.5)).toBeCloseTo(utilizationLightness(0) - utilizationLightness(0.25), 12);
  });

  it("marks over-limit members apart from the scale, half a per cent above 100 %", () => {
    expect(isOverLimit(1.0)).toBe(false);
    expect(isOverLimit(OVER_LIMIT - 1e-6)).toBe(false);
    expect(isOverLimit(1.02)).toBe(true);
    expect(isOverLimit(Number.NaN)).toBe(true);
    expect(utilizationColor(1.5)).toBe(utilizationColor(1)); // the stripe, not a new hue, says "over"
  });
});
