// "Clean layout": from a dense candidate grid to a buildable truss in one step. Keep the members
// the least-mass LP (or the optimum) gives an area above a share of the largest, drop the nodes
// that then carry nothing, join two members that run straight through an unloaded, unsupported
// node (such a node is a mechanism across the line), and check that what is left is stable.
// Pure: a model and a result in, the new model file out (or the reason there is none).
import { parseModel, type TrussModel, type TrussModelInput } from "../truss";
import type { TrussResult } from "../design/result-types";

export interface CleanLayoutOptions {
  /** "lp": the least-mass LP's areas (result members' plasticArea); "optimum": the result's areas */
  source: "lp" | "optimum";
  /** keep members whose area is above this share of the largest (0 < threshold < 1) */
  threshold: number;
}

export type CleanLayout =
  | { ok: true; model: TrussModelInput; kept: number; dropped: number; nodesDropped: number; joined: number; summary: string }
  | { ok: false; reason: string };

type Member = TrussModel["members"][number];

export function cleanLayout(model: TrussModel, result: TrussResult, o: CleanLayoutOptions): CleanLayout {
  if (!(o.threshold > 0 && o.threshold < 1)) return { ok: false, reason: `The threshold must lie between 0 and 1 (a share of the largest area); got ${o.threshold}.` };
  const byId = new Map(result.members.map((m) => [m.id, m]));
  const areaOf = (id: string) => (o.source === "lp" ? byId.get(id)?.plasticArea : byId.get(id)?.area);
  if (model.members.some((m) => areaOf(m.id) === undefined)) {
    return {
      ok: false,
      reason: o.source === "lp" ? "This result carries no least-mass LP design (no bound was computed for it); clean the layout from the optimum instead." : "The result does not match the model's members.",
    };
  }
  const largest = Math.max(...model.members.map((m) => areaOf(m.id)!));
  if (!(largest > 0)) return { ok: false, reason: "Every member has zero area in this design: there is no layout to keep." };
  let members: Member[] = model.members.filter((m) => areaOf(m.id)! > o.threshold * largest).map((m) => ({ ...m, area: areaOf(m.id)! }));

  // the geometry the areas belong to: the final one of a shape run
  const shaped = (model.design?.shape?.length ?? 0) > 0;
  const finalNode = new Map(result.nodes.map((n) => [n.id, n]));
  const nodes = model.nodes.map((n) => {
    const f = shaped ? finalNode.get(n.id) : undefined;
    return f ? { ...n, x: f.x, y: f.y, ...(model.dimension === 3 ? { z: f.z } : {}) } : { ...n };
  });
  const nodeById = new Map(nodes.map((n) => [n.id, n]));
  const loaded = new Set(model.loadCases.flatMap((lc) => lc.loads.filter((l) => (l.fx ?? 0) !== 0 || (l.fy ?? 0) !== 0 || (l.fz ?? 0) !== 0).map((l) => l.node)));

  let joined = 0;
  for (;;) {
    const at = new Map<string, Member[]>();
    for (const m of members) for (const n of [m.start, m.end]) at.set(n, [...(at.get(n) ?? []), m]);
    const through = [...at.entries()].find(([id, ms]) => ms.length === 2 && !loaded.has(id) && !(nodeById.get(id)!.fixed?.length) && straight(id, ms[0]!, ms[1]!));
    if (!through) break;
    const [id, [a, b]] = through as [string, [Member, Member]];
    const far = (m: Member) => (m.start === id ? m.end : m.start);
    const merged: Member = { ...a, start: far(a), end: far(b), area: Math.max(a.area, b.area) };
    members = members.filter((m) => m !== a && m !== b).concat(merged);
    joined++;
  }
  function straight(id: string, a: Member, b: Member): boolean {
    if (a.material !== b.material || (a.group ?? null) !== (b.group ?? null)) return false;
    const c = nodeById.get(id)!;
    const p = nodeById.get(a.start === id ? a.end : a.start)!;
    const q = nodeById.get(b.start === id ? b.end : b.start)!;
    const u = [p.x - c.x, p.y - c.y, (p.z ?? 0) - (c.z ?? 0)];
    const v = [q.x - c.x, q.y - c.y, (q.z ?? 0) - (c.z ?? 0)];
    const dot = u[0]! * v[0]! + u[1]! * v[1]! + u[2]! * v[2]!;
    return dot < 0 && Math.abs(Math.abs(dot) - Math.hypot(u[0]!, u[1]!, u[2]!) * Math.hypot(v[0]!, v[1]!, v[2]!)) <= 1e-9 * Math.abs(dot);
  }

  const used = new Set(members.flatMap((m) => [m.start, m.end]));
  const keptNodes = nodes.filter((n) => used.has(n.id) || loaded.has(n.id));
  const keptIds = new Set(keptNodes.map((n) => n.id));
  const groups = new Set(members.map((m) => m.group).filter((g): g is string => !!g));
  const design = model.design ? cleanDesign(model.design, keptIds, groups, result) : undefined;
  const out: TrussModelInput = {
    ...model,
    name: `${model.name} (clean layout)`.slice(0, 200),
    description: `${model.description ? `${model.description}\n` : ""}Clean layout: members with ${o.source === "lp" ? "least-mass LP" : "optimum"} areas above ${100 * o.threshold} % of the largest.`,
    nodes: keptNodes,
    members,
    ...(design ? { design } : {}),
  };
  const check = parseModel(out);
  if (!check.ok) {
    const e = check.errors[0]!;
    return { ok: false, reason: `The clean layout would not be a usable model: ${e.path ? `${e.path}: ` : ""}${e.message}. Lower the threshold to keep more members.` };
  }
  if (!check.summary.stability.ok) {
    return { ok: false, reason: `The clean layout would not be stable: ${check.summary.stability.message} Lower the threshold to keep more members.` };
  }
  const dropped = model.members.length - members.length - joined;
  const nodesDropped = model.nodes.length - keptNodes.length;
  return {
    ok: true,
    model: out,
    kept: members.length,
    dropped,
    nodesDropped,
    joined,
    summary: `Kept ${members.length} of ${model.members.length} members${joined ? ` (${joined} straight pairs joined)` : ""}, dropped ${nodesDropped} of ${model.nodes.length} nodes; ${o.source === "lp" ? "least-mass LP" : "optimum"} areas above ${100 * o.threshold} % of the largest.`,
  };
}

function cleanDesign(design: NonNullable<TrussModel["design"]>, nodes: Set<string>, groups: Set<string>, result: TrussResult): NonNullable<TrussModel["design"]> {
  const value = new Map(result.variables.map((v) => [v.id, v.value]));
  const shape = (design.shape ?? [])
    .map((s) => ({
      ...s,
      // the nodes start at their final positions, so each variable's range moves with them
      min: s.min - (value.get(s.id) ?? 0),
      max: s.max - (value.get(s.id) ?? 0),
      moves: s.moves.filter((mv) => nodes.has(mv.node)),
    }))
    .filter((s) => s.moves.length > 0);
  const c = design.constraints;
  return {
    ...design,
    ...(design.groups ? { groups: design.groups.filter((g) => groups.has(g.id)) } : {}),
    ...(design.shape ? { shape } : {}),
    ...(c?.displacement ? { constraints: { ...c, displacement: c.displacement.filter((d) => d.node === "*" || nodes.has(d.node)) } } : {}),
  };
}
