// The report's catalogue design: the continuous optimum it started from, rounding up and
// repairing, the catalogue design, the gap, and each variable's section with the limit that
// kept it from the next lighter one.
import { steppedByWords } from "~/lib/results/catalogue-words";
import { formatNumber, formatPercent } from "~/lib/format";
import type { ReportWriter } from "./layout";
import { INK, INK_MUTED } from "./palette";
import type { ReportData } from "./report-data";
import { table } from "./tables";
import { objectiveUnit, unitLabels } from "./units";

export function catalogueSection(w: ReportWriter, data: ReportData) {
  const r = data.result;
  const c = r.catalogue;
  if (!c) return;
  const u = unitLabels(r.units);
  const unit = objectiveUnit(r.objective.kind, r.units);
  w.heading("Catalogue design", 2);
  w.paragraph(
    `Every area variable takes one section of the model's catalogue. The search started from the continuous optimum and checked each candidate with a full analysis (${c.analyses} analyses); every limit holds at the catalogue design by re-analysis.`,
    { size: 8.5, color: INK_MUTED },
  );
  table(
    w,
    [
      { header: "Design", weight: 6 },
      { header: `${r.objective.kind} (${unit})`, weight: 2.5, align: "right" },
      { header: "Above continuous", weight: 2.5, align: "right" },
    ],
    [
      [`Continuous optimum (${c.continuousStatus})`, formatNumber(c.continuousObjective, { sig: 5 }), "–"],
      ["Rounded up to sections, then repaired", formatNumber(c.roundedObjective, { sig: 5 }), formatPercent(c.roundedObjective / c.continuousObjective - 1)],
      ["Catalogue design (this result)", formatNumber(r.objective.final, { sig: 5 }), formatPercent(c.gap)],
    ],
    { title: "Catalogue design beside the continuous optimum" },
  );
  table(
    w,
    [
      { header: "Group or member", weight: 3 },
      { header: "Members", weight: 1.5, align: "right" },
      { header: `Continuous area (${u.area})`, weight: 2.6, align: "right" },
      { header: "Section", weight: 3 },
      { header: `Area (${u.area})`, weight: 2.2, align: "right" },
      { header: "Kept from the next lighter section by", weight: 5 },
    ],
    c.choices.map((ch) => [ch.id, String(ch.members), formatNumber(ch.continuousArea), ch.section, formatNumber(ch.area), steppedByWords(ch.steppedBy, r)]),
    { title: "Section of each variable" },
  );
  w.doc.fillColor(INK);
}
