// A determinate bar when the share done is known (iterations against the cap), an
// indeterminate stripe while a job waits or has not reported yet.
export function ProgressBar({ value, max, label }: { value: number | null; max: number | null; label: string }) {
  const known = value !== null && max !== null && max > 0;
  const pct = known ? Math.min(100, Math.max(0, (value / max) * 100)) : 0;
  return (
    <div>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={known ? max : undefined}
        aria-valuenow={known ? value : undefined}
        className="relative h-2.5 w-full overflow-hidden rounded-full bg-paper-sunk"
      >
        {known ? (
          <div className="h-full rounded-full bg-brass transition-[width] duration-500" style={{ width: `${pct}%` }} />
        ) : (
          <div className="h-full w-full animate-pulse rounded-full bg-brass/40" />
        )}
      </div>
    </div>
  );
}
