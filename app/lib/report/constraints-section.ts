// Section 4, what governs the design: the limits that bind (stress, deflection, buckling,
// volume) apart from the members that merely sit at their minimum size, what relaxing each
// design criterion by 1 % would save, and the worst deflection of each case; section 5, the
// independent verification checks of the final design.
import type { VerificationCheck } from "~/engine/design/result-types";
import { formatNumber, formatPercent, formatResidual } from "~/lib/format";
import type { ReportWriter } from "./layout";
import { BAD, INK, OK } from "./palette";
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
