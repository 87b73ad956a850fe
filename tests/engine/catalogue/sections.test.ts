// The built-in generic catalogue against hand values (geometric formulas), and the I = a A^b
// least-squares fit against exact power laws.
import { describe, expect, it } from "vitest";
import { circularHollow, fitSecondMoment, genericCatalogue, sectionLadder, solidRound, squareHollow } from "~/engine/sections";

describe("generic catalogue: hand values", () => {
  it("CHS 88.9x4 (circular hollow: outer diameter 88.9 mm, wall 4 mm)", () => {
    // d = 88.9 - 2*4 = 80.9 mm
    // A = pi/4 (88.9^2 - 80.9^2) = pi/4 (7903.21 - 6544.81) = pi/4 * 1358.40 = 1066.88 mm^2
    // I = pi/64 (88.9^4 - 80.9^4) = pi/64 (62 460 728.3 - 42 834 538.0) = pi/64 * 19 626 190.3
    //   = 963 398 mm^4  (9.634e5)
    const s = genericCatalogue("mm").find((x) => x.id === "CHS 88.9x4")!;
    expect(s.family).toBe("CHS");
    expect(s.area).toBeCloseTo(1066.88, 2);
    expect(s.I / 963398 - 1).toBeLessThan(1e-6);
    expect(s.I / 963398 - 1).toBeGreaterThan(-1e-6);
  });

  it("SHS 100x5 (square hollow, sharp corners: outer width 100 mm, wall 5 mm)", () => {
    // b = 100 - 2*5 = 90 mm
    // A = 100^2 - 90^2 = 10 000 - 8 100 = 1 900 mm^2
    // I = (100^4 - 90^4) / 12 = (100 000 000 - 65 610 000) / 12 = 34 390 000 / 12 = 2 865 833.3 mm^4
    const s = genericCatalogue("mm").find((x) => x.id === "SHS 100x5")!;
    expect(s.area).toBe(1900);
    expect(s.I).toBeCloseTo(2865833.333, 2);
  });

  it("solid round 20 mm: A = pi 20^2/4 = 314.16 mm^2, I = pi 20^4/64 = 7853.98 mm^4", () => {
    expect(solidRound(20).area).toBeCloseTo(314.159, 3);
    expect(solidRound(20).I).toBeCloseTo(7853.982, 3);
  });

  it("converts to the model's length unit (cm: areas / 100, I / 10 000)", () => {
    const mm = genericCatalogue("mm").find((x) => x.id === "CHS 88.9x4")!;
    const cm = genericCatalogue("cm").find((x) => x.id === "CHS 88.9x4")!;
    expect(cm.area).toBeCloseTo(mm.area / 100, 10);
    expect(cm.I).toBeCloseTo(mm.I / 1e4, 8);
    expect(cm.dimensions.outer).toBeCloseTo(8.89, 12);
  });

  it("keeps hollow sections within the compactness limits and unique ids", () => {
    const c = genericCatalogue("mm");
    expect(new Set(c.map((s) => s.id)).size).toBe(c.length);
    for (const s of c) {
      if (s.family === "CHS") expect(s.dimensions.outer / s.dimensions.wall!).toBeLessThanOrEqual(50);
      if (s.family === "SHS") expect(s.dimensions.outer / s.dimensions.wall!).toBeGreaterThanOrEqual(8);
      expect(s.area).toBeGreaterThan(0);
      expect(s.I).toBeGreaterThan(0);
    }
    expect(circularHollow(100, 50).area).toBeCloseTo(solidRound(100).area, 9); // a wall of half the diameter is solid
    expect(squareHollow(50, 25).I).toBeCloseTo(50 ** 4 / 12, 9);
  });
});

describe("I = a A^b fit", () => {
  it("recovers an exact power law", () => {
    const secs = [100, 300, 900, 2700].map((A, k) => ({ id: `s${k}`, area: A, I: 0.3 * A ** 2.2 }));
    const f = fitSecondMoment(secs);
    expect(f.a).toBeCloseTo(0.3, 10);
    expect(f.b).toBeCloseTo(2.2, 10);
    expect(f.maxRelativeError).toBeLessThan(1e-10);
  });

  it("is exact for solid rounds (I = A^2 / (4 pi))", () => {
    const f = fitSecondMoment(genericCatalogue("mm", ["RND"]));
    expect(f.b).toBeCloseTo(2, 10);
    expect(f.a).toBeCloseTo(1 / (4 * Math.PI), 12);
  });

  it("reports its largest error over a mixed catalogue", () => {
    const secs = genericCatalogue("mm", ["CHS"]);
    const f = fitSecondMoment(secs);
    const worst = Math.max(...secs.map((s) => Math.abs((f.a * s.area ** f.b) / s.I - 1)));
    expect(f.maxRelativeError).toBeCloseTo(worst, 12);
    expect(f.b).toBeGreaterThan(2); // thin walls carry more I per area as sections grow
  });

  it("a ladder drops dominated sections and keeps bounds", () => {
    const secs = [
      { id: "a", area: 100, I: 10 },
      { id: "b", area: 120, I: 9 }, // heavier and less stiff than a: never worth it
      { id: "c", area: 150, I: 30 },
      { id: "d", area: 400, I: 90 },
    ];
    expect(sectionLadder(secs, 50, 300).map((s) => secs[s.section].id)).toEqual(["a", "c"]);
  });
});
