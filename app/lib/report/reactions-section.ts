// The report's support reactions: per supported node for every load case and combination, then
// the balance check as figures (sum of reactions, applied loads with own weight, what is left).
import type { ReportWriter } from "./layout";
import { INK, INK_MUTED } from "./palette";
import type { ReportData } from "./report-data";
import { formatNumber, formatResidual, noiseFloor } from "~/lib/format";
import { chunks, table } from "./tables";
import { unitLabels } from "./units";
import { resultCases } from "~/lib/results/cases";

export function reactionsSection(w: ReportWriter, data: ReportData) {
  const r = data.result;
  const reactions = r.reactions ?? [];
  if (reactions.length === 0) return;
  const u = unitLabels(r.units);
  const cases = resultCases(r);
  const dim = data.model.file?.dimension === 3 || reactions.some((x) => Object.values(x.values).some((v) => v[2] !== 0)) ? 3 : 2;
  const axes = ["x", "y", "z"].slice(0, dim);

  w.heading("Support reactions", 2);
  w.paragraph(`Forces the supports exert on the truss along the global axes, in ${u.force}; 0 on an axis the node is free to move along.`, { size: 8.5, color: INK_MUTED });
  const reactionFloor = noiseFloor(reactions.flatMap((x) => Object.values(x.values).flat()));
  for (const group of chunks(cases, dim === 3 ? 2 : 3)) {
    table(
      w,
      [{ header: "Node", weight: 3 }, ...group.flatMap((c) => axes.map((a) => ({ header: `${c.id} R${a} (${u.force})`, weight: 2.3, align: "right" as const })))],
      reactions.map((x) => [x.node, ...group.flatMap((c) => axes.map((_, k) => formatNumber(x.values[c.id]?.[k], { sig: 5, zeroBelow: reactionFloor })))]),
      { title: `Reactions, ${group.map((c) => c.id).join(", ")}` },
    );
  }

  const balance = r.reactionBalance ?? [];
  if (balance.length) {
    // keep the sentence on the page of the table it explains (title, header and a few rows)
    const intro = "Equilibrium check: the sum of the reactions against the applied loads and the truss's own weight in each load case and combination. They balance when what is left over is near zero.";
    w.ensure(w.paragraphHeight(intro, { size: 8.5 }) + 14 + 15 + 12 * Math.min(3, balance.length) + 4);
    w.paragraph(intro, {
      size: 8.5,
      color: INK_MUTED,
    });
    table(
      w,
      [
        { header: "Case", weight: 2.4 },
        ...axes.map((a) => ({ header: `ΣR${a} (${u.force})`, weight: 2.3, align: "right" as const })),
        ...axes.map((a) => ({ header: `applied ${a} (${u.force})`, weight: 2.3, align: "right" as const })),
        { header: "left over (relative)", weight: 2.4, align: "right" },
      ],
      balance.map((b) => {
        const zeroBelow = noiseFloor([...b.reactions, ...b.applied]);
        return [b.id, ...axes.map((_, k) => formatNumber(b.reactions[k], { sig: 6, zeroBelow })), ...axes.map((_, k) => formatNumber(b.applied[k], { sig: 6, zeroBelow })), formatResidual(b.residual)];
      }),
      { title: "Balance of reactions and loads" },
    );
  }
  w.doc.fillColor(INK);
}
