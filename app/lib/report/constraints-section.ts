// Section 4, what governs the design: the limits that bind (stress, deflection, buckling,
// volume) apart from the members that merely sit at their minimum size, what relaxing each
// design criterion by 1 % would save, and the worst deflection of each case; section 5, the
// independent verification checks of the final design.
import type { VerificationCheck } from "~/engine/design/result-types";
import { formatPercent, formatResidual, quantityFormatter } from "~/lib/format";
import { constraintQuantity, constraintWords } from "~/engine/design/constraint-words";
import type { ReportWriter } from "./layout";
import { BAD, INK, INK_MUTED, OK } from "./palette";
import type { ReportData } from "./report-data";
import { table } from "./tables";
import { criterionCostsPart, deflectionsPart, governingLimits, sizeBounds } from "./governing-section";

export function constraintsSection(w: ReportWriter, data: ReportData) {
  const r = data.result;
  w.newPage();
  w.heading("4  What governs the design and what it costs");
  governingLimits(w, r);
  sizeBounds(w, data);
  criterionCostsPart(w, r);
  deflectionsPart(w, r);
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
  const q = quantityFormatter(r.units);
  // members with their nodes, cases by id only: a case's name would not fit the row (section 2 names them)
  const ctx = { members: r.members };
  // each check in words with its value and limit in their unit; the engine's id stays in a
  // last, labelled column for whoever traces a check back to the result JSON
  const checkTable = (title: string, checks: VerificationCheck[]) =>
    table(
      w,
      [
        { header: "Check", weight: 6.4 },
        { header: "Value", weight: 1.5, align: "right" },
        { header: "Limit", weight: 1.5, align: "right" },
        { header: "Unit", weight: 0.9 },
        { header: "Ratio", weight: 1.4, align: "right" },
        { header: "Result", weight: 1.2 },
        { header: "Check id", weight: 3.6, face: "mono" },
      ],
      checks.map((c) => {
        const quantity = constraintQuantity(c.id);
        const num = (x: number) => (quantity ? q.number(x, quantity) : formatResidual(x));
        return [constraintWords(c.id, ctx), num(c.value), num(c.limit), quantity ? q.unit(quantity) : "ratio", formatPercent(c.ratio), c.ok ? "met" : "FAILED", c.id];
      }),
      { title, size: 7.2, cellColor: (i, col) => (col === 5 ? (checks[i]!.ok ? OK : BAD) : col === 6 ? INK_MUTED : undefined) },
    );
  if (v.failures.length) checkTable("Failed checks", v.failures);
  if (v.worst.length) checkTable("Closest to their limits", v.worst);
  w.doc.fillColor(INK);
}
