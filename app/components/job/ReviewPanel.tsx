// The checker's decision on a finished job, and the decisions so far. Decisions are
// append-only: a new one supersedes the last, none is edited (product.md, step 4).
import { useEffect, useRef } from "react";
import { useFetcher } from "react-router";
import { formatDateTime } from "~/lib/format";
import { ReviewBadge } from "~/components/ui/StatusBadge";
import { EmptyState, ErrorNote } from "~/components/ui/States";
import { formShouldReset } from "./review-words";
import type { ReviewView } from "./types";

/** `signable`: whether the run can be approved at all (a run whose outcome meets no design cannot). */
export function ReviewHistory({ reviews, signable = true }: { reviews: ReviewView[]; signable?: boolean }) {
  if (reviews.length === 0)
    return signable ? (
      <EmptyState title="Not reviewed yet">A checker other than the submitter signs the result off here.</EmptyState>
    ) : (
      <EmptyState title="Nothing to sign off">This run gives no design to issue, so it cannot be approved; a checker may still record changes requested.</EmptyState>
    );
  return (
    <ol className="space-y-3" data-testid="review-history">
      {/* newest first; reversed before the (stable) sort so that of two decisions in the
          same millisecond the later recorded one leads */}
      {[...reviews]
        .reverse()
        .sort((a, b) => new Date(b.createdAt).getTime() - new Date(a.createdAt).getTime())
        .map((r, i) => (
          <li key={r.id} className={`rounded-md border border-rule px-3 py-2 ${i > 0 ? "opacity-80" : ""}`}>
            <div className="flex flex-wrap items-center gap-2 text-sm">
              <ReviewBadge decision={r.decision} />
              <strong>{r.reviewerName}</strong>
              <span className="text-ink-muted">{formatDateTime(r.createdAt)}</span>
              {i > 0 && <span className="text-2xs text-ink-muted">(superseded)</span>}
            </div>
            {r.comment && <p className="mt-1 whitespace-pre-wrap text-sm text-ink-soft">{r.comment}</p>}
          </li>
        ))}
    </ol>
  );
}

export interface ReviewActionData {
  ok?: boolean;
  error?: string;
  fieldErrors?: { decision?: string; comment?: string; reason?: string };
}

/** An admin withdraws an approval; the reason goes to the decisions list and the audit trail. */
export function ReopenForm() {
  const fetcher = useFetcher<ReviewActionData>();
  const errs = fetcher.data?.fieldErrors ?? {};
  return (
    <details className="mt-3">
      <summary className="cursor-pointer text-ink-muted">Reopen this approved run (admin)</summary>
      <fetcher.Form method="post" className="mt-2 space-y-2" data-testid="reopen-form">
        <input type="hidden" name="intent" value="reopen" />
        <label className="block">
          <span className="field-label">Why it must be reviewed again</span>
          <textarea name="reason" rows={2} maxLength={2000} className="field-input" required minLength={10} aria-invalid={!!errs.reason} />
          {errs.reason && <p className="field-error">{errs.reason}</p>}
        </label>
        {fetcher.data?.error && <ErrorNote title="The run was not reopened">{fetcher.data.error}</ErrorNote>}
        <button type="submit" className="btn btn-secondary" disabled={fetcher.state !== "idle"}>
          Reopen for review
        </button>
      </fetcher.Form>
    </details>
  );
}

/** canApprove false: the run has no design to sign off (infeasible), it can only be returned. */
export function ReviewForm({ canApprove = true }: { canApprove?: boolean }) {
  const fetcher = useFetcher<ReviewActionData>();
  const busy = fetcher.state !== "idle";
  const errs = fetcher.data?.fieldErrors ?? {};
  const form = useRef<HTMLFormElement>(null);
  // a recorded decision empties the form (the list above now shows it); a refused one keeps
  // the choice and the comment, uncontrolled inputs keep them by themselves
  useEffect(() => {
    if (formShouldReset(fetcher.state, fetcher.data)) form.current?.reset();
  }, [fetcher.state, fetcher.data]);
  return (
    <fetcher.Form ref={form} method="post" className="space-y-3" aria-label="Review this result" data-testid="review-form">
      <input type="hidden" name="intent" value="review" />
      <fieldset>
        <legend className="field-label">Decision</legend>
        <div className="flex flex-wrap gap-4 text-sm">
          {canApprove && (
            <label className="flex items-center gap-2">
              <input type="radio" name="decision" value="approved" className="accent-[var(--color-ok)]" required /> Approve
            </label>
          )}
          <label className="flex items-center gap-2">
            <input type="radio" name="decision" value="changes-requested" className="accent-[var(--color-warn)]" required={!canApprove} /> Return with changes
          </label>
        </div>
        {!canApprove && <p className="mt-1 text-sm text-ink-soft">No design met every limit, so there is nothing to approve; return it with what must change.</p>}
        {errs.decision && <p className="field-error">{errs.decision}</p>}
      </fieldset>
      <label className="block">
        <span className="field-label">Comment</span>
        <textarea name="comment" rows={3} maxLength={4000} className="field-input" placeholder="What you checked, or what must change" aria-invalid={!!errs.comment} />
        {errs.comment && <p className="field-error">{errs.comment}</p>}
      </label>
      {fetcher.data?.error && <ErrorNote title="The review was not recorded">{fetcher.data.error}</ErrorNote>}
      {fetcher.data?.ok && !busy && <p className="text-sm text-ok" role="status">Decision recorded.</p>}
      <button type="submit" className="btn btn-primary" disabled={busy}>
        {busy ? "Recording…" : "Record decision"}
      </button>
    </fetcher.Form>
  );
}
