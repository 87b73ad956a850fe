// Section 4, the governing constraints with their shadow prices in plain words, and section 5,
// the independent verification checks of the final design.
import type { ShadowPrice, TrussResult, VerificationCheck } from "~/engine/design/result-types";
import { formatNumber, formatPercent, formatResidual } from "~/lib/format";
import type { ReportWriter } from "./layout";
import { BAD, INK, INK_MUTED, OK } from "./palette";
import type { ReportData } from "./report-data";
import { table } from "./tables";
import { objectiveUnit, unitLabels } from "./units";

/** "stress:AB:LC1" → "the stress limit of member AB in load case LC1", for ids without a sentence. */
export function describeConstraint(id: string): string {
  const p = id.split(":");
  switch (p[0]) {
    case "stress":
      return `the stress limit of member ${p[1]}${p[2] ? ` in load case ${p[2]}` : ""}`;
    case "buckling":
      return `the buckling limit of member ${p[1]}${p[2] ? ` in load case ${p[2]}` : ""}`;
    case "displacement":
      return `the displacement limit of node ${p[1]} along ${p[2]}${p[3] ? ` in load case ${p[3]}` : ""}`;
    case "volume":
      return "the volume limit";
    case "area-min":
      return `the lower area bound of ${p[1]}`;
    case "area-max":
      return `the upper area bound of ${p[1]}`;
    case "shape-min":
      return `the lower bound of shape variable ${p[1]}`;
    case "shape-max":
      return `the upper bound of shape variable ${p[1]}`;
    default:
      return `the constraint ${id}`;
  }
}

function priceUnit(id: string, r: TrussResult): string {
  const u = unitLabels(r.units);
  const obj = objectiveUnit(r.objective.kind, r.units);
  const kind = id.split(":")[0];
  if (kind === "stress" || kind === "buckling") return `${obj} per ${u.stress}`;
  if (kind === "displacement" || kind?.startsWith("shape")) return `${obj} per ${u.length}`;
  if (kind === "volume") return `${obj} per ${u.volume}`;
  if (kind?.startsWith("area")) return `${obj} per ${u.area}`;
  return `${obj} per unit`;
}

/** The result's own shadow prices, or ones worded here from the active constraints. */
export function shadowPrices(r: TrussResult): ShadowPrice[] {
  if (r.shadowPrices?.length) return r.shadowPrices;
  const obj = objectiveUnit(r.objective.kind, r.units);
  return r.activeConstraints.map((a) => {
    const unit = priceUnit(a.id, r);
    const what = describeConstraint(a.id);
    return {
      constraint: a.id,
      multiplier: a.multiplier,
      unit,
      sentence: `Relaxing ${what} by one unit would change the ${r.objective.kind} by about ${formatNumber(-Math.abs(a.multiplier), { sig: 3 })} ${obj} (${formatNumber(Math.abs(a.multiplier), { sig: 3 })} ${unit}).`,
    };
  });
}

const WORDED = 12; // the dearest limits get a sentence; the rest are listed in a table

export function constraintsSection(w: ReportWriter, data: ReportData) {
  const r = data.result;
  const prices = [...shadowPrices(r)].sort((a, b) => Math.abs(b.multiplier) - Math.abs(a.multiplier));
  w.newPage();
  w.heading("4  Governing constraints and their shadow prices");
  if (prices.length === 0) {
    w.paragraph("No constraint is active at the final design: no limit governs it, and relaxing any of them would not lower the objective.", { color: INK_MUTED });
  } else {
    w.paragraph(
      `${prices.length} limit${prices.length === 1 ? " governs" : "s govern"} the final design. The shadow price of a limit (its Lagrange multiplier) is how much the ${r.objective.kind} would drop per unit the limit is relaxed; the dearest limits come first.`,
      { size: 9 },
    );
    for (const p of prices.slice(0, WORDED)) {
      const text = `${p.sentence}`;
      w.ensure(w.paragraphHeight(text, { size: 9, width: w.width - 14 }) + 18);
      w.line("mono", 8, `${p.constraint}    ${formatNumber(p.multiplier, { sig: 4 })} ${p.unit}`, w.left, w.y, { color: INK_MUTED, width: w.width });
      w.y += 11;
      w.paragraph(text, { size: 9, x: w.left + 14, gap: 6 });
    }
    if (prices.length > WORDED) {
      table(
        w,
        [
          { header: "Constraint", weight: 4 },
          { header: "Shadow price", weight: 2.4, align: "right" },
          { header: "Unit", weight: 3 },
        ],
        prices.slice(WORDED).map((p) => [p.constraint, formatNumber(p.multiplier, { sig: 4 }), p.unit]),
        { title: `The other ${prices.length - WORDED} active limits` },
      );
    }
  }

  w.heading("5  Independent verification of the final design");
  const v = r.verification;
  if (!v) {
    w.paragraph("The result holds no independent verification of the final design.", { face: "sans-italic", color: BAD });
    return;
  }
  w.paragraph(
    "The final design as analysed again apart from the optimizer, each limit of the problem checked against it (the result's verification record).",
    { size: 9 },
  );
  w.facts([
    ["All limits met", v.allLimitsMet ? "yes" : `NO: ${v.failures.length} check${v.failures.length === 1 ? "" : "s"} failed`],
    ["Checks performed", String(v.checked)],
    ["Equilibrium residual", `${formatResidual(v.equilibriumResidual)} (largest |K u − f| over |f|, all load cases)`],
    ["Largest utilization", formatPercent(v.maxUtilization)],
  ]);
  const checkTable = (title: string, checks: VerificationCheck[]) =>
    table(
      w,
      [
        { header: "Check", weight: 4 },
        { header: "Kind", weight: 2 },
        { header: "Value", weight: 2, align: "right" },
        { header: "Limit", weight: 2, align: "right" },
        { header: "Ratio", weight: 1.8, align: "right" },
        { header: "Result", weight: 1.4 },
      ],
      checks.map((c) => [c.id, c.kind, formatNumber(c.value), formatNumber(c.limit), formatPercent(c.ratio), c.ok ? "met" : "FAILED"]),
      { title, cellColor: (i, col) => (col === 5 ? (checks[i]!.ok ? OK : BAD) : undefined) },
    );
  if (v.failures.length) checkTable("Failed checks", v.failures);
  if (v.worst.length) checkTable("Closest to their limits", v.worst);
  w.doc.fillColor(INK);
}
