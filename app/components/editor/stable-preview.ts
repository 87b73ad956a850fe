// The model the editor's preview draws: the stored version at first, then each model the
// parser accepts — but only when what the preview draws changed (geometry, areas, supports,
// loads). An edit to a material or a limit, or the first check of the stored version, then
// leaves the drawn scene as it is instead of rebuilding thousands of instances and re-framing.
import { useEffect, useRef, useState } from "react";
import type { ModelLike } from "~/components/viewer/truss-view";

/** What the preview draws, as one comparable text. */
export function pictureKey(m: ModelLike): string {
  return JSON.stringify([
    m.dimension,
    m.units ?? null,
    m.nodes.map((n) => [n.id, n.x, n.y, n.z ?? 0, n.fixed ?? []]),
    m.members.map((x) => [x.id, x.start, x.end, x.area]),
    m.loadCases.map((lc) => [lc.id, lc.name ?? "", lc.loads.map((l) => [l.node, l.fx ?? 0, l.fy ?? 0, l.fz ?? 0])]),
    (m.combinations ?? []).map((c) => [c.id, c.name ?? "", c.factors]),
  ]);
}

export function useStablePreview(initial: ModelLike, accepted: ModelLike | null): ModelLike {
  const [shown, setShown] = useState(initial);
  const key = useRef<string | null>(null);
  useEffect(() => {
    if (!accepted) return;
    key.current ??= pictureKey(shown);
    const next = pictureKey(accepted);
    if (next !== key.current) {
      key.current = next;
      setShown(accepted);
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [accepted]);
  return shown;
}
