// Job status and solver outcome as a small coloured label. The words are the API's own
// status values, so what a script reads is what the page shows.
import { reviewStateWords } from "~/components/job/review-words";

const JOB_STYLE: Record<string, string> = {
  queued: "bg-paper-sunk text-ink-soft",
  running: "bg-info-wash text-info",
  succeeded: "bg-ok-wash text-ok",
  failed: "bg-bad-wash text-bad",
  cancelled: "bg-paper-sunk text-ink-muted line-through decoration-ink-muted/40",
};

const OUTCOME_STYLE: Record<string, string> = {
  optimal: "bg-ok-wash text-ok",
  "not-converged": "bg-warn-wash text-warn",
  infeasible: "bg-bad-wash text-bad",
  failed: "bg-bad-wash text-bad",
  analysed: "bg-info-wash text-info",
};

export function StatusBadge({ status }: { status: string }) {
  return (
    <span className={`badge ${JOB_STYLE[status] ?? "bg-paper-sunk text-ink-soft"}`} data-status={status}>
      {status}
    </span>
  );
}

export function OutcomeBadge({ outcome }: { outcome: string | null | undefined }) {
  if (!outcome) return null;
  return <span className={`badge ${OUTCOME_STYLE[outcome] ?? "bg-paper-sunk text-ink-soft"}`}>{outcome}</span>;
}

export function ReviewBadge({ decision }: { decision: string | null | undefined }) {
  const style = decision === "approved" ? "bg-ok-wash text-ok" : decision === "changes-requested" ? "bg-warn-wash text-warn" : "bg-paper-sunk text-ink-muted";
  return (
    <span className={`badge ${style}`} data-review={decision ?? "none"}>
      {reviewStateWords(decision)}
    </span>
  );
}
