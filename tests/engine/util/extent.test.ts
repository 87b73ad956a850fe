// minOf / maxOf / appendAll at lengths where spreading into a call overflows the stack (a
// V8 call takes at most some 10^5 arguments on the default stack: common practice).
import { describe, expect, it } from "vitest";
import { appendAll, maxOf, minOf } from "~/engine/util/extent";

const big = Array.from({ length: 2_000_000 }, (_, i) => Math.sin(i) * 1000);

describe("extent without spreads", () => {
  it("finds the extremes of two million values, where Math.max(...values) throws", () => {
    expect(() => Math.max(...big)).toThrow(RangeError);
    let lo = Infinity;
    let hi = -Infinity;
    for (const v of big) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    expect(minOf(big)).toBe(lo);
    expect(maxOf(big)).toBe(hi);
  });

  it("answers the given value for an empty list, and reads typed arrays", () => {
    expect(minOf([], 0)).toBe(0);
    expect(maxOf([], 1)).toBe(1);
    expect(maxOf(new Float64Array([3, -2, 7.5]))).toBe(7.5);
    expect(minOf(new Float64Array([3, -2, 7.5]))).toBe(-2);
  });

  it("appends two million items, where push(...items) throws", () => {
    expect(() => [].push(...(big as never[]))).toThrow(RangeError);
    const out = appendAll([1], big);
    expect(out).toHaveLength(big.length + 1);
    expect(out[big.length]).toBe(big[big.length - 1]);
  });
});
