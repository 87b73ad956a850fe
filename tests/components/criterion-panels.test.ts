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
import { bindingCriteria, criterionSentence, idleCriteria, idleCriteriaSentence } from "~/lib/results/criterion-words";
import type { CriterionCost } from "~/engine/design/result-types";
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
    // the allowable compression stress does not bind: no row of its own, one line for it
    expect(html).not.toContain('data-testid="criterion-row"');
    expect(html).toContain("1 other criterion does not bind at this design: the allowable compression stress of aluminium.");
    expect(html).not.toMatch(/(stress|displacement|area-min):/);
  });

  it("folds the criteria that do not bind, or save below the solver's resolution, into one line by kind", () => {
    // a roof with a deflection limit per node and direction, of which one binds: the page must not
    // list eleven rows that say "does not bind"
    const deflection = (node: string, axis: "x" | "y", saving: number): CriterionCost => ({
      id: `deflection:${node}${axis}`, kind: "deflection", subject: node, node, axis, value: 20, unit: "mm", saving, share: saving / 1000, count: saving > 0 ? 1 : 0, places: [],
    });
    const costs: CriterionCost[] = [
      { ...deflection("U3", "y", 12), places: [{ node: "U3", axis: "y", case: "SLS", saving: 12 }] },
      ...["U1", "U2", "U4", "U5"].map((n) => deflection(n, "y", 0)),
      deflection("U3", "x", 2e-4), // 2e-7 of the mass: below NEGLIGIBLE_SHARE, noise
      { id: "allowable-compression:S355", kind: "allowable-compression", subject: "S355", value: 210, unit: "MPa", saving: 0, share: 0, count: 0, places: [] },
      { id: "volume", kind: "volume", subject: "the design", value: 1e9, unit: "mm³", saving: 0, share: 0, count: 0, places: [] },
    ];
    expect(bindingCriteria(costs).map((c) => c.id)).toEqual(["deflection:U3y"]);
    const idle = idleCriteria(costs);
    expect(idle).toHaveLength(7);
    expect(idleCriteriaSentence(idle, { objective: { kind: "mass", initial: 1200, final: 1000 } })).toBe(
      "7 other criteria do not bind at this design or would save less than 0.0001 % of the mass: " +
        "the deflection limits at node U1 in y, node U2 in y, node U4 in y, node U5 in y and node U3 in x; " +
        "the allowable compression stress of S355; the volume cap.",
    );
    expect(idleCriteriaSentence([costs[1]!], { objective: { kind: "mass", initial: 1, final: 1 } }, false)).toBe("1 criterion does not bind at this design: the deflection limit at node U1 in y.");
  });

  it("prices nothing on a run that did not end proved optimal", () => {
    const r = optimizeContinuous(fixture("infeasible-bracket.truss.json"));
    expect(r.criterionCosts).toEqual([]);
    expect(renderToString(createElement(CriterionCostsPanel, { result: r }))).toContain("Only a design proved optimal is priced");
  });

  it("lists the ten-bar's tip deflection at its 2 in limit", () => {
    const html = plain(renderToString(createElement(DeflectionSummaryPanel, { result: tenBar })));
    expect(html).toMatch(/<td[^>]*>Tip loads \(LC1\)<\/td><td[^>]*>node 1, y<\/td><td class="num">−2.000<\/td><td class="num">2.000<\/td><td[^>]*>100.0 %<\/td>/);
  });
});
