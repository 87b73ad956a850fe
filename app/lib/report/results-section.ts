// Section 3, results: the solver's outcome, the convergence plot, the drawing of the optimized
// truss, member and node tables per load case, and the shape variables' final values.
import { convergencePlot } from "./convergence-plot";
import { lowerBoundSection } from "./lower-bound-section";
import { statusWords } from "./cover";
import { formatNumber, formatPercent, formatResidual, noiseFloor } from "~/lib/format";
import type { ReportWriter } from "./layout";
import { BAD, COMPRESSION, INK, INK_MUTED, TENSION } from "./palette";
import { isOverLimit, utilizationColor } from "~/lib/utilization-scale";
import type { ReportData } from "./report-data";
import { chunks, table } from "./tables";
import { drawingInput, trussDrawing } from "./truss-drawing";
import { objectiveUnit, unitLabels } from "./units";
import { resultCases } from "~/lib/results/cases";
import { governingCheckWords } from "~/engine/design/constraint-words";
import { viewerTitle } from "~/components/job/result-words";

export function loadCaseIds(data: ReportData): { id: string; name?: string }[] {
  if (data.result.loadCases?.length) return resultCases(data.result); // load cases, then combinations
  if (data.model.file?.loadCases?.length) return data.model.file.loadCases.map((l) => ({ id: l.id, name: l.name }));
  const ids = new Set<string>();
  for (const m of data.result.members) for (const k of Object.keys(m.force)) ids.add(k);
  return [...ids].map((id) => ({ id }));
}

export function resultsSection(w: ReportWriter, data: ReportData) {
  const r = data.result;
  const u = unitLabels(r.units);
  const objUnit = objectiveUnit(r.objective.kind, r.units);
  w.newPage();
  w.heading("3  Results");
  const change = r.objective.initial !== 0 ? (r.objective.final - r.objective.initial) / Math.abs(r.objective.initial) : Number.NaN;
  const facts: [string, string][] = [
    ["Status", statusWords(r.status)],
    ["Solver message", r.message],
  ];
  if (r.hint) facts.push(["What to try", r.hint]);
  facts.push(
    [`Objective (${r.objective.kind}, ${objUnit})`, `initial ${formatNumber(r.objective.initial, { sig: 5 })}, final ${formatNumber(r.objective.final, { sig: 5 })} (${Number.isFinite(change) ? `${change > 0 ? "+" : ""}${formatPercent(change)}` : "no change figure"})`],
    ["Iterations", `${r.iterations} iterations, ${r.analyses} analyses`],
    ["KKT residual", `${formatResidual(r.kktResidual)} (scaled)`],
    ["Largest violation", `${formatResidual(r.maxViolation)} (relative to each limit)`],
    ["Volume", `${formatNumber(r.volume, { sig: 5 })} ${u.volume}`],
  );
  if (r.mass !== undefined) facts.push(["Mass", `${formatNumber(r.mass, { sig: 5 })} ${u.mass}`]);
  if (r.solver?.elapsedMs !== undefined) facts.push(["Solve time", `${formatNumber(r.solver.elapsedMs / 1000, { sig: 3 })} s`]);
  w.facts(facts);
  lowerBoundSection(w, data);

  convergencePlot(w, r.history, `${r.objective.kind} (${objUnit})`, { title: "Convergence" });
  // only an optimum is "the optimized truss": the same words as the job page's viewer
  trussDrawing(w, drawingInput(r, data.model.file), { title: viewerTitle(data.job.status === "cancelled" ? "cancelled" : r.status) });

  const lcs = loadCaseIds(data);
  const utilColor = (x: number) => utilizationColor(x);
  w.newPage();
  w.heading("Members", 2);
  w.paragraph(
    r.combinations?.length
      ? "Utilization is the worst ratio of a member's checks (stress, buckling) over the strength combinations; 100 % is at the limit. \"Governed by\" names the check and the combination."
      : "Utilization is the worst ratio of a member's checks (stress, buckling) over all load cases; 100 % is at the limit.",
    { size: 8.5, color: INK_MUTED },
  );
  // catalogue sections and per-member buckling factors get columns only when the result has them
  const withSection = r.members.some((m) => m.section !== undefined);
  const withK = r.members.some((m) => m.bucklingFactor !== undefined);
  const utilColumn = 5 + (withSection ? 1 : 0) + (withK ? 1 : 0);
  table(
    w,
    [
      { header: "Member", weight: 2.6 },
      { header: "Nodes", weight: 3 },
      { header: "Group", weight: 2.4 },
      ...(withSection ? [{ header: "Section", weight: 3 }] : []),
      { header: `Area (${u.area})`, weight: 2.2, align: "right" },
      { header: `Length (${u.length})`, weight: 2.2, align: "right" },
      ...(withK ? [{ header: "k", weight: 1, align: "right" as const }] : []),
      { header: "Utilization", weight: 2, align: "right" },
      { header: "Governed by", weight: 3 },
    ],
    r.members.map((m) => [
      m.id,
      m.start && m.end ? `${m.start}–${m.end}` : "",
      m.group ?? "",
      ...(withSection ? [m.section ?? ""] : []),
      formatNumber(m.area),
      formatNumber(m.length, { sig: 5 }),
      ...(withK ? [formatNumber(m.bucklingFactor, { sig: 3 })] : []),
      formatPercent(m.utilization),
      governingCheckWords(m.governing),
    ]),
    {
      title: `${r.members.length} members`,
      marker: (i) => utilColor(r.members[i]!.utilization),
      cellColor: (i, c) => (c === utilColumn && isOverLimit(r.members[i]!.utilization) ? BAD : undefined),
    },
  );

  // rounding noise (5.4e-10 N beside 360,000 N) prints as 0: a billionth of the largest value of its kind
  const forceFloor = noiseFloor(r.members.flatMap((m) => Object.values(m.force)));
  const stressFloor = noiseFloor(r.members.flatMap((m) => Object.values(m.stress)));
  for (const group of chunks(lcs, 3)) {
    const names = group.map((l) => l.id).join(", ");
    w.heading(`Forces and stresses, ${group.length > 1 ? "load cases" : "load case"} ${names}`, 2);
    w.paragraph("Force is positive in tension (blue), negative in compression (rust); stress = force / area.", { size: 8.5, color: INK_MUTED });
    table(
      w,
      [
        { header: "Member", weight: 3 },
        ...group.flatMap((lc) => [
          { header: `${lc.id} force (${u.force})`, weight: 2.6, align: "right" as const },
          { header: `${lc.id} stress (${u.stress})`, weight: 2.6, align: "right" as const },
        ]),
      ],
      r.members.map((m) => [m.id, ...group.flatMap((lc) => [formatNumber(m.force[lc.id], { zeroBelow: forceFloor }), formatNumber(m.stress[lc.id], { zeroBelow: stressFloor })])]),
      {
        cellColor: (i, c) => {
          if (c === 0) return undefined;
          const f = r.members[i]!.force[group[Math.floor((c - 1) / 2)]!.id];
          return f === undefined || Math.abs(f) < forceFloor || f === 0 ? INK : f > 0 ? TENSION : COMPRESSION;
        },
      },
    );
  }

  const dim = data.model.file?.dimension === 3 || r.nodes.some((n) => Object.values(n.displacement).some((d) => d[2] !== 0)) ? 3 : 2;
  const axes = dim === 3 ? ["x", "y", "z"] : ["x", "y"];
  const displacementFloor = noiseFloor(r.nodes.flatMap((n) => Object.values(n.displacement).flat()));
  for (const group of chunks(lcs, dim === 3 ? 2 : 3)) {
    w.heading(`Displacements (${u.length}), ${group.length > 1 ? "load cases" : "load case"} ${group.map((l) => l.id).join(", ")}`, 2);
    table(
      w,
      [
        { header: "Node", weight: 3 },
        ...group.flatMap((lc) => axes.map((a) => ({ header: `${lc.id} u${a}`, weight: 2, align: "right" as const }))),
      ],
      r.nodes.map((n) => [n.id, ...group.flatMap((lc) => axes.map((_, k) => formatNumber(n.displacement[lc.id]?.[k], { zeroBelow: displacementFloor })))]),
    );
  }

  w.heading("Shape variables", 2);
  const shapeDef = new Map((data.model.file?.design?.shape ?? []).map((s) => [s.id, s]));
  table(
    w,
    [
      { header: "Variable", weight: 3 },
      { header: `Final value (${u.length})`, weight: 2.5, align: "right" },
      { header: `Lower bound (${u.length})`, weight: 2, align: "right" },
      { header: `Upper bound (${u.length})`, weight: 2, align: "right" },
    ],
    r.variables.map((v) => [v.id, formatNumber(v.value, { sig: 6 }), formatNumber(shapeDef.get(v.id)?.min), formatNumber(shapeDef.get(v.id)?.max)]),
    { empty: "This design problem has no shape variables; the geometry is as uploaded." },
  );
  w.doc.fillColor(INK);
}
