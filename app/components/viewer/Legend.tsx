// Key to the viewer's colours: utilization bands or force sense, and the overlay lines.
import { SENSE_TOKENS } from "./palette";
import { UtilizationKey } from "./UtilizationKey";

export function Legend({
  mode,
  showInitial,
  showDeformed,
  showReactions = false,
}: {
  mode: "utilization" | "force" | "plain";
  showInitial: boolean;
  showDeformed: boolean;
  showReactions?: boolean;
}) {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-soft" aria-label="Legend" data-testid="viewer-legend">
      {mode === "utilization" && (
        <li>
          <UtilizationKey />
        </li>
      )}
      {mode === "force" &&
        Object.values(SENSE_TOKENS).map((s) => (
          <li key={s.token} className="flex items-center gap-1.5">
            <span className={`inline-block h-2.5 w-5 rounded-sm ${s.className}`} aria-hidden />
            {s.label}
          </li>
        ))}
      {mode === "utilization" && <li className="text-ink-muted">thickness ∝ area</li>}
      {showInitial && (
        <li className="flex items-center gap-1.5">
          <span className="inline-block w-5 border-t-2 border-dashed border-ink-muted" aria-hidden />
          initial geometry
        </li>
      )}
      {showDeformed && (
        <li className="flex items-center gap-1.5">
          <span className="inline-block w-5 border-t-2 border-brass-strong" aria-hidden />
          deformed (magnified)
        </li>
      )}
      <li className="flex items-center gap-1.5">
        <span className="inline-block h-0 w-0 border-x-[5px] border-b-[9px] border-x-transparent border-b-ok" aria-hidden />
        support
      </li>
      <li className="flex items-center gap-1.5">
        <span className="inline-block w-5 border-t-2 border-ink" aria-hidden />
        load
      </li>
      {showReactions && (
        <li className="flex items-center gap-1.5">
          <span className="inline-block w-5 border-t-2 border-ok" aria-hidden />
          support reaction
        </li>
      )}
    </ul>
  );
}
