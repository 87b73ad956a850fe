// A drawing of the optimized truss as vector graphics: members coloured by utilization band,
// line width growing with the square root of the area, supports as small wedges, and the
// initial geometry dashed underneath when shape variables moved nodes. 3D models are drawn
// in an isometric view with z up.
import type { TrussResult } from "~/engine/design/result-types";
import type { ReportWriter } from "./layout";
import type { ModelFile } from "./report-data";
import { INK, INK_MUTED, RULE } from "./palette";
import { isOverLimit, OVER_LIMIT_OUTLINE, utilizationColor } from "~/lib/utilization-scale";
import { maxOf, minOf } from "~/engine/util/extent";

type P3 = [number, number, number];

const COS30 = Math.cos(Math.PI / 6);
function project(p: P3, dim: number): [number, number] {
  if (dim !== 3) return [p[0], p[1]];
  return [(p[0] - p[1]) * COS30, p[2] + (p[0] + p[1]) * 0.5];
}

export interface DrawingInput {
  dim: number;
  nodes: Map<string, { now: P3; initial: P3; fixed: string[] }>;
  members: { id: string; start: string; end: string; area: number; utilization: number }[];
  loadCase: string;
  loads: { node: string; f: P3 }[];
}

/** Joins the result (final geometry, areas, utilization) with the model (connectivity, supports). */
export function drawingInput(result: TrussResult, model: ModelFile | null): DrawingInput {
  const nodes: DrawingInput["nodes"] = new Map();
  const modelNodes = new Map((model?.nodes ?? []).map((n) => [n.id, n]));
  for (const n of result.nodes) {
    const m = modelNodes.get(n.id);
    const initial: P3 = n.initial ? [n.initial.x, n.initial.y, n.initial.z] : m ? [m.x, m.y, m.z ?? 0] : [n.x, n.y, n.z];
    nodes.set(n.id, { now: [n.x, n.y, n.z ?? 0], initial, fixed: n.fixed ?? m?.fixed ?? [] });
  }
  for (const m of model?.nodes ?? []) if (!nodes.has(m.id)) nodes.set(m.id, { now: [m.x, m.y, m.z ?? 0], initial: [m.x, m.y, m.z ?? 0], fixed: m.fixed ?? [] });
  const modelMembers = new Map((model?.members ?? []).map((m) => [m.id, m]));
  const members: DrawingInput["members"] = [];
  for (const r of result.members) {
    const start = r.start ?? modelMembers.get(r.id)?.start;
    const end = r.end ?? modelMembers.get(r.id)?.end;
    if (start && end && nodes.has(start) && nodes.has(end)) members.push({ id: r.id, start, end, area: r.area, utilization: r.utilization });
  }
  const lc = model?.loadCases?.[0];
  const loads = (lc?.loads ?? []).map((l) => ({ node: l.node, f: [l.fx ?? 0, l.fy ?? 0, l.fz ?? 0] as P3 }));
  return { dim: model?.dimension ?? (result.nodes.some((n) => Math.abs(n.z ?? 0) > 0) ? 3 : 2), nodes, members, loadCase: lc?.id ?? "", loads };
}

/**
 * Beyond this many members a drawing on a report page is a grey mass: at a line width of
 * 0.5 pt across ~480 pt, more than a few thousand bars overlap and none can be told apart.
 * Such a report says so and keeps the tables, which list every member.
 */
export const MAX_DRAWN_MEMBERS = 2500;

export function trussDrawing(w: ReportWriter, input: DrawingInput, opts: { maxHeight?: number; title?: string } = {}) {
  const doc = w.doc;
  if (input.members.length > MAX_DRAWN_MEMBERS) {
    if (opts.title) w.heading(opts.title, 2);
    w.paragraph(
      `Not drawn: the model has ${input.members.length.toLocaleString("en-GB")} members, more than a report page shows legibly (at most ${MAX_DRAWN_MEMBERS.toLocaleString("en-GB")}). ` +
        "The tables below list every member; the job page shows the truss in 3D.",
      { face: "sans-italic", color: INK_MUTED },
    );
    return;
  }
  if (input.members.length === 0) {
    if (opts.title) w.heading(opts.title, 2);
    w.paragraph("The drawing needs the members' end nodes, which neither the result nor the model file gave.", { face: "sans-italic", color: INK_MUTED });
    return;
  }
  const moved = [...input.nodes.values()].some((n) => n.now.some((c, i) => Math.abs(c - n.initial[i]!) > 1e-9 * (1 + Math.abs(c))));
  const pts: [number, number][] = [];
  for (const n of input.nodes.values()) {
    pts.push(project(n.now, input.dim));
    if (moved) pts.push(project(n.initial, input.dim));
  }
  const xs = pts.map((p) => p[0]);
  const ys = pts.map((p) => p[1]);
  const [x0, x1, y0, y1] = [minOf(xs), maxOf(xs), minOf(ys), maxOf(ys)];
  const spanX = x1 - x0 || 1;
  const spanY = y1 - y0 || 1;
  // use the rest of the page when it leaves room for a useful drawing
  const rest = w.bottom - w.y - 40 - (opts.title ? 22 : 0);
  const maxH = Math.min(opts.maxHeight ?? 300, rest >= 140 ? rest : Infinity);
  const pad = 20; // room for the load arrows above the top nodes
  const scale = Math.min((w.width - 2 * pad) / spanX, (maxH - 2 * pad) / spanY);
  const height = Math.max(60, spanY * scale + 2 * pad);
  w.ensure(height + 40 + (opts.title ? 22 : 0)); // the title stays with its drawing
  if (opts.title) w.heading(opts.title, 2);
  const top = w.y;
  const ox = w.left + (w.width - spanX * scale) / 2;
  const T = (p: P3): [number, number] => {
    const [u, v] = project(p, input.dim);
    return [ox + (u - x0) * scale, top + pad + (y1 - v) * scale];
  };
  doc.lineWidth(0.5).strokeColor(RULE).rect(w.left, top, w.width, height).stroke();

  if (moved) {
    doc.save().lineWidth(0.4).strokeColor(INK_MUTED).dash(2, { space: 2 });
    for (const m of input.members) {
      const a = T(input.nodes.get(m.start)!.initial);
      const b = T(input.nodes.get(m.end)!.initial);
      doc.moveTo(a[0], a[1]).lineTo(b[0], b[1]);
    }
    doc.stroke().undash().restore();
  }

  const maxArea = Math.max(maxOf(input.members.map((m) => m.area).filter((a) => Number.isFinite(a) && a > 0)), 1e-300);
  const thin = input.members.length > 600 ? 2 : 3.2;
  const order = [...input.members].sort((a, b) => (a.utilization || 0) - (b.utilization || 0));
  doc.lineCap("round");
  for (const m of order) {
    const a = T(input.nodes.get(m.start)!.now);
    const b = T(input.nodes.get(m.end)!.now);
    const lw = Math.max(0.35, thin * Math.sqrt(Math.max(0, m.area) / maxArea));
    if (isOverLimit(m.utilization)) {
      // over the limit: a red outline, the darkest tone, white stripes (reads in greyscale too)
      doc.moveTo(a[0], a[1]).lineTo(b[0], b[1]).lineWidth(lw + 1.6).strokeColor(OVER_LIMIT_OUTLINE).stroke();
      doc.moveTo(a[0], a[1]).lineTo(b[0], b[1]).lineWidth(lw).strokeColor(utilizationColor(1)).stroke();
      doc.lineCap("butt").moveTo(a[0], a[1]).lineTo(b[0], b[1]).lineWidth(Math.max(0.3, lw * 0.6)).dash(1.5, { space: 2 }).strokeColor("#ffffff").stroke().undash().lineCap("round");
    } else doc.moveTo(a[0], a[1]).lineTo(b[0], b[1]).lineWidth(lw).strokeColor(utilizationColor(m.utilization)).stroke();
  }
  doc.lineCap("butt");

  // loads of the first load case as arrows of one length, pointing the way the load acts
  const arrows = input.loads.length <= 300 ? input.loads : [];
  for (const l of arrows) {
    const n = input.nodes.get(l.node);
    if (!n) continue;
    const [x, y] = T(n.now);
    const [px, py] = T([n.now[0] + l.f[0], n.now[1] + l.f[1], n.now[2] + l.f[2]]);
    const len = Math.hypot(px - x, py - y);
    if (!(len > 0)) continue;
    const [ux, uy] = [(px - x) / len, (py - y) / len];
    const L = 16;
    const [sx, sy] = [x - ux * L, y - uy * L];
    doc.moveTo(sx, sy).lineTo(x - ux * 2, y - uy * 2).lineWidth(0.7).strokeColor(INK_MUTED).stroke();
    doc.moveTo(x, y).lineTo(x - ux * 5 - uy * 2.2, y - uy * 5 + ux * 2.2).lineTo(x - ux * 5 + uy * 2.2, y - uy * 5 - ux * 2.2).closePath().fill(INK_MUTED);
  }

  const few = input.nodes.size <= 60;
  for (const [id, n] of input.nodes) {
    const [x, y] = T(n.now);
    if (n.fixed.length > 0) {
      const s = 4.5;
      doc.moveTo(x, y).lineTo(x - s, y + s * 1.5).lineTo(x + s, y + s * 1.5).closePath().lineWidth(0.6).fillAndStroke("#ffffff", INK);
      if (n.fixed.length === 1) doc.moveTo(x - s - 1, y + s * 1.5 + 2).lineTo(x + s + 1, y + s * 1.5 + 2).lineWidth(0.6).strokeColor(INK).stroke();
    } else if (few) {
      doc.circle(x, y, 1.3).fill(INK);
    }
    if (few) w.line("sans", 6, id, x + 3, y - 8, { color: INK_MUTED });
  }

  // legend
  let lx = w.left;
  const ly = top + height + 7;
  w.line("sans", 7, "utilization 0 %", lx, ly, { color: INK });
  lx += w.measure("sans", 7, "utilization 0 %") + 4;
  for (let k = 0; k < 40; k++) doc.rect(lx + k * 2, ly + 1, 2.05, 5).fill(utilizationColor(k / 39));
  lx += 84;
  w.line("sans", 7, "100 %", lx, ly, { color: INK });
  lx += w.measure("sans", 7, "100 %") + 14;
  doc.rect(lx, ly + 0.5, 16, 6).lineWidth(1).fillAndStroke(utilizationColor(1), OVER_LIMIT_OUTLINE);
  for (let k = 2; k < 16; k += 3.5) doc.rect(lx + k, ly + 0.5, 1.5, 6).fill("#ffffff");
  w.line("sans", 7, "over its limit (striped, red outline)", lx + 20, ly, { color: INK });
  w.line("sans", 7, "Utilization (worst check over all load cases). Line width grows with the square root of the area.", w.left, ly + 11, { color: INK_MUTED });
  const notes: string[] = [];
  if (input.dim === 3) notes.push("Isometric view, z up.");
  if (arrows.length) notes.push(`Arrows: the loads of ${input.loadCase} (direction only).`);
  if (moved) notes.push("Dashed: initial geometry before the shape variables moved the nodes.");
  if (notes.length) w.line("sans", 7, notes.join(" "), w.left, ly + 20, { color: INK_MUTED, width: w.width });
  doc.fillColor(INK);
  w.y = top + height + (notes.length ? 36 : 28);
}
