// Member and node tables of a result: sortable, filterable, paged, with a CSV download of
// every row and every load case (full precision).
import { createColumnHelper, type ColumnDef, type SortingState } from "@tanstack/react-table";
import { useMemo } from "react";
import type { ResultMember, ResultNode, TrussResult } from "~/engine/design/result-types";
import { formatNumber, formatPercent, noiseFloor, quantityFormatter, type DisplayUnitChoice } from "~/lib/format";
import type { Units } from "~/engine/truss/schema";
import { DataTable } from "~/components/tables/DataTable";
import { downloadText, fileSlug, toCsv } from "~/components/tables/csv";
import { forceSense } from "~/components/viewer/palette";
import { UtilizationChip } from "~/components/viewer/UtilizationKey";
import { governingCaseOf } from "~/lib/results/cases";
import { membersCsv, nodesCsv } from "~/lib/results/result-csv";
import { CaseSelect, useResultCase } from "./ResultCase";
import { governingCheckWords } from "~/engine/design/constraint-words";

interface Topology {
  members: Map<string, { start: string; end: string; group?: string }>;
  nodes: Map<string, { x: number; y: number; z: number; fixed: string[] }>;
}

/** The load case or combination a result table's columns show: the page's choice, or the table's own. */
function useLoadCases(result: TrussResult) {
  const state = useResultCase(result);
  const ids = useMemo(() => state.cases.map((c) => c.id), [state.cases]);
  return { ...state, ids };
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
  selectedId?: string | null;
  onRowClick?: (row: T) => void;
}) {
  const what = props.label.toLowerCase();
  return (
    <DataTable
      label={props.label}
      data={props.data}
      columns={props.columns}
      // a page holds a whole roof truss; bigger models page (the filter finds a member at once)
      pageSize={200}
      filterPlaceholder={`Filter ${what}…`}
      initialSort={props.initialSort}
      getRowId={(r) => r.id}
      rowTestId={props.rowTestId}
      selectedRowId={props.selectedId}
      onRowClick={props.onRowClick}
      toolbar={
        <>
          {!props.cases.shared && <CaseSelect state={props.cases} />}
          <button type="button" className="btn btn-secondary px-3 py-1" onClick={props.onCsv} data-testid={`${what}-csv`}>
            {`${props.label} CSV`}
          </button>
        </>
      }
    />
  );
}

/** `units`: the reader's display units (account page); the CSV keeps the model's. */
export function MemberTable({
  result,
  topology,
  fileName,
  units = "model",
  selectedId,
  onSelect,
}: {
  result: TrussResult;
  topology: Topology;
  fileName: string;
  units?: DisplayUnitChoice;
  selectedId?: string | null;
  onSelect?: (id: string | null) => void;
}) {
  const cases = useLoadCases(result);
  const { ids: lcs, current: lc } = cases;
  const q = useMemo(() => quantityFormatter(result.units as Units, units), [result.units, units]);
  const maxAbs = useMemo(() => result.members.reduce((m, r) => Math.max(m, Math.abs(r.force[lc] ?? 0)), 0), [result, lc]);
  // rounding noise (5.4e-10 N beside 360,000 N) prints as 0: a billionth of the column's largest value
  const floors = useMemo(
    () => ({ force: noiseFloor(result.members.map((m) => m.force[lc] ?? 0)), stress: noiseFloor(result.members.map((m) => m.stress[lc] ?? 0)) }),
    [result, lc],
  );
  const col = createColumnHelper<ResultMember>();
  const withSection = result.members.some((m) => m.section !== undefined);
  const withK = result.members.some((m) => m.bucklingFactor !== undefined);
  const columns = useMemo(
    () => [
      col.accessor("id", { header: "member" }),
      ...(withSection ? [col.accessor((m) => m.section ?? "", { id: "section", header: "section" })] : []),
      col.accessor("utilization", {
        header: "utilization (%)",
        meta: { numeric: true },
        cell: (c) => (
          <span className="inline-flex items-center gap-1.5">
            <UtilizationChip value={c.getValue()} />
            {formatPercent(c.getValue())}
          </span>
        ),
      }),
      col.accessor("area", { header: `area (${q.unit("area")})`, cell: (c) => q.number(c.getValue(), "area"), meta: { numeric: true } }),
      col.accessor((m) => m.force[lc] ?? 0, { id: "force", header: `force (${q.unit("force")})`, cell: (c) => q.number(c.getValue(), "force", { zeroBelow: floors.force }), meta: { numeric: true } }),
      col.accessor((m) => m.stress[lc] ?? 0, { id: "stress", header: `stress (${q.unit("stress")})`, cell: (c) => q.number(c.getValue(), "stress", { zeroBelow: floors.stress }), meta: { numeric: true } }),
      col.accessor((m) => forceSense(m.force[lc] ?? 0, maxAbs), { id: "sense", header: "sense" }),
      col.accessor("length", { header: `length (${q.unit("length")})`, cell: (c) => q.number(c.getValue(), "length"), meta: { numeric: true } }),
      ...(withK ? [col.accessor((m) => m.bucklingFactor ?? null, { id: "k", header: "buckling factor k", cell: (c) => formatNumber(c.getValue(), { sig: 3 }), meta: { numeric: true } })] : []),
      col.accessor((m) => `${m.start ?? topology.members.get(m.id)?.start ?? "?"}–${m.end ?? topology.members.get(m.id)?.end ?? "?"}`, { id: "nodes", header: "nodes" }),
      col.accessor((m) => m.group ?? topology.members.get(m.id)?.group ?? "", { id: "group", header: "group" }),
      col.accessor((m) => governingCheckWords(m.governing), { id: "governing", header: "governed by" }),
      ...(lcs.length > 1 ? [col.accessor((m) => governingCaseOf(m, lcs) ?? "", { id: "governingCase", header: "governing case" })] : []),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [lc, lcs, maxAbs, floors, topology, q, withSection, withK],
  );
  const csv = () => {
    const t = membersCsv(result, topology);
    downloadText(`${fileSlug(fileName)}-members.csv`, toCsv(t.header, t.rows));
  };
  return (
    <ResultTable
      label="Members"
      data={result.members}
      columns={columns}
      cases={cases}
      onCsv={csv}
      initialSort={[{ id: "utilization", desc: true }]}
      rowTestId="member-row"
      selectedId={selectedId}
      onRowClick={onSelect ? (m) => onSelect(m.id === selectedId ? null : m.id) : undefined}
    />
  );
}

export function NodeTable({ result, topology, fileName, units = "model" }: { result: TrussResult; topology: Topology; fileName: string; units?: DisplayUnitChoice }) {
  const cases = useLoadCases(result);
  const { ids: lcs, current: lc } = cases;
  const q = useMemo(() => quantityFormatter(result.units as Units, units), [result.units, units]);
  const len = q.unit("length");
  const moved = (n: ResultNode) => {
    const i = n.initial ?? topology.nodes.get(n.id);
    return i ? Math.hypot(n.x - i.x, n.y - i.y, n.z - (i.z ?? 0)) : 0;
  };
  const anyMoved = result.nodes.some((n) => moved(n) > 0);
  // rounding noise (1.2e-15 beside 12,000) prints as 0: a billionth of the column's largest value
  const floors = useMemo(
    () => ({
      coord: noiseFloor(result.nodes.flatMap((n) => [n.x, n.y, n.z])),
      disp: noiseFloor(result.nodes.flatMap((n) => n.displacement[lc] ?? [])),
    }),
    [result, lc],
  );
  const col = createColumnHelper<ResultNode>();
  const columns = useMemo(
    () => [
      col.accessor("id", { header: "node" }),
      col.accessor("x", { header: `x (${len})`, cell: (c) => q.number(c.getValue(), "length", { sig: 6, zeroBelow: floors.coord }), meta: { numeric: true } }),
      col.accessor("y", { header: `y (${len})`, cell: (c) => q.number(c.getValue(), "length", { sig: 6, zeroBelow: floors.coord }), meta: { numeric: true } }),
      col.accessor("z", { header: `z (${len})`, cell: (c) => q.number(c.getValue(), "length", { sig: 6, zeroBelow: floors.coord }), meta: { numeric: true } }),
      ...(anyMoved ? [col.accessor((n) => moved(n), { id: "moved", header: `moved (${len})`, cell: (c) => q.number(c.getValue(), "length", { zeroBelow: floors.coord }), meta: { numeric: true } })] : []),
      col.accessor((n) => (n.fixed ?? topology.nodes.get(n.id)?.fixed ?? []).join(", "), { id: "fixed", header: "restrained" }),
      ...([0, 1, 2] as const).map((k) =>
        col.accessor((n) => n.displacement[lc]?.[k] ?? 0, { id: `u${"xyz"[k]}`, header: `u${"xyz"[k]} (${len})`, cell: (c) => q.number(c.getValue(), "length", { zeroBelow: floors.disp }), meta: { numeric: true } }),
      ),
      col.accessor((n) => Math.hypot(...(n.displacement[lc] ?? [0, 0, 0])), { id: "umag", header: `|u| (${len})`, cell: (c) => q.number(c.getValue(), "length", { zeroBelow: floors.disp }), meta: { numeric: true } }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [lc, anyMoved, topology, q, floors],
  );
  const csv = () => {
    const t = nodesCsv(result, topology);
    downloadText(`${fileSlug(fileName)}-nodes.csv`, toCsv(t.header, t.rows));
  };
  return (
    <ResultTable label="Nodes" data={result.nodes} columns={columns} cases={cases} onCsv={csv} />
  );
}

export type { Topology };
