// The report's colours are the design tokens of app/app.css; this keeps the two equal, and
// the utilization bands those of the result pages' legend.
import fs from "node:fs";
import { describe, expect, it } from "vitest";
import { OVER_LIMIT, TOKENS, UTIL_BANDS, utilBand } from "~/lib/report/palette";

describe("report palette", () => {
  it("matches every token of app/app.css it uses", () => {
    const css = fs.readFileSync("app/app.css", "utf8");
    for (const [token, hex] of Object.entries(TOKENS)) {
      const m = new RegExp(`${token}:\\s*(#[0-9a-fA-F]{6})`).exec(css);
      expect(m?.[1]?.toLowerCase(), token).toBe(hex.toLowerCase());
    }
  });

  it("puts a member at its limit (within solver tolerance) in the 90–100 % band, not over it", () => {
    expect(UTIL_BANDS[utilBand(1.0)]!.label).toBe("90–100 %");
    expect(UTIL_BANDS[utilBand(OVER_LIMIT - 1e-6)]!.label).toBe("90–100 %");
    expect(UTIL_BANDS[utilBand(1.02)]!.label).toBe("over the limit");
    expect(UTIL_BANDS[utilBand(0.3)]!.label).toBe("below 50 %");
    expect(UTIL_BANDS[utilBand(Number.NaN)]!.label).toBe("over the limit");
  });
});
