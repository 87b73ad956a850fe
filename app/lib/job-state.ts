// The one sentence and the one tone for a job's state and outcome, used by every list, the job
// page, the PDF report and the mail (issue 16: a run never reads "succeeded" beside
// "infeasible"). The queue's own status words stay in the API; people read these.
export type StateTone = "good" | "caution" | "bad" | "neutral" | "active";

export interface JobStateFacts {
  status: string;
  outcome?: string | null;
  /** a cancelled run whose best design so far was kept (the worker stores it) */
  hasResult?: boolean;
  /** a queued job handed back because a service did not answer ("storage") */
  waitingFor?: string | null;
}

export interface JobState {
  /** "finished — optimal" */
  sentence: string;
  tone: StateTone;
  /** a short mark beside the colour, so the tone reads without colour too */
  mark: string;
}

/**
 * The tones as colours for the PDF and the HTML mail, equal to the app.css tokens the pages'
 * badges use (text-ok on bg-ok-wash, ...); tests/report/palette.test.ts keeps them equal.
 */
export const TONE_COLORS: Record<StateTone, { ink: string; wash: string }> = {
  good: { ink: "#2f7d5b", wash: "#e2f1e8" },
  caution: { ink: "#a86a00", wash: "#fbefd6" },
  bad: { ink: "#b3362c", wash: "#f8e1de" },
  neutral: { ink: "#3b4757", wash: "#ebe7de" },
  active: { ink: "#2c5d8a", wash: "#e0ebf5" },
};

const MARKS: Record<StateTone, string> = { good: "✓", caution: "!", bad: "✕", neutral: "■", active: "▶" };

function state(sentence: string, tone: StateTone): JobState {
  return { sentence, tone, mark: MARKS[tone] };
}

export function jobState(j: JobStateFacts): JobState {
  switch (j.status) {
    case "queued":
      // handed back without spending an attempt; it runs again once the store answers
      if (j.waitingFor === "storage") return state("waiting for storage — the file store is not answering; it runs once it is back", "caution");
      return state("waiting in the queue", "neutral");
    case "running":
      return state("running", "active");
    case "failed":
      return state("failed — no result", "bad");
    case "cancelled":
      return j.hasResult ? state("stopped on request — best design so far kept", "caution") : state("stopped on request — nothing kept", "neutral");
    case "succeeded":
      switch (j.outcome) {
        case "optimal":
          return state("finished — optimal", "good");
        case "analysed":
          return state("finished — analysed as given", "good");
        case "not-converged":
          return state("finished — stopped before converging", "caution");
        case "infeasible":
          return state("finished — no design meets every limit", "bad");
        case "failed":
          return state("finished — the solver could not finish", "bad");
        default:
          return state("finished", "good");
      }
    default:
      return state(j.status, "neutral");
  }
}

/** The states a job list can be filtered by, in the words the lists show. */
export const REVIEW_FILTERS = {
  waiting: "waiting for review",
  approved: "approved",
  "changes-requested": "changes requested",
  "no-review": "nothing to review",
} as const;
export type ReviewFilter = keyof typeof REVIEW_FILTERS;
