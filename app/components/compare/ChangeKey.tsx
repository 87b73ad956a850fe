// Key to the compare view's colours: the diverging change-in-area scale with its ends and
// middle labelled in the reader's units, and what the two directions mean.
import { changeGradientCss } from "~/lib/change-scale";
import { formatNumber, MINUS } from "~/lib/format";

/** `limit` 0: no member's area changed beyond the solver's tolerance. */
export function ChangeKey({ limit, unit, shown, base }: { limit: number; unit: string; shown: string; base: string }) {
  if (limit === 0)
    return (
      <p className="text-xs text-ink-soft" aria-label="Legend" data-testid="change-key">
        <span className="font-medium text-ink">Every member has the same area in run {shown} as in run {base}</span> (within a millionth of the largest area), so
        every member is drawn pale · thickness ∝ area in {shown}
      </p>
    );
  const end = formatNumber(limit, { sig: 3, trim: true });
  return (
    <div className="flex flex-col gap-1 text-xs text-ink-soft" aria-label="Legend" data-testid="change-key">
      <span className="font-medium text-ink">
        change in area, run {shown} against run {base} ({unit})
      </span>
      <span className="flex items-center gap-1.5">
        <span className="tabular-nums text-ink-muted">
          {MINUS}
          {end}
        </span>
        <span className="inline-block h-3 w-40 rounded-sm border border-rule" style={{ background: changeGradientCss() }} aria-hidden />
        <span className="tabular-nums text-ink-muted">+{end}</span>
      </span>
      <span className="text-ink-muted">
        blue: smaller in {shown} · pale: about the same · orange: larger in {shown} · grey: not in run {base} · thickness ∝ area in {shown}
      </span>
    </div>
  );
}
