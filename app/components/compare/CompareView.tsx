// The compare page's 3D/2D view: one run's design (its geometry version, its node positions
// and areas) coloured by each member's change in area against another run.
import { useEffect, useMemo, useState } from "react";
import { TrussViewer } from "~/components/viewer/TrussViewer";
import { topologyOf } from "~/components/viewer/model-topology";
import type { ModelLike, ResultLike } from "~/components/viewer/truss-view";
import { ErrorNote, LoadingNote } from "~/components/ui/States";
import type { Comparison } from "~/lib/jobs/compare.server";
import { changeColor, niceLimit, SAME_AREA_SHARE } from "~/lib/change-scale";
import { formatNumber, MINUS, noiseFloor, type QuantityFormatter } from "~/lib/format";
import { changeAgainst } from "./CompareTable";
import { ChangeKey } from "./ChangeKey";

function useVersionTopology(modelId: string, version: number | null) {
  const [state, setState] = useState<{ topology: ModelLike | null; error: string | null }>({ topology: null, error: null });
  useEffect(() => {
    let live = true;
    setState({ topology: null, error: null });
    fetch(`/api/models/${modelId}/file${version === null ? "" : `?version=${version}`}`, { headers: { Accept: "application/json" } })
      .then(async (res) => {
        if (!res.ok) throw new Error(`The model file could not be loaded (${res.status})`);
        const topology = topologyOf(await res.json());
        if (live) setState({ topology, error: topology ? null : "The model file has no readable geometry" });
      })
      .catch((e: unknown) => live && setState({ topology: null, error: e instanceof Error ? e.message : String(e) }));
    return () => {
      live = false;
    };
  }, [modelId, version]);
  return state;
}

export function CompareView({ comparison, q }: { comparison: Comparison; q: QuantityFormatter | null }) {
  const { runs } = comparison;
  const [shownIndex, setShown] = useState(1);
  const [baseIndex, setBase] = useState(0);
  const shown = runs[shownIndex]!;
  const base = runs[baseIndex]!;
  const { topology, error } = useVersionTopology(comparison.model.id, shown.modelVersion);
  const areaUnit = q?.unit("area") ?? (comparison.units ? `${comparison.units.length}²` : "");
  const conv = (v: number) => (q ? q.convert(v, "area") : v);

  const result = useMemo<ResultLike | null>(
    () =>
      topology
        ? {
            members: topology.members.map((m) => ({ id: m.id, area: shown.memberAreas[m.id] ?? m.area, utilization: NaN, force: {} })),
            nodes: shown.nodes.length ? shown.nodes.map((n) => ({ ...n, displacement: {} })) : topology.nodes.map((n) => ({ id: n.id, x: n.x, y: n.y, z: n.z ?? 0, displacement: {} })),
          }
        : null,
    [topology, shown],
  );
  const paint = useMemo(() => {
    const floor = noiseFloor([...Object.values(shown.memberAreas), ...Object.values(base.memberAreas)].map(conv), SAME_AREA_SHARE);
    const change = (a: number, b: number) => (Math.abs(conv(a) - conv(b)) < floor ? 0 : conv(a) - conv(b));
    const deltas = new Map<string, number>();
    for (const [id, a] of Object.entries(shown.memberAreas)) {
      const b = base.memberAreas[id];
      if (b !== undefined) deltas.set(id, change(a, b));
    }
    const largest = Math.max(0, ...[...deltas.values()].map(Math.abs));
    const limit = largest > 0 ? niceLimit(largest) : 0;
    const colours: Record<string, string> = {};
    for (const [id, d] of deltas) colours[id] = changeColor(d, limit);
    const describe = (id: string) => {
      const a = shown.memberAreas[id];
      const b = base.memberAreas[id];
      if (a === undefined) return `not in run ${shown.letter}`;
      const inShown = `${formatNumber(conv(a))} ${areaUnit} in ${shown.letter}`;
      if (b === undefined) return `area ${inShown}; not in run ${base.letter}`;
      const d = change(a, b);
      const sign = d > 0 ? "+" : d < 0 ? MINUS : "";
      return `area ${inShown} against ${formatNumber(conv(b))} ${areaUnit} in ${base.letter}: ${sign}${formatNumber(Math.abs(d))} ${areaUnit} (${changeAgainst(b, a)})`;
    };
    return { colours, describe, legend: <ChangeKey limit={limit} unit={areaUnit} shown={shown.letter} base={base.letter} /> };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [shown, base, areaUnit, q]);

  const picker = (label: string, value: number, set: (i: number) => void, testId: string) => (
    <label className="flex items-center gap-2 text-sm">
      <span className="text-ink-muted">{label}</span>
      <select className="field-input w-auto py-1" value={value} onChange={(e) => set(Number(e.target.value))} data-testid={testId}>
        {runs.map((r, i) => (
          <option key={r.id} value={i}>
            run {r.letter} (job {r.id.slice(0, 8)}{r.modelVersion !== null ? `, version ${r.modelVersion}` : ""})
          </option>
        ))}
      </select>
    </label>
  );

  return (
    <section className="space-y-3" aria-label="Change in area">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        {picker("Show", shownIndex, setShown, "compare-shown")}
        {picker("against", baseIndex, setBase, "compare-base")}
      </div>
      {error ? (
        <ErrorNote title="The view could not be loaded">{error}</ErrorNote>
      ) : topology && result ? (
        <TrussViewer key={`${shown.id}`} model={topology} result={result} paint={paint} title={`Run ${shown.letter} coloured by its change in area against run ${base.letter}`} />
      ) : (
        <div className="card flex h-[26rem] items-center justify-center" data-testid="compare-view-loading">
          <LoadingNote>Loading the geometry of run {shown.letter}…</LoadingNote>
        </div>
      )}
    </section>
  );
}
