// The utilization scale as a small key: a continuous bar with its ends named, and the
// over-limit pattern. Used by the 3D view's legend; tables use UtilizationChip.
import { OVER_LIMIT_OUTLINE, OVER_LIMIT_PATTERN_CSS, isOverLimit, utilizationColor, utilizationGradientCss } from "~/lib/utilization-scale";

export function UtilizationKey() {
  return (
    <span className="flex flex-wrap items-center gap-x-3 gap-y-1" data-testid="utilization-key">
      <span className="flex items-center gap-1.5">
        <span className="text-ink-muted">utilization 0 %</span>
        <span className="inline-block h-2.5 w-28 rounded-sm border border-rule" style={{ background: utilizationGradientCss() }} aria-hidden />
        <span className="text-ink-muted">100 %</span>
      </span>
      <span className="flex items-center gap-1.5">
        <span className="inline-block h-2.5 w-6 rounded-sm" style={{ background: OVER_LIMIT_PATTERN_CSS, outline: `1.5px solid ${OVER_LIMIT_OUTLINE}` }} aria-hidden />
        over its limit (striped, red outline)
      </span>
    </span>
  );
}

/** A table cell's swatch: the scale's colour, or the over-limit pattern. */
export function UtilizationChip({ value }: { value: number }) {
  const over = isOverLimit(value);
  return (
    <span
      className="inline-block h-2.5 w-4 rounded-sm border border-rule"
      style={over ? { background: OVER_LIMIT_PATTERN_CSS, outline: `1.5px solid ${OVER_LIMIT_OUTLINE}` } : { background: utilizationColor(value) }}
      data-over={over ? "true" : undefined}
      aria-hidden
    />
  );
}
