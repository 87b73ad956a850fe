// What changed between two versions of a model, in words an engineer reads ("node C moved
// 250 mm up", "member D4 added", "load on node N3 in LC1 changed from -20 to -25 kN"), not a
// JSON diff. Pure: the version page and its test call it.
type Obj = Record<string, unknown>;

interface N {
  id: string;
  x: number;
  y: number;
  z?: number;
  fixed?: string[];
}
interface M {
  id: string;
  start: string;
  end: string;
  material: string;
  area?: number;
  group?: string;
  section?: string;
}
interface L {
  node: string;
  fx?: number;
  fy?: number;
  fz?: number;
}

const fmt = (v: number) => String(Number(v.toPrecision(6)));
const list = <T extends { id: string }>(v: unknown) => new Map(((v as T[]) ?? []).map((x) => [x.id, x]));
const axesWords = (f?: string[]) => (f?.length ? f.join("") : "none");
const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

/** At most `limit` sentences per kind of change; the rest summarised as a count. */
export function describeChanges(before: Obj, after: Obj, limit = 25): string[] {
  const out: string[] = [];
  const len = ((after.units as Obj | undefined)?.length as string) ?? "";
  const force = ((after.units as Obj | undefined)?.force as string) ?? "";
  const capped = (sentences: string[]) => {
    out.push(...sentences.slice(0, limit));
    if (sentences.length > limit) out.push(`… and ${sentences.length - limit} more of the same kind`);
  };

  if (before.name !== after.name) out.push(`Renamed from "${String(before.name)}" to "${String(after.name)}".`);
  if (!same(before.units, after.units)) out.push(`Units changed from ${JSON.stringify(before.units)} to ${JSON.stringify(after.units)}.`);
  if (before.dimension !== after.dimension) out.push(`Changed from ${String(before.dimension)}D to ${String(after.dimension)}D.`);

  // nodes
  const nb = list<N>(before.nodes);
  const na = list<N>(after.nodes);
  const nodeSentences: string[] = [];
  for (const [id, a] of na) {
    const b = nb.get(id);
    if (!b) {
      nodeSentences.push(`Node ${id} added at (${fmt(a.x)}, ${fmt(a.y)}${a.z !== undefined ? `, ${fmt(a.z)}` : ""}) ${len}.`);
      continue;
    }
    const moves = (["x", "y", "z"] as const)
      .map((k) => [k, (a[k] ?? 0) - (b[k] ?? 0)] as const)
      .filter(([, d]) => Math.abs(d) > 0)
      .map(([k, d]) => `${fmt(Math.abs(d))} ${len} ${d > 0 ? "+" : "−"}${k}`);
    if (moves.length) nodeSentences.push(`Node ${id} moved ${moves.join(", ")}.`);
    if (!same(b.fixed ?? [], a.fixed ?? [])) nodeSentences.push(`Support at node ${id}: restrained axes ${axesWords(b.fixed)} → ${axesWords(a.fixed)}.`);
  }
  for (const id of nb.keys()) if (!na.has(id)) nodeSentences.push(`Node ${id} removed.`);
  capped(nodeSentences);

  // members
  const mb = list<M>(before.members);
  const ma = list<M>(after.members);
  const memberSentences: string[] = [];
  for (const [id, a] of ma) {
    const b = mb.get(id);
    if (!b) {
      memberSentences.push(`Member ${id} added from ${a.start} to ${a.end}.`);
      continue;
    }
    if (a.start !== b.start || a.end !== b.end) memberSentences.push(`Member ${id} now joins ${a.start}–${a.end} (was ${b.start}–${b.end}).`);
    if (a.area !== b.area && a.area !== undefined && b.area !== undefined) memberSentences.push(`Member ${id}: starting area ${fmt(b.area)} → ${fmt(a.area)} ${len}².`);
    if (a.material !== b.material) memberSentences.push(`Member ${id}: material ${b.material} → ${a.material}.`);
    if (a.group !== b.group) memberSentences.push(`Member ${id}: group ${b.group ?? "none"} → ${a.group ?? "none"}.`);
    if (a.section !== b.section) memberSentences.push(`Member ${id}: section ${b.section ?? "none"} → ${a.section ?? "none"}.`);
  }
  for (const id of mb.keys()) if (!ma.has(id)) memberSentences.push(`Member ${id} removed.`);
  capped(memberSentences);

  // materials
  const matB = list<Obj & { id: string }>(before.materials);
  const matA = list<Obj & { id: string }>(after.materials);
  for (const [id, a] of matA) {
    const b = matB.get(id);
    if (!b) out.push(`Material ${id} added.`);
    else for (const k of ["E", "density", "allowableTension", "allowableCompression"]) if (a[k] !== b[k]) out.push(`Material ${id}: ${k} ${b[k] ?? "none"} → ${a[k] ?? "none"}.`);
  }
  for (const id of matB.keys()) if (!matA.has(id)) out.push(`Material ${id} removed.`);

  // loads, per load case and node
  const cb = list<Obj & { id: string; loads: L[] }>(before.loadCases);
  const ca = list<Obj & { id: string; loads: L[] }>(after.loadCases);
  const loadSentences: string[] = [];
  const sum = (loads: L[]) => {
    const m = new Map<string, [number, number, number]>();
    for (const l of loads ?? []) {
      const v = m.get(l.node) ?? [0, 0, 0];
      m.set(l.node, [v[0] + (l.fx ?? 0), v[1] + (l.fy ?? 0), v[2] + (l.fz ?? 0)]);
    }
    return m;
  };
  const vec = (v: [number, number, number]) => `(${v.map(fmt).join(", ")}) ${force}`;
  for (const [id, a] of ca) {
    const b = cb.get(id);
    if (!b) {
      loadSentences.push(`Load case ${id} added with ${a.loads?.length ?? 0} load${a.loads?.length === 1 ? "" : "s"}.`);
      continue;
    }
    if (a.name !== b.name) loadSentences.push(`Load case ${id} renamed "${String(b.name ?? "")}" → "${String(a.name ?? "")}".`);
    if (a.selfWeight !== b.selfWeight) loadSentences.push(`Load case ${id}: own-weight factor ${String(b.selfWeight ?? "none")} → ${String(a.selfWeight ?? "none")}.`);
    const lb = sum(b.loads);
    const la = sum(a.loads);
    for (const [node, v] of la) {
      const w = lb.get(node);
      if (!w) loadSentences.push(`Load case ${id}: a load ${vec(v)} added on node ${node}.`);
      else if (!same(v, w)) loadSentences.push(`Load case ${id}: the load on node ${node} changed from ${vec(w)} to ${vec(v)}.`);
    }
    for (const [node, w] of lb) if (!la.has(node)) loadSentences.push(`Load case ${id}: the load ${vec(w)} on node ${node} removed.`);
  }
  for (const id of cb.keys()) if (!ca.has(id)) loadSentences.push(`Load case ${id} removed.`);
  capped(loadSentences);

  // the design block: limits and bounds in words, the rest as "changed"
  const db = before.design as Obj | undefined;
  const da = after.design as Obj | undefined;
  if (!db && da) out.push("A design block was added: the model can now be optimized.");
  else if (db && !da) out.push("The design block was removed: the model can be analysed, not optimized.");
  else if (db && da) {
    if (db.objective !== da.objective) out.push(`Objective ${String(db.objective)} → ${String(da.objective)}.`);
    if (!same(db.areaBounds, da.areaBounds)) out.push(`Area bounds ${bounds(db.areaBounds)} → ${bounds(da.areaBounds)} ${len}².`);
    const cB = (db.constraints ?? {}) as Obj;
    const cA = (da.constraints ?? {}) as Obj;
    if (!!cB.stress !== !!cA.stress) out.push(`Stress limits ${cA.stress ? "switched on" : "switched off"}.`);
    const dl = (v: unknown) => new Map(((v as { node: string; axis: string; limit: number }[]) ?? []).map((x) => [`${x.node}/${x.axis}`, x.limit]));
    const dB = dl(cB.displacement);
    const dA = dl(cA.displacement);
    for (const [k, v] of dA) {
      const [node, axis] = k.split("/");
      const where = `${node === "*" ? "every node" : `node ${node}`} along ${axis}`;
      if (!dB.has(k)) out.push(`Displacement limit added: ${where} within ${fmt(v)} ${len}.`);
      else if (dB.get(k) !== v) out.push(`Displacement limit for ${where}: ${fmt(dB.get(k)!)} → ${fmt(v)} ${len}.`);
    }
    for (const k of dB.keys()) if (!dA.has(k)) out.push(`Displacement limit for ${k.replace("/", " along ")} removed.`);
    if (!same(cB.volume, cA.volume)) out.push(`Volume limit ${vol(cB.volume)} → ${vol(cA.volume)}.`);
    if (!same(cB.buckling, cA.buckling)) out.push(`Buckling check ${cA.buckling ? (cB.buckling ? "changed" : "switched on") : "switched off"}.`);
    if (!same(db.groups, da.groups)) out.push("Design groups changed.");
    if (!same(db.shape, da.shape)) out.push("Shape variables changed.");
    if (!same(db.solver, da.solver) || db.formulation !== da.formulation) out.push("Solver settings changed.");
  }
  if (!same(before.sections, after.sections)) out.push("The section list changed.");
  if (!same(before.combinations, after.combinations)) out.push("Load combinations changed.");
  if (before.description !== after.description) out.push("The description changed.");
  if (out.length === 0) out.push("No change in the model's content (the file may differ in layout only).");
  return out;
}

function bounds(v: unknown): string {
  const b = v as { min?: number; max?: number } | undefined;
  return b ? `${b.min ?? "–"} to ${b.max ?? "–"}` : "none";
}
function vol(v: unknown): string {
  const b = v as { max?: number } | undefined;
  return b?.max !== undefined ? `≤ ${b.max}` : "none";
}
