// The report's colours are the design tokens of app/app.css; this keeps the two equal, and
// utilization has one scale for pages and report (utilization-scale.test.ts).
import fs from "node:fs";
import { describe, expect, it } from "vitest";
import { TOKENS } from "~/lib/report/palette";

describe("report palette", () => {
  it("matches every token of app/app.css it uses", () => {
    const css = fs.readFileSync("app/app.css", "utf8");
    for (const [token, hex] of Object.entries(TOKENS)) {
      const m = new RegExp(`${token}:\\s*(#[0-9a-fA-F]{6})`).exec(css);
      expect(m?.[1]?.toLowerCase(), token).toBe(hex.toLowerCase());
    }
  });
});
