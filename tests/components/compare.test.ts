// The compare page's pure parts: the address's run list, the plain-words count of governing
// limits, each group's area, the change against run A, and the diverging change-in-area scale.
// Colour checks recompute relative luminance (WCAG 2.x definition, IEC 61966-2-1 transfer
// function) from the hex the scale produces, independently of the scale's own code; the
// blue/orange pair is the common practice for colour-blind-safe diverging scales.
import { describe, expect, it } from "vitest";
import { changeAgainst } from "~/components/compare/CompareTable";
import { changeColor, niceLimit } from "~/lib/change-scale";
import { governingKinds, groupAreasOf, parseJobIds } from "~/lib/jobs/compare.server";
import { utilizationColor } from "~/lib/utilization-scale";

function rgb(hex: string): [number, number, number] {
  return [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255) as [number, number, number];
}
function luminance(hex: string): number {
  const c = rgb(hex).map((v) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  return 0.2126 * c[0]! + 0.7152 * c[1]! + 0.0722 * c[2]!;
}

describe("compare: the address and the figures", () => {
  it("reads a,b,,c as three runs in order, without repeats or blanks", () => {
    expect(parseJobIds("a, b,,c,a")).toEqual(["a", "b", "c"]);
    expect(parseJobIds(null)).toEqual([]);
  });

  it("counts governing limits by what they are, in words, most first", () => {
    const kinds = governingKinds([{ id: "stress:U1-U2:LC1" }, { id: "stress-compression:L1:LC2" }, { id: "displacement:C:y:LC1" }, { id: "area-min:web" }, { id: "buckling:U1:LC1" }, { id: "stress:D3:LC1" }]);
    expect(kinds).toEqual([
      { kind: "stress", count: 3 },
      { kind: "buckling", count: 1 },
      { kind: "displacement", count: 1 },
      { kind: "minimum size", count: 1 },
    ]);
  });

  it("takes each group's area (a member without a group stands for itself)", () => {
    expect(groupAreasOf([{ id: "a", group: "chord", area: 100 }, { id: "b", group: "chord", area: 100 }, { id: "c", area: 42 }])).toEqual({ chord: 100, c: 42 });
  });

  it("states the change against run A with its sign (hand-worked: 1,150 against 1,000 is +15.0 %)", () => {
    expect(changeAgainst(1000, 1150)).toBe("+15.0 %");
    expect(changeAgainst(1000, 960)).toBe("−4.0 %");
    expect(changeAgainst(1000, 1000)).toBe("0.0 %");
    expect(changeAgainst(0, 5)).toBe("–");
  });
});

describe("change-in-area scale", () => {
  it("is palest at no change and darkens evenly toward either end (so print keeps the order)", () => {
    const mid = luminance(changeColor(0, 1));
    for (const sign of [-1, 1]) {
      let last = mid;
      for (let k = 1; k <= 10; k++) {
        const y = luminance(changeColor((sign * k) / 10, 1));
        expect(y).toBeLessThan(last);
        last = y;
      }
    }
    expect(mid).toBeGreaterThan(0.85);
  });

  it("tells smaller (blue-leaning) from larger (orange-leaning) by hue, and shares no colour with the utilization scale", () => {
    const [r1, , b1] = rgb(changeColor(-1, 1));
    const [r2, , b2] = rgb(changeColor(1, 1));
    expect(b1).toBeGreaterThan(r1);
    expect(r2).toBeGreaterThan(b2);
    expect(changeColor(1, 1)).not.toBe(utilizationColor(1));
    expect(changeColor(0.5, 1)).not.toBe(utilizationColor(0.5));
  });

  it("clamps beyond the limit and rounds the legend's limit to 1, 2 or 5 times a power of ten", () => {
    expect(changeColor(7, 1)).toBe(changeColor(1, 1));
    expect(niceLimit(340)).toBe(500);
    expect(niceLimit(0.013)).toBe(0.02);
    expect(niceLimit(1000)).toBe(1000);
    expect(niceLimit(0)).toBe(1);
  });
});
