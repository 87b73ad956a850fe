// Which finished runs ask a checker for a review. A checker signs off a design, so only a run
// that produced one does: an optimum, or a run stopped before converging whose best design the
// independent re-analysis found within every limit. An infeasible or failed run has nothing to
// sign off; its submitter still hears that it ended.
import type { SolverStatus } from "~/engine/design/result-types";

export interface ReviewableFacts {
  status: SolverStatus;
  verification?: { allLimitsMet: boolean } | null;
}

export function designWorthReview(result: ReviewableFacts): boolean {
  // the engine already turns an optimum the re-analysis rejects into not-converged; an
  // explicit "limits not met" is still honoured here
  if (result.status === "optimal") return result.verification?.allLimitsMet !== false;
  if (result.status === "not-converged") return result.verification?.allLimitsMet === true;
  if (result.status === "analysed") return true; // a checker may review an analysis too
  return false;
}

/** The job-row outcomes that can never ask for review, whatever the caller says. */
export const OUTCOMES_WITHOUT_REVIEW: readonly string[] = ["infeasible", "failed"];
