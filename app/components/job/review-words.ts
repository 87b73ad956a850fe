// The review state of a finished job in plain words, one source for the page header badge,
// the review list and the report link: the latest decision is the one in force.
export type ReviewDecision = "approved" | "changes-requested";

/** "approved", "changes requested" or "not reviewed yet". */
export function reviewStateWords(decision: string | null | undefined): string {
  if (decision === "approved") return "approved";
  if (decision === "changes-requested") return "changes requested";
  if (decision === "reopened") return "reopened — waiting for review";
  return "not reviewed yet";
}

/** The label of the PDF link: what the downloaded report will say about its review. */
export function reportLinkLabel(decision: string | null | undefined, signable = true): string {
  // a run without a design to sign off (infeasible) is never "not reviewed yet": it cannot be approved
  if (!signable && decision !== "changes-requested") return "Calculation report (PDF) — no design to sign off";
  if (decision === "approved") return "Calculation report (PDF) — approved";
  if (decision === "changes-requested") return "Calculation report (PDF) — changes requested, not approved";
  return "Calculation report (PDF) — not reviewed yet";
}

/** The decision in force: the newest by time; among equal times, the later in the list (oldest first). */
export function latestDecision<T extends { createdAt: string | number | Date }>(reviews: readonly T[]): T | undefined {
  let latest: T | undefined;
  for (const r of reviews) if (!latest || new Date(r.createdAt).getTime() >= new Date(latest.createdAt).getTime()) latest = r;
  return latest;
}

/**
 * After a submission the review form starts empty again only when the server recorded the
 * decision; a refusal keeps what the checker chose and typed, next to the error.
 */
export function formShouldReset(state: "idle" | "loading" | "submitting", data: { ok?: boolean } | undefined): boolean {
  return state === "idle" && data?.ok === true;
}
