// What happened in a run and, when it did not reach an optimum, what to try next.
import { OUTCOME_WORDS } from "./result-words";

export function OutcomePanel({
  status,
  outcome,
  message,
  hint,
  error,
  hasResult = false,
}: {
  status: string;
  outcome: string | null;
  message?: string | null;
  hint?: string | null;
  error?: string | null;
  hasResult?: boolean;
}) {
  if (status === "failed") {
    return (
      <div className="rounded-md border border-bad/30 bg-bad-wash px-4 py-3" role="alert" data-testid="outcome">
        <p className="font-semibold text-bad">The job failed</p>
        <p className="mt-1 text-sm text-ink-soft">{error || message || "The worker stopped without a result."}</p>
        <p className="mt-2 text-sm text-ink-soft">
          <strong className="text-ink">What to try: </strong>
          {hint || "Open the model page to check its validation and stability, then queue the job again. If it fails the same way, queue it with the other formulation."}
        </p>
      </div>
    );
  }
  if (status === "cancelled") {
    return (
      <div className="rounded-md border border-rule bg-paper-sunk px-4 py-3 text-sm text-ink-soft" data-testid="outcome">
        {hasResult ? (
          <>
            <p className="font-semibold text-ink">Stopped on request — the best design found so far is kept below.</p>
            <p className="mt-1">It did not converge, so it is not offered for review. {message}</p>
            <p className="mt-1">
              <strong className="text-ink">What to try: </strong>
              queue the run again to let it finish.
            </p>
          </>
        ) : (
          "This run was stopped on request before it produced a design; nothing was kept."
        )}
      </div>
    );
  }
  if (!outcome) return null;
  const words = OUTCOME_WORDS[outcome] ?? { title: outcome, tryThis: "" };
  const good = outcome === "optimal";
  return (
    <div className={`rounded-md border px-4 py-3 ${good ? "border-ok/30 bg-ok-wash" : "border-warn/30 bg-warn-wash"}`} role={good ? "status" : "alert"} data-testid="outcome">
      <p className={`font-semibold ${good ? "text-ok" : "text-warn"}`}>{words.title}</p>
      {message && <p className="mt-1 text-sm text-ink-soft">{message}</p>}
      {!good && (
        <p className="mt-2 text-sm text-ink-soft">
          <strong className="text-ink">What to try: </strong>
          {hint || words.tryThis}
        </p>
      )}
    </div>
  );
}
