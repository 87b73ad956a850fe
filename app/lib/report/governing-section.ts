// The parts of section 4 of the report: the limits that govern (stress, deflection, buckling,
// volume), the members at their minimum (or maximum) size kept apart from them, what relaxing
// each design criterion by 1 % would save, and the deflection summary. Words come from the
// same home as the job page's (app/lib/results/criterion-words.ts).
import type { ShadowPrice, TrussResult } from "~/engine/design/result-types";
import { areaBoundsRule } from "~/engine/design/problem";
import { formatNumber, formatPercent, quantityFormatter } from "~/lib/format";
import { caseWords } from "~/lib/results/cases";
import { constraintWords } from "~/engine/design/constraint-words";
import { shadowPriceUnit, bindingCriteria, idleCriteria, idleCriteriaSentence, criterionName, criterionSentence, criterionValue, placesWords, savingText, shareText } from "~/lib/results/criterion-words";
import { isOverLimit } from "~/lib/utilization-scale";
import type { ReportWriter } from "./layout";
import { BAD, INK_MUTED } from "./palette";
import type { ReportData } from "./report-data";
import { table } from "./tables";
import { objectiveUnit } from "./units";

/** The result's own shadow prices, or ones worded here from the active constraints. */
export function shadowPrices(r: TrussResult): ShadowPrice[] {
  if (r.shadowPrices?.length) return r.shadowPrices;
  const obj = objectiveUnit(r.objective.kind, r.units);
  return r.activeConstraints.map((a) => {
    const unit = shadowPriceUnit(a.id, r);
    const what = `the ${constraintWords(a.id, r)}`;
    return {
      constraint: a.id,
      multiplier: a.multiplier,
      unit,
      sentence: `Relaxing ${what} by one unit would change the ${r.objective.kind} by about ${formatNumber(-Math.abs(a.multiplier), { sig: 3 })} ${obj} (${formatNumber(Math.abs(a.multiplier), { sig: 3 })} ${unit}).`,
    };
  });
}

/** Size and shape bounds are where the design stops, not limits set on how it behaves. */
const isBound = (id: string) => /^(area|shape)-(min|max):/.test(id);
const TOP = 3;

export function governingLimits(w: ReportWriter, r: TrussResult) {
  const limits = shadowPrices(r).filter((p) => !isBound(p.constraint));
  w.heading("Limits that govern", 2);
  if (limits.length === 0) {
    w.paragraph("No stress, deflection, buckling or volume limit is binding at the final design.", { size: 9, color: INK_MUTED });
    return;
  }
  if (r.status !== "optimal" && !r.criterionCostsOf) {
    // multipliers away from a proved optimum price nothing (as the criterion costs below say)
    w.paragraph(
      `${limits.length} limit${limits.length === 1 ? " is" : "s are"} active at the design this run ended with. They are not priced: a shadow price is read from the optimizer's multipliers at a proved optimum only.`,
      { size: 9 },
    );
    table(w, [{ header: "Active limit", weight: 1 }], limits.map((p) => [constraintWords(p.constraint, r)]));
    return;
  }
  w.paragraph(
    `${limits.length} limit${limits.length === 1 ? " binds" : "s bind"} at the final design. The shadow price of a limit (its Lagrange multiplier) is how much the ${r.objective.kind} would drop per unit the limit is relaxed; the dearest come first.`,
    { size: 9 },
  );
  table(
    w,
    [
      { header: "Limit", weight: 6 },
      { header: "Shadow price", weight: 2, align: "right" },
      { header: "Unit", weight: 2.2 },
    ],
    // the unit is spelled here, not taken from the stored price, so older results read as new ones
    limits.map((p) => [constraintWords(p.constraint, r), formatNumber(p.multiplier, { sig: 3 }), shadowPriceUnit(p.constraint, r)]),
  );
}

/** Members whose area sits on a bound, by area variable: the report reads the bounds from the model file. */
function membersOnBounds(data: ReportData): { side: "minimum" | "maximum"; variable: string; grouped: boolean; members: string[]; area: number }[] {
  const file = data.model.file;
  const r = data.result;
  if (!file?.members?.length || r.status === "analysed") return [];
  const bounds = areaBoundsRule({ members: file.members, design: file.design });
  const byVar = new Map<string, { grouped: boolean; members: string[]; area: number }>();
  for (const m of r.members) {
    const key = m.group ?? m.id;
    const v = byVar.get(key) ?? { grouped: m.group !== undefined, members: [], area: m.area };
    v.members.push(m.id);
    byVar.set(key, v);
  }
  const out: ReturnType<typeof membersOnBounds> = [];
  for (const [variable, v] of byVar) {
    const b = bounds(v.grouped ? variable : null);
    if (v.area <= b.min * (1 + 1e-6)) out.push({ side: "minimum", variable, ...v });
    else if (v.area >= b.max * (1 - 1e-6)) out.push({ side: "maximum", variable, ...v });
  }
  return out;
}

export function sizeBounds(w: ReportWriter, data: ReportData) {
  const r = data.result;
  const on = membersOnBounds(data);
  const q = quantityFormatter(r.units);
  const words = (list: typeof on) =>
    list.map((v) => (v.grouped ? `group ${v.variable} (${v.members.length} member${v.members.length === 1 ? "" : "s"}, ${q.text(v.area, "area")})` : `member ${v.variable} (${q.text(v.area, "area")})`)).join(", ");
  w.heading("Members at their minimum size", 2);
  const atMin = on.filter((v) => v.side === "minimum");
  const count = atMin.reduce((s, v) => s + v.members.length, 0);
  w.paragraph(
    count === 0
      ? "No member sits at its minimum area."
      : `${count} of ${r.members.length} members ${count === 1 ? "sits" : "sit"} at their minimum area: ${words(atMin)}. A minimum size is where the optimizer stops, not a limit the design is checked against; what lowering it would save is listed under the criterion costs.`,
    { size: 9 },
  );
  const atMax = on.filter((v) => v.side === "maximum");
  if (atMax.length) w.paragraph(`At their maximum area: ${words(atMax)}.`, { size: 9 });
  const shape = r.activeConstraints.filter((a) => /^shape-(min|max):/.test(a.id));
  if (shape.length) w.paragraph(`Shape variables at the end of their range: ${shape.map((a) => constraintWords(a.id, r)).join(", ")}.`, { size: 9 });
}

export function criterionCostsPart(w: ReportWriter, r: TrussResult) {
  const costs = r.criterionCosts;
  if (costs === undefined) return; // a result stored before criterion costs existed
  w.heading("What each design criterion costs", 2);
  const binding = bindingCriteria(costs);
  if (binding.length === 0) {
    w.paragraph(
      r.status === "optimal" || r.criterionCostsOf
        ? "No criterion binds at this design: relaxing one would save nothing."
        : "Only a design proved optimal is priced: what relaxing a criterion would save is read from the optimizer's multipliers at an optimum, and this run ended without one.",
      { size: 9, color: INK_MUTED },
    );
    return;
  }
  w.paragraph(
    `What relaxing each criterion by 1 % would save, to first order (the optimizer's multipliers summed by criterion; a re-run gives the exact figure)${r.criterionCostsOf ? ". For this catalogue design, the figures are those of the continuous optimum it was sized from" : ""}.`,
    { size: 9 },
  );
  binding.slice(0, TOP).forEach((c, i) => {
    const text = criterionSentence(c, r);
    w.ensure(w.paragraphHeight(text, { size: 9, width: w.width - 14 }) + 6);
    const y = w.doc.y;
    w.line("sans-semibold", 9, `${i + 1}.`, w.left, y);
    w.doc.y = y;
    w.paragraph(text, { size: 9, x: w.left + 14, width: w.width - 14, gap: 4 });
  });
  // the binding criteria beyond the top three get a row each; those that do not bind, one line
  const rest = binding.slice(TOP);
  if (rest.length)
    table(
      w,
      [
        { header: "Other criteria that bind", weight: 4.2 },
        { header: "Now", weight: 1.8, align: "right" },
        { header: "Binds at", weight: 4.6 },
        { header: "Saving", weight: 1.6, align: "right" },
        { header: "Share", weight: 1.3, align: "right" },
      ],
      rest.map((c) => [criterionName(c).replace(/^the /, ""), criterionValue(c, r), placesWords(c, r, 2), savingText(c, r), shareText(c.share)]),
    );
  const idle = idleCriteria(costs);
  if (idle.length) w.paragraph(idleCriteriaSentence(idle, r), { size: 9, color: INK_MUTED });
}

export function deflectionsPart(w: ReportWriter, r: TrussResult) {
  const rows = r.deflections;
  if (!rows?.length) return;
  const q = quantityFormatter(r.units);
  const len = q.unit("length");
  w.heading("Deflections", 2);
  const limited = rows.some((d) => d.governing);
  w.paragraph(
    limited
      ? "Per load case and combination, the displacement closest to its deflection limit (limits apply to the service combinations, else to every load case) and the largest displacement of any free node."
      : "Per load case and combination, the largest displacement of any free node; the model sets no deflection limit.",
    { size: 9 },
  );
  table(
    w,
    [
      { header: "Case", weight: 6.5 }, // a case's name and id: room for about 45 characters
      ...(limited
        ? [
            { header: "Closest to limit", weight: 2.2 },
            { header: `Displ. (${len})`, weight: 1.7, align: "right" as const },
            { header: `Limit (${len})`, weight: 1.6, align: "right" as const },
            { header: "Of limit", weight: 1.5, align: "right" as const },
          ]
        : []),
      { header: "Largest at", weight: 2 },
      { header: `Displ. (${len})`, weight: 1.7, align: "right" },
    ],
    rows.map((d) => {
      const g = d.governing;
      const cells = [caseWords(d.case, r)];
      if (limited) cells.push(g ? `node ${g.node}, ${g.axis}` : d.checked ? "–" : "not checked", g ? q.number(g.value, "length") : "–", g ? q.number(g.limit, "length") : "–", g ? formatPercent(g.ratio) : "–");
      cells.push(`node ${d.largest.node}, ${d.largest.axis}`, q.number(d.largest.value, "length"));
      return cells;
    }),
    { cellColor: (i, col) => (limited && col === 4 && rows[i]!.governing && isOverLimit(rows[i]!.governing!.ratio) ? BAD : undefined) },
  );
}
