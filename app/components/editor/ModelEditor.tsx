// The model editor: tables of nodes (with their supports), members, loads, load cases, groups,
// materials and the design block, edited in place; live validation by the engine's own parser
// (the messages an upload gives); the 2D/3D preview beside them, where clicking a member
// selects its row and selecting a member row shows it in the view. Saving posts the model as
// a new version.
import { useDeferredValue, useMemo, useState } from "react";
import { Form } from "react-router";
import { parseModel } from "~/engine/truss";
import { TrussViewer } from "~/components/viewer/TrussViewer";
import type { ModelLike } from "~/components/viewer/truss-view";
import { EditableGrid, type GridColumn, type GridRow } from "./EditableGrid";
import { EditorSections } from "~/components/catalogues/EditorSections";
import { fromTables, toTables, type EditorTables } from "./model-rows";

type Tab = "nodes" | "supports" | "members" | "loads" | "groups" | "materials" | "design";
const TABS: { id: Tab; label: string }[] = [
  { id: "nodes", label: "Nodes" },
  { id: "supports", label: "Supports" },
  { id: "members", label: "Members" },
  { id: "loads", label: "Loads" },
  { id: "groups", label: "Groups" },
  { id: "materials", label: "Materials" },
  { id: "design", label: "Design" },
];

export function ModelEditor({ initial, units, baseVersion, saving, saveError }: { initial: Record<string, unknown>; units: { length: string; force: string; mass: string }; baseVersion: number; saving: boolean; saveError?: string | null }) {
  const [tables, setTables] = useState<EditorTables>(() => toTables(initial));
  const [tab, setTab] = useState<Tab>("nodes");
  const [selectedMember, setSelectedMember] = useState<number | null>(null);
  const [note, setNote] = useState("");
  const deferred = useDeferredValue(tables);
  const { model, designError } = useMemo(() => fromTables(deferred), [deferred]);
  const check = useMemo(() => parseModel(model), [model]);
  const errors = designError ? [{ path: "design", message: designError }] : check.ok ? [] : check.errors;
  const flagged = useMemo(() => {
    const f = { nodes: new Set<number>(), members: new Set<number>() };
    for (const e of errors) {
      const m = /^(nodes|members)\[(\d+)\]/.exec(e.path);
      if (m) f[m[1] as "nodes" | "members"].add(Number(m[2]));
    }
    return f;
  }, [errors]);
  // the preview shows the last geometry the parser accepted, so a half-typed row never blanks
  // it; it starts from the stored version (which passed the gate), so the first frame does not
  // wait for the first parse
  const [lastGood, setLastGood] = useState<ModelLike | null>(() => initial as unknown as ModelLike);
  const preview = useMemo<ModelLike | null>(() => (check.ok ? (check.model as unknown as ModelLike) : lastGood), [check, lastGood]);
  if (check.ok && preview !== lastGood) setLastGood(preview);

  const set = (key: keyof EditorTables) => (rows: GridRow[]) => setTables((t) => ({ ...t, [key]: rows }));
  const L = units.length;
  const F = units.force;
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
    groups: [
      { key: "id", label: "group" },
      { key: "min", label: `min area (${L}²)`, numeric: true },
      { key: "max", label: `max area (${L}²)`, numeric: true },
    ],
    materials: [
      { key: "id", label: "id" },
      { key: "name", label: "name" },
      { key: "E", label: `E (${F}/${L}²)`, numeric: true },
      { key: "density", label: `density (${units.mass}/${L}³)`, numeric: true },
      { key: "allowableTension", label: `allowable tension (${F}/${L}²)`, numeric: true },
      { key: "allowableCompression", label: `allowable compression (${F}/${L}²)`, numeric: true },
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
        {tab === "nodes" && <EditableGrid name="nodes" columns={cols.nodes} rows={tables.nodes} onChange={set("nodes")} flagged={flagged.nodes} />}
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
            <EditableGrid name="members" columns={cols.members} rows={tables.members} onChange={set("members")} flagged={flagged.members} selected={selectedMember} onSelect={setSelectedMember} />
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
        {tab === "groups" && <EditableGrid name="groups" columns={cols.groups} rows={tables.groups} onChange={set("groups")} height={200} />}
        {tab === "materials" && <EditableGrid name="materials" columns={cols.materials} rows={tables.materials} onChange={set("materials")} height={160} />}
        {tab === "design" && (
          <label className="block text-sm">
            <span className="text-ink-soft">
              The design block without its groups (those are on the Groups tab), as JSON: objective, area bounds, limits (stress, displacement in {L}, volume, buckling), solver. Empty it for a model that is only analysed. Reference: docs/model-format.md.
            </span>
            <textarea
              aria-label="design block"
              className="mt-2 h-80 w-full rounded-md border border-rule bg-paper p-2 font-mono text-xs"
              value={tables.designText}
              onChange={(e) => setTables((t) => ({ ...t, designText: e.target.value }))}
            />
          </label>
        )}

        <section aria-label="Validation" aria-live="polite" data-testid="validation">
          {errors.length === 0 ? (
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

        <Form method="post" className="flex flex-wrap items-end gap-3">
          <input type="hidden" name="model" value={JSON.stringify(model)} />
          <input type="hidden" name="baseVersion" value={baseVersion} />
          <label className="flex-1 text-sm">
            <span className="text-ink-soft">What changed (a note on the version)</span>
            <input name="note" value={note} onChange={(e) => setNote(e.target.value)} maxLength={500} className="mt-1 w-full rounded-md border border-rule bg-paper px-2 py-1.5" />
          </label>
          <button type="submit" className="btn btn-primary" disabled={saving || errors.length > 0}>
            {saving ? "Saving…" : "Save as a new version"}
          </button>
          {saveError && <p className="w-full text-sm text-bad">{saveError}</p>}
        </Form>
      </div>
      <div className="min-w-0">
        {preview ? (
          <TrussViewer model={preview} title="Preview" height="h-[28rem]" selectedMember={selectedMember} onSelectMember={(i) => { setSelectedMember(i); if (i !== null) setTab("members"); }} />
        ) : (
          <p className="card text-sm text-ink-muted">The preview appears once the model passes the checks.</p>
        )}
      </div>
    </div>
  );
}
