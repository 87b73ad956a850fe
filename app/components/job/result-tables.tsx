// Member and node tables of a result: sortable, filterable, paged, with a CSV download of
// every row and every load case (full precision).
import { createColumnHelper, type ColumnDef, type SortingState } from "@tanstack/react-table";
import { useMemo, useState } from "react";
import type { ResultMember, ResultNode, TrussResult } from "~/engine/design/result-types";
import { formatNumber, formatPercent } from "~/lib/format";
import { DataTable } from "~/components/tables/DataTable";
import { downloadText, fileSlug, toCsv } from "~/components/tables/csv";
import { forceSense, UTIL_BANDS, utilBandIndex } from "~/components/viewer/palette";

interface Topology {
  members: Map<string, { start: string; end: string; group?: string }>;
  nodes: Map<string, { x: number; y: number; z: number; fixed: string[] }>;
}

export function LoadCasePicker({ ids, names, value, onChange }: { ids: string[]; names: Map<string, string>; value: string; onChange: (v: string) => void }) {
  if (ids.length <= 1) return null;
  return (
    <label className="flex items-center gap-2 text-sm">
      <span className="text-ink-muted">Load case</span>
      <select className="field-input w-auto py-1" value={value} onChange={(e) => onChange(e.target.value)}>
        {ids.map((id) => (
          <option key={id} value={id}>
            {names.get(id) ? `${id} — ${names.get(id)}` : id}
          </option>
        ))}
      </select>
    </label>
  );
}

/** The load case a result table's columns show, with the ids and names to pick from. */
function useLoadCases(result: TrussResult) {
  const ids = loadCaseIds(result);
  const names = new Map((result.loadCases ?? []).map((l) => [l.id, l.name ?? ""]));
  const [current, setCurrent] = useState(ids[0] ?? "");
  return { ids, names, current, setCurrent };
}

/** Either result table: 25 rows a page, a quick filter, the load-case picker and the CSV of every row. */
function ResultTable<T extends { id: string }>(props: {
  label: "Members" | "Nodes";
  data: T[];
  columns: ColumnDef<T, any>[];
  cases: ReturnType<typeof useLoadCases>;
  onCsv: () => void;
  initialSort?: SortingState;
  rowTestId?: string;
}) {
  const what = props.label.toLowerCase();
  return (
    <DataTable
      label={props.label}
      data={props.data}
      columns={props.columns}
      pageSize={25}
      filterPlaceholder={`Filter ${what}…`}
      initialSort={props.initialSort}
      getRowId={(r) => r.id}
      rowTestId={props.rowTestId}
      toolbar={
        <>
          <LoadCasePicker ids={props.cases.ids} names={props.cases.names} value={props.cases.current} onChange={props.cases.setCurrent} />
          <button type="button" className="btn btn-secondary px-3 py-1" onClick={props.onCsv} data-testid={`${what}-csv`}>
            {`${props.label} CSV`}
          </button>
        </>
      }
    />
  );
}

function loadCaseIds(result: TrussResult): string[] {
  if (result.loadCases?.length) return result.loadCases.map((l) => l.id);
  return Object.keys(result.members[0]?.force ?? result.nodes[0]?.displacement ?? {});
}

export function MemberTable({ result, topology, fileName }: { result: TrussResult; topology: Topology; fileName: string }) {
  const cases = useLoadCases(result);
  const { ids: lcs, current: lc } = cases;
  const u = result.units;
  const maxAbs = useMemo(() => result.members.reduce((m, r) => Math.max(m, Math.abs(r.force[lc] ?? 0)), 0), [result, lc]);
  const col = createColumnHelper<ResultMember>();
  const columns = useMemo(
    () => [
      col.accessor("id", { header: "member" }),
      col.accessor("utilization", {
        header: "utilization",
        meta: { numeric: true },
        cell: (c) => (
          <span className="inline-flex items-center gap-1.5">
            <span className={`inline-block h-2 w-2 rounded-full ${UTIL_BANDS[utilBandIndex(c.getValue())]!.className}`} aria-hidden />
            {formatPercent(c.getValue())}
          </span>
        ),
      }),
      col.accessor("area", { header: `area (${u.length}²)`, cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
      col.accessor((m) => m.force[lc] ?? 0, { id: "force", header: `force (${u.force})`, cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
      col.accessor((m) => m.stress[lc] ?? 0, { id: "stress", header: `stress (${u.force}/${u.length}²)`, cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
      col.accessor((m) => forceSense(m.force[lc] ?? 0, maxAbs), { id: "sense", header: "sense" }),
      col.accessor("length", { header: `length (${u.length})`, cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
      col.accessor((m) => `${m.start ?? topology.members.get(m.id)?.start ?? "?"}–${m.end ?? topology.members.get(m.id)?.end ?? "?"}`, { id: "nodes", header: "nodes" }),
      col.accessor((m) => m.group ?? topology.members.get(m.id)?.group ?? "", { id: "group", header: "group" }),
      col.accessor((m) => m.governing ?? "", { id: "governing", header: "governed by" }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [lc, maxAbs, topology, u],
  );
  const csv = () => {
    const header = ["member", "start", "end", "group", `area_${u.length}2`, `length_${u.length}`, ...lcs.flatMap((l) => [`force_${l}_${u.force}`, `stress_${l}`]), "utilization", "governing"];
    const rows = result.members.map((m) => {
      const t = topology.members.get(m.id);
      return [m.id, m.start ?? t?.start, m.end ?? t?.end, m.group ?? t?.group, m.area, m.length, ...lcs.flatMap((l) => [m.force[l], m.stress[l]]), m.utilization, m.governing];
    });
    downloadText(`${fileSlug(fileName)}-members.csv`, toCsv(header, rows));
  };
  return (
    <ResultTable label="Members" data={result.members} columns={columns} cases={cases} onCsv={csv} initialSort={[{ id: "utilization", desc: true }]} rowTestId="member-row" />
  );
}

export function NodeTable({ result, topology, fileName }: { result: TrussResult; topology: Topology; fileName: string }) {
  const cases = useLoadCases(result);
  const { ids: lcs, current: lc } = cases;
  const u = result.units;
  const moved = (n: ResultNode) => {
    const i = n.initial ?? topology.nodes.get(n.id);
    return i ? Math.hypot(n.x - i.x, n.y - i.y, n.z - (i.z ?? 0)) : 0;
  };
  const anyMoved = result.nodes.some((n) => moved(n) > 0);
  const col = createColumnHelper<ResultNode>();
  const columns = useMemo(
    () => [
      col.accessor("id", { header: "node" }),
      col.accessor("x", { header: `x (${u.length})`, cell: (c) => formatNumber(c.getValue(), { sig: 6 }), meta: { numeric: true } }),
      col.accessor("y", { header: `y (${u.length})`, cell: (c) => formatNumber(c.getValue(), { sig: 6 }), meta: { numeric: true } }),
      col.accessor("z", { header: `z (${u.length})`, cell: (c) => formatNumber(c.getValue(), { sig: 6 }), meta: { numeric: true } }),
      ...(anyMoved ? [col.accessor((n) => moved(n), { id: "moved", header: `moved (${u.length})`, cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } })] : []),
      col.accessor((n) => (n.fixed ?? topology.nodes.get(n.id)?.fixed ?? []).join(", "), { id: "fixed", header: "restrained" }),
      ...([0, 1, 2] as const).map((k) =>
        col.accessor((n) => n.displacement[lc]?.[k] ?? 0, { id: `u${"xyz"[k]}`, header: `u${"xyz"[k]} (${u.length})`, cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
      ),
      col.accessor((n) => Math.hypot(...(n.displacement[lc] ?? [0, 0, 0])), { id: "umag", header: `|u| (${u.length})`, cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [lc, anyMoved, topology, u],
  );
  const csv = () => {
    const header = ["node", `x_${u.length}`, `y_${u.length}`, `z_${u.length}`, "restrained", ...lcs.flatMap((l) => [`ux_${l}`, `uy_${l}`, `uz_${l}`])];
    const rows = result.nodes.map((n) => [n.id, n.x, n.y, n.z, (n.fixed ?? topology.nodes.get(n.id)?.fixed ?? []).join(" "), ...lcs.flatMap((l) => n.displacement[l] ?? [null, null, null])]);
    downloadText(`${fileSlug(fileName)}-nodes.csv`, toCsv(header, rows));
  };
  return (
    <ResultTable label="Nodes" data={result.nodes} columns={columns} cases={cases} onCsv={csv} />
  );
}

export type { Topology };
