// The "gap" column of the job tables: how far each result's objective lies above its proven
// lower bound (JobSummary.lowerBoundGap); "–" where a run has no bound.
import type { ColumnHelper } from "@tanstack/react-table";
import { formatGap } from "~/lib/lower-bound-words";

export function gapColumn<Row extends { gap?: number | null }>(col: ColumnHelper<Row>) {
  return col.accessor((r) => r.gap ?? null, {
    id: "gap",
    header: "gap (%)",
    meta: { numeric: true, className: "hidden sm:table-cell" },
    sortUndefined: "last",
    cell: (c) => (
      <span title="how far the result lies above the least possible (its lower bound)" data-testid="job-gap">
        {formatGap(c.getValue())}
      </span>
    ),
  });
}
