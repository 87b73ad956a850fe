// Section 1, the model as uploaded: units, materials, nodes and supports, members, load cases.
import { formatNumber } from "~/lib/format";
import type { ReportWriter } from "./layout";
import { INK_MUTED } from "./palette";
import type { ModelFile, ReportData } from "./report-data";
import { table } from "./tables";
import { unitLabels } from "./units";

export function nodeIndex(model: ModelFile) {
  return new Map((model.nodes ?? []).map((n) => [n.id, n]));
}

export function memberLength(nodes: ReturnType<typeof nodeIndex>, startId: string, endId: string): number {
  const a = nodes.get(startId);
  const b = nodes.get(endId);
  if (!a || !b) return Number.NaN;
  return Math.hypot(b.x - a.x, b.y - a.y, (b.z ?? 0) - (a.z ?? 0));
}

export function modelSection(w: ReportWriter, data: ReportData) {
  const m = data.model.file;
  w.newPage();
  w.heading("1  The model");
  if (!m) {
    w.paragraph("The uploaded model file could not be read from storage, so its tables are left out of this report. The results below come from the stored result.", {
      face: "sans-italic",
      color: INK_MUTED,
    });
    return;
  }
  const u = unitLabels(data.result.units);
  const dim = m.dimension === 3 ? 3 : 2;
  if (m.description) w.paragraph(m.description, { color: INK_MUTED });
  const nLoads = (m.loadCases ?? []).reduce((s, lc) => s + lc.loads.length, 0);
  w.facts([
    ["Units", `length ${u.length}, force ${u.force}, mass ${u.mass}; stress in ${u.stress}, density in ${u.density}`],
    ["Dimension", dim === 3 ? "3D (x, y, z)" : "2D (x, y)"],
    [
      "Size",
      `${m.nodes?.length ?? 0} nodes, ${m.members?.length ?? 0} members, ${m.materials?.length ?? 0} materials, ${m.loadCases?.length ?? 0} load cases with ${nLoads} nodal loads`,
    ],
  ]);

  w.heading("Materials", 2);
  table(
    w,
    [
      { header: "Material", weight: 3 },
      { header: `E (${u.stress})`, weight: 2, align: "right" },
      { header: `Density (${u.density})`, weight: 2, align: "right" },
      { header: `Allowable tension (${u.stress})`, weight: 2.4, align: "right" },
      { header: `Allowable compression (${u.stress})`, weight: 2.6, align: "right" },
    ],
    (m.materials ?? []).map((mat) => [mat.id, formatNumber(mat.E), formatNumber(mat.density), formatNumber(mat.allowableTension), formatNumber(mat.allowableCompression)]),
  );

  w.heading("Nodes and supports", 2);
  const axes = dim === 3 ? ["x", "y", "z"] : ["x", "y"];
  table(
    w,
    [
      { header: "Node", weight: 3 },
      ...axes.map((a) => ({ header: `${a} (${u.length})`, weight: 2, align: "right" as const })),
      { header: "Restrained", weight: 2.5 },
    ],
    (m.nodes ?? []).map((n) => [
      n.id,
      formatNumber(n.x, { sig: 6 }),
      formatNumber(n.y, { sig: 6 }),
      ...(dim === 3 ? [formatNumber(n.z ?? 0, { sig: 6 })] : []),
      (n.fixed ?? []).filter((a) => axes.includes(a)).join(", ") || "free",
    ]),
    { title: `${m.nodes?.length ?? 0} nodes` },
  );

  w.heading("Members", 2);
  const nodes = nodeIndex(m);
  table(
    w,
    [
      { header: "Member", weight: 3 },
      { header: "Start", weight: 2 },
      { header: "End", weight: 2 },
      { header: "Material", weight: 2 },
      { header: "Group", weight: 2.6 },
      { header: `Initial area (${u.area})`, weight: 2.4, align: "right" },
      { header: `Length (${u.length})`, weight: 2.2, align: "right" },
    ],
    (m.members ?? []).map((mem) => [mem.id, mem.start, mem.end, mem.material, mem.group ?? "", formatNumber(mem.area), formatNumber(memberLength(nodes, mem.start, mem.end), { sig: 5 })]),
    { title: `${m.members?.length ?? 0} members` },
  );

  w.heading("Load cases", 2);
  const rows: string[][] = [];
  for (const lc of m.loadCases ?? []) {
    for (const l of lc.loads) rows.push([lc.id, lc.name ?? "", l.node, formatNumber(l.fx ?? 0), formatNumber(l.fy ?? 0), ...(dim === 3 ? [formatNumber(l.fz ?? 0)] : [])]);
    if (lc.loads.length === 0) rows.push([lc.id, lc.name ?? "", "(no loads)", "", "", ...(dim === 3 ? [""] : [])]);
  }
  table(
    w,
    [
      { header: "Load case", weight: 2 },
      { header: "Name", weight: 3.5 },
      { header: "Node", weight: 2 },
      ...["x", "y", ...(dim === 3 ? ["z"] : [])].map((a) => ({ header: `F${a} (${u.force})`, weight: 2, align: "right" as const })),
    ],
    rows,
    { title: `${m.loadCases?.length ?? 0} load cases, forces at nodes` },
  );
}
