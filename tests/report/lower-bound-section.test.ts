// The least-mass bound in the calculation record: the bound of the determinate Warren truss,
// computed by the engine's LP from the fixture's model, its gap, the LP's statement and what
// it assumes; a result without a bound says why.
import { beforeAll, describe, expect, it } from "vitest";
import { attachLowerBound, loadHighsSolver } from "~/engine/lp";
import { parseModel } from "~/engine/truss";
import { buildReportPdf } from "~/lib/report/document";
import { pageTexts } from "./pdf-text";
import { reportDataFor, warrenFixture } from "./warren-fixture";

let bounded: string;
let withheld: string;
let gap: number;
beforeAll(async () => {
  const fx = warrenFixture({ panels: 6 });
  const parsed = parseModel(fx.model);
  if (!parsed.ok) throw new Error(parsed.errors[0]!.message);
  const solver = await loadHighsSolver();
  const result = attachLowerBound(parsed.model, fx.result, {}, solver);
  gap = result.lowerBound!.gap;
  bounded = (await pageTexts(await buildReportPdf(reportDataFor({ ...fx, result })))).join("\n");
  const without = { ...fx.result, lowerBoundWithheld: "This run checks no stresses." };
  withheld = (await pageTexts(await buildReportPdf(reportDataFor({ ...fx, result: without })))).join("\n");
});

describe("the least-mass bound in the report", () => {
  it("states the bound, the gap, the linear program and its assumptions", () => {
    // determinate: the fully stressed design is the least mass, except where an area is held
    // at the minimum area 150 mm², which the bound drops (so the gap is small and not negative)
    expect(gap).toBeGreaterThanOrEqual(-1e-6);
    expect(gap).toBeLessThan(0.2);
    expect(bounded).toContain("How close to the least possible mass");
    expect(bounded).toMatch(/Lower bound\s+[\d.,]+ t/);
    expect(bounded).toContain("(objective / bound − 1)");
    // pdftotext parts the text where the face changes to its Greek subset, and may spell ≤ as <=
    expect(bounded).toMatch(/σ ?c_e A_v (≤|<=) q_ek (≤|<=) σ ?t_e A_v/);
    expect(bounded).toMatch(/What it assumes: The least mass of any truss on these \d+ members/);
  });

  it("says why a run has no bound", () => {
    expect(withheld).toContain("No bound for this run. This run checks no stresses.");
  });
});
