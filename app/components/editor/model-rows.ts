// The model as the editor's tables (text cells, as typed) and back. Empty cells leave a field
// out; numbers are read with Number() so the engine's parser reports what is not one, naming
// the row. Fields the tables do not show (description, sections, combinations, anything new)
// ride along untouched in `rest`; the design block is the design form's (design-fields.ts).
import { fromDesignFields, toDesignFields, type DesignFields } from "./design-fields";
import type { GridRow } from "./EditableGrid";

type Obj = Record<string, unknown>;

export interface EditorTables {
  nodes: GridRow[];
  members: GridRow[];
  loads: GridRow[];
  loadCases: GridRow[];
  materials: GridRow[];
  groups: GridRow[];
  /** the design block without its groups, as form fields */
  design: DesignFields;
  /** the design block as loaded: sub-objects it had stay when the form leaves them empty */
  originalDesign: unknown;
  rest: Obj;
}

const s = (v: unknown) => (v === undefined || v === null ? "" : String(v));

export function toTables(model: Obj): EditorTables {
  const { nodes, members, loadCases, materials, design, ...rest } = model;
  const d = design as Obj | undefined;
  const groups = d?.groups;
  return {
    nodes: ((nodes as Obj[]) ?? []).map((n) => ({ id: s(n.id), x: s(n.x), y: s(n.y), z: s(n.z), fixed: Array.isArray(n.fixed) ? (n.fixed as string[]).join("") : "" })),
    members: ((members as Obj[]) ?? []).map((m) => ({ id: s(m.id), start: s(m.start), end: s(m.end), material: s(m.material), area: s(m.area), group: s(m.group), section: s(m.section), bucklingFactor: s(m.bucklingFactor) })),
    loads: ((loadCases as Obj[]) ?? []).flatMap((lc) => ((lc.loads as Obj[]) ?? []).map((l) => ({ case: s(lc.id), node: s(l.node), fx: s(l.fx), fy: s(l.fy), fz: s(l.fz) }))),
    loadCases: ((loadCases as Obj[]) ?? []).map((lc) => ({ id: s(lc.id), name: s(lc.name), selfWeight: s(lc.selfWeight) })),
    materials: ((materials as Obj[]) ?? []).map((m) => ({ id: s(m.id), name: s(m.name), E: s(m.E), density: s(m.density), allowableTension: s(m.allowableTension), allowableCompression: s(m.allowableCompression) })),
    groups: ((groups as Obj[]) ?? []).map((g) => ({ id: s(g.id), min: s(g.min), max: s(g.max) })),
    design: toDesignFields(design),
    originalDesign: design,
    rest,
  };
}

/** A number as typed; text that is not one stays text, so the parser names it as an upload would. */
const num = (v: string | undefined): number | string | undefined => {
  const x = v?.trim() ?? "";
  if (x === "") return undefined;
  const n = Number(x);
  return Number.isFinite(n) ? n : x;
};
const txt = (v: string | undefined) => (v === undefined || v.trim() === "" ? undefined : v.trim());
const clean = (o: Obj) => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined));
const blank = (r: GridRow) => Object.values(r).every((v) => !v || !v.trim());

/** The model the tables describe. */
export function fromTables(t: EditorTables): Obj {
  const cases = new Map<string, Obj>();
  for (const lc of t.loadCases.filter((r) => !blank(r))) cases.set(lc.id!.trim(), clean({ id: lc.id!.trim(), name: txt(lc.name), selfWeight: num(lc.selfWeight), loads: [] }));
  for (const l of t.loads.filter((r) => !blank(r))) {
    const id = l.case?.trim() ?? "";
    if (!cases.has(id)) cases.set(id, { id, loads: [] });
    (cases.get(id)!.loads as Obj[]).push(clean({ node: txt(l.node) ?? "", fx: num(l.fx), fy: num(l.fy), fz: num(l.fz) }));
  }
  const groups = t.groups.filter((r) => !blank(r)).map((g) => clean({ id: txt(g.id) ?? "", min: num(g.min), max: num(g.max) }));
  const design = fromDesignFields(t.design, groups, t.originalDesign);
  const model: Obj = {
    ...t.rest,
    materials: t.materials.filter((r) => !blank(r)).map((m) => clean({ id: txt(m.id) ?? "", name: txt(m.name), E: num(m.E), density: num(m.density), allowableTension: num(m.allowableTension), allowableCompression: num(m.allowableCompression) })),
    nodes: t.nodes.filter((r) => !blank(r)).map((n) => clean({ id: txt(n.id) ?? "", x: num(n.x), y: num(n.y), z: num(n.z), fixed: n.fixed?.trim() ? [...n.fixed.trim().toLowerCase()].filter((c) => c.trim() && c !== ",") : undefined })),
    members: t.members.filter((r) => !blank(r)).map((m) => clean({ id: txt(m.id) ?? "", start: txt(m.start) ?? "", end: txt(m.end) ?? "", material: txt(m.material) ?? "", area: num(m.area), group: txt(m.group), section: txt(m.section), bucklingFactor: num(m.bucklingFactor) })),
    loadCases: [...cases.values()],
    ...(design ? { design } : {}),
  };
  return model;
}
