// The report's colours are the design tokens of app/app.css; this keeps the two equal, and
// utilization has one scale for pages and report (utilization-scale.test.ts).
import fs from "node:fs";
import { describe, expect, it } from "vitest";
import { TOKENS } from "~/lib/report/palette";
import { TONE_COLORS } from "~/lib/job-state";

describe("report palette", () => {
  it("matches every token of app/app.css it uses", () => {
    const css = fs.readFileSync("app/app.css", "utf8");
    for (const [token, hex] of Object.entries(TOKENS)) {
      const m = new RegExp(`${token}:\\s*(#[0-9a-fA-F]{6})`).exec(css);
      expect(m?.[1]?.toLowerCase(), token).toBe(hex.toLowerCase());
    }
  });

  it("gives the job-state tones of the PDF and the mail the colours of the pages' badges", () => {
    const css = fs.readFileSync("app/app.css", "utf8");
    const token = (name: string) => new RegExp(`--color-${name}:\\s*(#[0-9a-fA-F]{6})`).exec(css)?.[1]?.toLowerCase();
    // StatusBadge.tsx TONE_STYLE: good = ok, caution = warn, bad = bad, neutral = ink-soft on paper-sunk, active = info
    const pairs = { good: ["ok", "ok-wash"], caution: ["warn", "warn-wash"], bad: ["bad", "bad-wash"], neutral: ["ink-soft", "paper-sunk"], active: ["info", "info-wash"] } as const;
    for (const [tone, [ink, wash]] of Object.entries(pairs)) {
      expect(TONE_COLORS[tone as keyof typeof pairs].ink, tone).toBe(token(ink));
      expect(TONE_COLORS[tone as keyof typeof pairs].wash, tone).toBe(token(wash));
    }
  });
});
