// A job's state and outcome as one sentence with one tone (app/lib/job-state.ts), and a
// review decision as its own badge. The tone has a mark as well as a colour, so it reads
// without colour. The API keeps its status values; these are the words people read.
import { reviewStateWords } from "~/components/job/review-words";
import { jobState, type JobStateFacts, type StateTone } from "~/lib/job-state";

export const TONE_STYLE: Record<StateTone, string> = {
  good: "bg-ok-wash text-ok",
  caution: "bg-warn-wash text-warn",
  bad: "bg-bad-wash text-bad",
  neutral: "bg-paper-sunk text-ink-soft",
  active: "bg-info-wash text-info",
};

export function JobStateBadge(props: JobStateFacts) {
  const s = jobState(props);
  return (
    <span className={`badge ${TONE_STYLE[s.tone]}`} data-status={props.status} data-outcome={props.outcome ?? ""} data-tone={s.tone} data-testid="job-state">
      <span aria-hidden className="mr-1">
        {s.mark}
      </span>
      {s.sentence}
    </span>
  );
}

export function ReviewBadge({ decision }: { decision: string | null | undefined }) {
  const style = decision === "approved" ? TONE_STYLE.good : decision === "changes-requested" ? TONE_STYLE.caution : "bg-paper-sunk text-ink-muted";
  return (
    <span className={`badge ${style}`} data-review={decision ?? "none"}>
      {reviewStateWords(decision)}
    </span>
  );
}
