// The review parts of the job page: the words for the review state (badge, list and the PDF
// link agree with what the report itself prints, app/lib/report/page-marks.ts), the decision
// in force, and when the review form empties itself. The browser half of the form's reset
// (a real submission through the action) is in tests/e2e/pages.e2e.test.ts.
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ReviewHistory } from "~/components/job/ReviewPanel";
import { formShouldReset, latestDecision, reportLinkLabel, reviewStateWords } from "~/components/job/review-words";
import type { ReviewView } from "~/components/job/types";
import { ReviewBadge } from "~/components/ui/StatusBadge";
import { reviewBanner } from "~/lib/report/page-marks";
import { reviewState } from "~/lib/report/report-data";

const at = (iso: string) => new Date(iso).toISOString();
const returned: ReviewView = { id: "r1", decision: "changes-requested", comment: "Add the drift case.", reviewerName: "Tomasz Réveillon", createdAt: at("2026-11-30T14:00:00Z") };
const approved: ReviewView = { id: "r2", decision: "approved", comment: "Drift case added; fine.", reviewerName: "Priya Vantongeren", createdAt: at("2026-11-30T16:00:00Z") };

describe("review state words", () => {
  it("names each state in plain words", () => {
    expect(reviewStateWords(undefined)).toBe("not reviewed yet");
    expect(reviewStateWords("changes-requested")).toBe("changes requested");
    expect(reviewStateWords("approved")).toBe("approved");
  });

  it("labels the PDF link with the state the report carries, not 'not reviewed' after a return", () => {
    expect(reportLinkLabel("changes-requested")).toBe("Calculation report (PDF) — changes requested, not approved");
    expect(reportLinkLabel("approved")).toBe("Calculation report (PDF) — approved");
    expect(reportLinkLabel(null)).toBe("Calculation report (PDF) — not reviewed yet");
    expect(reportLinkLabel(null, false)).toBe("Calculation report (PDF) — no design to sign off");
    // the report's own banner for the same decision says the same
    const toReport = (r: ReviewView) => ({ id: r.id, decision: r.decision, comment: r.comment, reviewer: r.reviewerName, at: new Date(r.createdAt) });
    expect(reviewBanner(reviewState([toReport(returned)])).text).toMatch(/^CHANGES REQUESTED — NOT APPROVED/);
    expect(reviewBanner(reviewState([toReport(returned), toReport(approved)])).text).toMatch(/^APPROVED/);
    expect(reviewBanner(reviewState([])).text).toMatch(/^NOT REVIEWED/);
  });

  it("takes the newest decision as the one in force, the later recorded one on a tie", () => {
    expect(latestDecision([returned, approved])?.id).toBe("r2");
    expect(latestDecision([approved, returned])?.id).toBe("r2");
    const same = { ...approved, id: "r3", decision: "changes-requested" as const, createdAt: approved.createdAt };
    expect(latestDecision([returned, approved, same])?.id).toBe("r3");
    expect(latestDecision([])).toBeUndefined();
  });

  it("draws the header badge in those words", () => {
    expect(renderToString(createElement(ReviewBadge, { decision: "changes-requested" }))).toContain("changes requested");
    expect(renderToString(createElement(ReviewBadge, { decision: null }))).toContain("not reviewed yet");
  });
});

describe("review list", () => {
  it("shows the newest decision first and marks the earlier one superseded", () => {
    const html = renderToString(createElement(ReviewHistory, { reviews: [returned, approved] }));
    expect(html.indexOf("Priya Vantongeren")).toBeLessThan(html.indexOf("Tomasz Réveillon"));
    expect(html.indexOf("(superseded)")).toBeGreaterThan(html.indexOf("Tomasz Réveillon"));
  });

  it("leads with the later recorded of two decisions in the same millisecond", () => {
    const same = { ...returned, id: "r4", reviewerName: "Mara Ellingsworth", createdAt: returned.createdAt };
    const html = renderToString(createElement(ReviewHistory, { reviews: [returned, same] }));
    expect(html.indexOf("Mara Ellingsworth")).toBeLessThan(html.indexOf("Tomasz Réveillon"));
  });

  it("says a run with no design to issue has nothing to sign off, not that it is waiting for review", () => {
    const html = renderToString(createElement(ReviewHistory, { reviews: [], signable: false }));
    expect(html).toContain("Nothing to sign off");
    expect(html).not.toMatch(/not reviewed yet/i);
    expect(renderToString(createElement(ReviewHistory, { reviews: [] }))).toContain("Not reviewed yet");
  });
});

describe("review form reset", () => {
  it("empties the form only once the server has recorded the decision", () => {
    expect(formShouldReset("idle", { ok: true })).toBe(true);
    expect(formShouldReset("loading", { ok: true })).toBe(false); // the list is still reloading
    expect(formShouldReset("submitting", undefined)).toBe(false);
    expect(formShouldReset("idle", { error: "Four-eyes rule" } as { ok?: boolean })).toBe(false);
    expect(formShouldReset("idle", undefined)).toBe(false);
  });
});

describe("review form of an infeasible run", () => {
  // useFetcher needs a data router: render inside one made in memory
  async function render(canApprove: boolean) {
    const { createMemoryRouter, RouterProvider } = await import("react-router");
    const { ReviewForm } = await import("~/components/job/ReviewPanel");
    const router = createMemoryRouter([{ path: "/", element: createElement(ReviewForm, { canApprove }) }]);
    return renderToString(createElement(RouterProvider, { router }));
  }
  it("offers no approval, only a return with changes, and says why", async () => {
    const html = await render(false);
    expect(html).not.toContain('value="approved"');
    expect(html).toContain('value="changes-requested"');
    expect(html).toContain("nothing to approve");
  });
  it("offers both decisions otherwise", async () => {
    const html = await render(true);
    expect(html).toContain('value="approved"');
    expect(html).toContain('value="changes-requested"');
  });
});
