// The job page's criterion-cost and deflection panels, rendered on the server from results the
// engine computes here: the three-bar truss of constrained-optimization test sets (stress
// governs, optimum 263.9 kg, from memory) and the ten-bar cantilever (Haftka & Gurdal, deflection
// and minimum area govern, optimum near 5060.8 lb, from memory).
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { CriterionCostsPanel } from "~/components/job/CriterionCostsPanel";
import { DeflectionSummaryPanel } from "~/components/job/DeflectionSummaryPanel";
import { optimizeContinuous } from "~/engine/design/result";
import { criterionSentence } from "~/lib/results/criterion-words";
import { fixture } from "../engine/design/models";

const plain = (html: string) => html.replace(/<!-- -->/g, "").replace(/&#x27;/g, "'");

describe("criterion costs in words", () => {
  const threeBar = optimizeContinuous(fixture("three-bar.truss.json"));
  const tenBar = optimizeContinuous(fixture("ten-bar.truss.json"), { formulation: "nested" });

  it("prices the three-bar's allowable stress at 1 % of its mass (every area goes with 1 / allowable)", () => {
    const c = threeBar.criterionCosts![0];
    expect(criterionSentence(c, threeBar)).toBe(
      "Raising the allowable tension stress of unit (2.000 kN/cm²) by 1 % would save about 2.6 kg, 1.0 % of the mass; it binds at member 3 under left.",
    );
  });

  it("words the ten-bar's top criteria with nodes and groups, never raw constraint ids", () => {
    const html = plain(renderToString(createElement(CriterionCostsPanel, { result: tenBar })));
    expect(html).toContain("Raising the deflection limit at every node in every direction (2.000 in) by 1 % would save about 49 lb, 1.0 % of the mass; it binds at node 1 in y under LC1.");
    expect(html).toMatch(/Lowering the minimum area \(0.1000 in²\) by 1 % would save about 0.55 lb, 0.01 % of the mass; it binds at member m\d+, member m\d+, member m\d+\.<\/li>/);
    // the allowable compression stress does not bind: a table row, no saving
    expect(html).toMatch(/allowable compression stress of aluminium<\/td><td[^>]*>25.00 ksi<\/td><td[^>]*>does not bind at this design/);
    expect(html).not.toMatch(/(stress|displacement|area-min):/);
  });

  it("prices nothing on a run that did not end proved optimal", () => {
    const r = optimizeContinuous(fixture("infeasible-bracket.truss.json"));
    expect(r.criterionCosts).toEqual([]);
    expect(renderToString(createElement(CriterionCostsPanel, { result: r }))).toContain("Only a design proved optimal is priced");
  });

  it("lists the ten-bar's tip deflection at its 2 in limit", () => {
    const html = plain(renderToString(createElement(DeflectionSummaryPanel, { result: tenBar })));
    expect(html).toMatch(/<td>Tip loads \(LC1\)<\/td><td>node 1, y<\/td><td class="num">−2.000<\/td><td class="num">2.000<\/td><td[^>]*>100.0 %<\/td>/);
  });
});
