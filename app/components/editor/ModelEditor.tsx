// The model editor: tables of nodes (with their supports), members, loads, load cases and
// materials, and the design block as a form, edited in place; live validation by the engine's
// own parser (the messages an upload gives), run in a worker; the 2D/3D preview beside them,
// where clicking a member or a node selects its row and selecting a row shows it in the view.
// Saving posts the model as a new version.
import { useCallback, useDeferredValue, useEffect, useMemo, useRef, useState } from "react";
import { Form } from "react-router";
import { TrussViewer } from "~/components/viewer/TrussViewer";
import { markOnce, PAGE_MARKS } from "~/lib/page-timing";
import type { ModelLike } from "~/components/viewer/truss-view";
import { EditableGrid, type GridColumn, type GridRow } from "./EditableGrid";
import { EditorSections } from "~/components/catalogues/EditorSections";
import { DesignForm } from "./DesignForm";
import { fromTables, toTables, type EditorTables } from "./model-rows";
import { useStablePreview } from "./stable-preview";
import { quantityFormatter } from "~/lib/format";
import { useModelCheck } from "./use-model-check";

type Tab = "nodes" | "supports" | "members" | "loads" | "materials" | "design";
const TABS: { id: Tab; label: string }[] = [
  { id: "nodes", label: "Nodes" },
  { id: "supports", label: "Supports" },
  { id: "members", label: "Members" },
  { id: "loads", label: "Loads" },
  { id: "materials", label: "Materials" },
  { id: "design", label: "Design" },
];

/** The first check starts when the preview has drawn, or after this long without a drawing (no WebGL, a lost context). */
const CHECK_AT_THE_LATEST_MS = 2000;

/** The selected row: a node or a member (table row index), shown in the preview too. */
type Selection = { kind: "node" | "member"; row: number } | null;

export function ModelEditor({ initial, units, baseVersion, saving, saveError }: { initial: Record<string, unknown>; units: { length: string; force: string; mass: string }; baseVersion: number; saving: boolean; saveError?: string | null }) {
  const [tables, setTables] = useState<EditorTables>(() => toTables(initial));
  const [tab, setTab] = useState<Tab>("nodes");
  const [selection, setSelection] = useState<Selection>(null);
  const [note, setNote] = useState("");
  useEffect(() => markOnce(PAGE_MARKS.editorMounted), []);
  const deferred = useDeferredValue(tables);
  // the first check (building the model from the tables, starting the parser's worker and
  // handing it thousands of rows) waits until the preview has drawn its first frame: on a
  // small machine it would otherwise take CPU from that frame, and the stored version it
  // checks passed the same gate when it was saved
  const [checkFromNow, setCheckFromNow] = useState(false);
  const startChecking = useCallback(() => setCheckFromNow(true), []);
  useEffect(() => {
    const fallback = setTimeout(startChecking, CHECK_AT_THE_LATEST_MS);
    return () => clearTimeout(fallback);
  }, [startChecking]);
  const model = useMemo(() => (checkFromNow ? fromTables(deferred) : null), [checkFromNow, deferred]);
  const { result: check, current: checked } = useModelCheck(model);
  const errors = check === null || check.ok ? [] : check.errors;
  const flagged = useMemo(() => {
    const f = { nodes: new Set<number>(), members: new Set<number>() };
    for (const e of errors) {
      const m = /^(nodes|members)\[(\d+)\]/.exec(e.path);
      if (m) f[m[1] as "nodes" | "members"].add(Number(m[2]));
    }
    return f;
  }, [errors]);
  // the preview shows the last model the parser accepted, so a half-typed row never blanks
  // it; it starts from the stored version (which passed the gate), so the first frame does not
  // wait for the first check
  const preview = useStablePreview(initial as unknown as ModelLike, check?.ok ? (check.model as unknown as ModelLike) : null);

  // rows and the preview's items are matched by id: blank or half-typed rows shift indices
  const viewIndex = (kind: "node" | "member") => {
    if (selection?.kind !== kind) return null;
    const id = (kind === "node" ? tables.nodes : tables.members)[selection.row]?.id?.trim();
    const i = (kind === "node" ? preview.nodes : preview.members).findIndex((x) => x.id === id);
    return i >= 0 ? i : null;
  };
  // the pick handlers read the newest tables through a ref, so they stay the same functions
  // and the preview (thousands of instances) is not rendered again for an edit elsewhere
  const latest = useRef({ tables, preview });
  latest.current = { tables, preview };
  const pick = useCallback((kind: "node" | "member", i: number | null) => {
    const { tables: t, preview: p } = latest.current;
    const id = i === null ? undefined : (kind === "node" ? p.nodes : p.members)[i]?.id;
    const row = id === undefined ? -1 : (kind === "node" ? t.nodes : t.members).findIndex((r) => r.id?.trim() === id);
    setSelection(row >= 0 ? { kind, row } : null);
    if (row >= 0) setTab(kind === "node" ? "nodes" : "members");
  }, []);
  const pickMember = useCallback((i: number | null) => pick("member", i), [pick]);
  const pickNode = useCallback((i: number | null) => pick("node", i), [pick]);
  const memberInView = viewIndex("member");
  const nodeInView = viewIndex("node");
  const viewer = useMemo(
    () => <TrussViewer model={preview} title="Preview" height="h-[28rem]" selectedMember={memberInView} onSelectMember={pickMember} selectedNode={nodeInView} onSelectNode={pickNode} onFirstFrame={startChecking} />,
    [preview, memberInView, nodeInView, pickMember, pickNode, startChecking],
  );
  const selectedRow = (kind: "node" | "member") => (selection?.kind === kind ? selection.row : null);
  const selectRow = (kind: "node" | "member") => (row: number | null) => setSelection(row === null ? null : { kind, row });

  const set = (key: keyof EditorTables) => (rows: GridRow[]) => setTables((t) => ({ ...t, [key]: rows }));
  const L = units.length;
  const F = units.force;
  const stressUnit = quantityFormatter(units).unit("stress"); // "MPa" for N and mm, as the results read
  const cols: Record<Exclude<Tab, "design" | "supports">, GridColumn[]> = {
    nodes: [
      { key: "id", label: "id" },
      { key: "x", label: `x (${L})`, numeric: true },
      { key: "y", label: `y (${L})`, numeric: true },
      { key: "z", label: `z (${L})`, numeric: true },
      { key: "fixed", label: "fixed axes", width: "6rem" },
    ],
    members: [
      { key: "id", label: "id" },
      { key: "start", label: "start" },
      { key: "end", label: "end" },
      { key: "material", label: "material" },
      { key: "area", label: `area (${L}²)`, numeric: true },
      { key: "group", label: "group" },
      { key: "section", label: "section" },
      { key: "bucklingFactor", label: "k", numeric: true, width: "4rem" },
    ],
    loads: [
      { key: "case", label: "load case" },
      { key: "node", label: "node" },
      { key: "fx", label: `fx (${F})`, numeric: true },
      { key: "fy", label: `fy (${F})`, numeric: true },
      { key: "fz", label: `fz (${F})`, numeric: true },
    ],
    materials: [
      { key: "id", label: "id" },
      { key: "name", label: "name" },
      { key: "E", label: `E (${stressUnit})`, numeric: true },
      { key: "density", label: `density (${units.mass}/${L}³)`, numeric: true },
      { key: "allowableTension", label: `allowable tension (${stressUnit})`, numeric: true },
      { key: "allowableCompression", label: `allowable compression (${stressUnit})`, numeric: true },
    ],
  };
  const supportRows = tables.nodes.map((n, i) => ({ n, i })).filter(({ n }) => n.fixed?.trim());

  return (
    <div className="grid gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <div className="min-w-0 space-y-3">
        <div className="flex flex-wrap gap-1" role="tablist">
          {TABS.map((t) => (
            <button key={t.id} type="button" role="tab" aria-selected={tab === t.id} className={`btn px-3 py-1 text-sm ${tab === t.id ? "btn-primary" : "btn-secondary"}`} onClick={() => setTab(t.id)}>
              {t.label}
            </button>
          ))}
        </div>
        {tab === "nodes" && <EditableGrid name="nodes" columns={cols.nodes} rows={tables.nodes} onChange={set("nodes")} flagged={flagged.nodes} selected={selectedRow("node")} onSelect={selectRow("node")} />}
        {tab === "supports" && (
          <div className="space-y-2 text-sm">
            <p className="text-ink-soft">Nodes with restrained axes (x, y, z). Change a support here or in the nodes table's "fixed axes" column; empty it to free the node.</p>
            <EditableGrid
              name="supports"
              columns={[{ key: "id", label: "node" }, { key: "fixed", label: "fixed axes" }]}
              rows={supportRows.map(({ n }) => ({ id: n.id ?? "", fixed: n.fixed ?? "" }))}
              onChange={(rows) =>
                setTables((t) => {
                  const nodes = t.nodes.slice();
                  rows.forEach((r, k) => {
                    const at = supportRows[k]?.i ?? nodes.findIndex((n) => n.id === r.id);
                    if (at >= 0) nodes[at] = { ...nodes[at], fixed: r.fixed ?? "" };
                  });
                  return { ...t, nodes };
                })
              }
              height={220}
            />
          </div>
        )}
        {tab === "members" && (
          <div className="space-y-3">
            <EditableGrid name="members" columns={cols.members} rows={tables.members} onChange={set("members")} flagged={flagged.members} selected={selectedRow("member")} onSelect={selectRow("member")} />
            <EditorSections lengthUnit={units.length} count={Array.isArray(tables.rest.sections) ? tables.rest.sections.length : 0} onChange={(sections) => setTables((t) => ({ ...t, rest: { ...t.rest, sections } }))} />
          </div>
        )}
        {tab === "loads" && (
          <div className="space-y-3">
            <EditableGrid name="loads" columns={cols.loads} rows={tables.loads} onChange={set("loads")} height={260} />
            <h3 className="text-sm font-medium">Load cases</h3>
            <EditableGrid name="load cases" columns={[{ key: "id", label: "id" }, { key: "name", label: "name", width: "2fr" }, { key: "selfWeight", label: "own weight factor", numeric: true }]} rows={tables.loadCases} onChange={set("loadCases")} height={120} />
          </div>
        )}
        {tab === "materials" && <EditableGrid name="materials" columns={cols.materials} rows={tables.materials} onChange={set("materials")} height={160} />}
        {tab === "design" && (
          <DesignForm
            fields={tables.design}
            onChange={(design) => setTables((t) => ({ ...t, design }))}
            groups={tables.groups}
            onGroupsChange={set("groups")}
            model={preview}
            sectionCount={Array.isArray(tables.rest.sections) ? tables.rest.sections.length : 0}
            units={units}
            problems={errors}
            json={model?.design}
          />
        )}

        <section aria-label="Validation" aria-live="polite" data-testid="validation">
          {check === null || (!checked && errors.length === 0) ? (
            <p className="rounded-md bg-paper-sunk px-3 py-2 text-sm text-ink-muted" role="status">
              Checking the model…
            </p>
          ) : errors.length === 0 ? (
            <p className="rounded-md bg-ok-wash px-3 py-2 text-sm text-ok">Valid and stable: the engine accepts this model.</p>
          ) : (
            <div className="rounded-md bg-bad-wash px-3 py-2 text-sm text-bad">
              <p className="font-medium">
                {errors.length} problem{errors.length === 1 ? "" : "s"} (the same checks as an upload):
              </p>
              <ul className="mt-1 max-h-40 list-disc overflow-auto pl-5">
                {errors.slice(0, 30).map((e, i) => (
                  <li key={i}>
                    <span className="font-mono text-xs">{e.path}</span>: {e.message}
                  </li>
                ))}
              </ul>
            </div>
          )}
        </section>

        {/* the model is written into the form as it is sent: a 3,000-member model's text in the
            page on every keystroke would cost more than the edit */}
        <Form method="post" className="flex flex-wrap items-end gap-3" onSubmit={(e) => ((e.currentTarget.elements.namedItem("model") as HTMLInputElement).value = JSON.stringify(fromTables(tables)))}>
          <input type="hidden" name="model" defaultValue="" />
          <input type="hidden" name="baseVersion" value={baseVersion} />
          <label className="flex-1 text-sm">
            <span className="text-ink-soft">What changed (a note on the version)</span>
            <input name="note" value={note} onChange={(e) => setNote(e.target.value)} maxLength={500} className="mt-1 w-full rounded-md border border-rule bg-paper px-2 py-1.5" />
          </label>
          <button type="submit" className="btn btn-primary" disabled={saving || !checked || errors.length > 0 || deferred !== tables}>
            {saving ? "Saving…" : "Save as a new version"}
          </button>
          {saveError && <p className="w-full text-sm text-bad">{saveError}</p>}
        </Form>
      </div>
      <div className="min-w-0">
        {viewer}
      </div>
    </div>
  );
}
