// Part of section 3, results: the proven lower bound beside the result (result field
// lowerBound), with the linear program it comes from and what it assumes, or why there is none.
import { formatNumber } from "~/lib/format";
import { formatGap, gapSentence } from "~/lib/lower-bound-words";
import type { ReportWriter } from "./layout";
import { INK_MUTED } from "./palette";
import type { ReportData } from "./report-data";
import { objectiveUnit } from "./units";

// plain subscripts (x_k): the report's fonts carry Latin and Greek, not the subscript block
const MASS_LP = [
  "minimize   Σ_v c_v A_v,  c_v = Σ ρ_e L_e over the members e of area variable v",
  "subject to B q_k + s_k W A = f_k        every checked case k (equilibrium; s_k W A: own weight)",
  "           −σc_e A_v ≤ q_ek ≤ σt_e A_v   every member e and case k (allowable stresses)",
  "           A_v ≥ 0                       one area per group or ungrouped member",
];

const COMPLIANCE_LP = [
  "C ≥ Σ_k W_k² / (E_max V),   W_k = min Σ_e L_e |q_e|  subject to  B q = f_k",
  "(least complementary energy and the Cauchy–Schwarz inequality, for any design of volume ≤ V)",
];

export function lowerBoundSection(w: ReportWriter, data: ReportData) {
  const r = data.result;
  const lb = r.lowerBound;
  if (!lb && !r.lowerBoundWithheld) return; // results made before the bound existed
  const unit = objectiveUnit(r.objective.kind, r.units);
  w.heading(r.objective.kind === "mass" ? "How close to the least possible mass" : "How close to the least possible compliance", 2);
  if (!lb) {
    w.paragraph(`No bound for this run. ${r.lowerBoundWithheld}`);
    return;
  }
  const limitsMet = r.verification?.allLimitsMet ?? r.status === "optimal";
  w.facts([
    ["Lower bound", `${formatNumber(lb.value, { sig: 6 })} ${unit}${lb.geometry === "final" ? " (at the final node positions)" : ""}`],
    ["Gap", `${formatGap(lb.gap)} (objective / bound − 1)`],
  ]);
  w.paragraph(gapSentence(lb, r.objective.kind, unit, limitsMet));
  w.paragraph("The linear program:", { size: 8.5, color: INK_MUTED });
  for (const line of r.objective.kind === "mass" ? MASS_LP : COMPLIANCE_LP) w.paragraph(line, { face: "mono", size: 7.5, gap: 0 });
  w.paragraph(`What it assumes: ${lb.basis}`, { size: 8.5 });
}
