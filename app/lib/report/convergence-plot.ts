// The convergence plot as vector graphics: the objective on a linear axis (left), the KKT
// residual and the largest constraint violation on a log axis (right), against iteration.
import type { HistoryEntry } from "~/engine/design/result-types";
import { formatResidual, linearAxis, logAxis, plottedViolation, VIOLATION_FLOOR, VIOLATION_MET } from "~/lib/format";
import type { ReportWriter } from "./layout";
import { BAD, BRASS_STRONG, INK, INK_MUTED, RULE } from "./palette";
import { maxOf, minOf } from "~/engine/util/extent";

export function convergencePlot(w: ReportWriter, history: HistoryEntry[], objectiveLabel: string, opts: { title?: string; height?: number } = {}) {
  const doc = w.doc;
  const height = opts.height ?? 200;
  w.ensure(height + 30 + (opts.title ? 22 : 0)); // the title stays with its plot
  if (opts.title) w.heading(opts.title, 2);
  const top = w.y;
  const box = { x: w.left + 46, y: top + 6, w: w.width - 46 - 46, h: height - 40 };
  const pts = history.filter((h) => Number.isFinite(h.iteration));
  if (pts.length === 0) {
    w.paragraph("No iteration history was recorded for this run.", { face: "sans-italic", color: INK_MUTED });
    return;
  }
  const iters = pts.map((p) => p.iteration);
  const xMin = minOf(iters);
  const xMax = Math.max(xMin + 1, maxOf(iters));
  const X = linearAxis([xMin, xMax], [box.x, box.x + box.w], { count: 8, integer: true });
  const Y = linearAxis(pts.map((p) => p.objective), [box.y + box.h, box.y]);
  // the axis is floored against rounding noise; violations no lower than the "met" level
  const L = logAxis(pts.flatMap((p) => [p.kktResidual, plottedViolation(p.maxViolation)]), [box.y + box.h, box.y], { floor: VIOLATION_FLOOR, maxTicks: 8 });
  const yT = Y.ticks;

  // grid and axes
  doc.lineWidth(0.3).strokeColor(RULE);
  for (const t of yT) doc.moveTo(box.x, Y(t)).lineTo(box.x + box.w, Y(t)).stroke();
  doc.lineWidth(0.7).strokeColor(INK_MUTED).rect(box.x, box.y, box.w, box.h).stroke();
  for (const t of yT) w.line("mono", 6.5, Y.label(t), box.x - 44, Y(t) - 3, { width: 40, align: "right", color: INK_MUTED });
  for (const t of L.ticks) w.line("mono", 6.5, L.label(t), box.x + box.w + 4, L(t) - 3, { color: INK_MUTED });
  for (const t of X.ticks.filter((t) => t >= xMin && t <= xMax)) {
    doc.moveTo(X(t), box.y + box.h).lineTo(X(t), box.y + box.h + 3).lineWidth(0.5).strokeColor(INK_MUTED).stroke();
    w.line("mono", 6.5, X.label(t), X(t) - 15, box.y + box.h + 5, { width: 30, align: "center", color: INK_MUTED });
  }
  w.line("sans", 7.5, "iteration", box.x + box.w / 2 - 20, box.y + box.h + 15, { color: INK_MUTED });
  doc.save().rotate(-90, { origin: [w.left + 4, box.y + box.h / 2] });
  w.line("sans", 7.5, objectiveLabel, w.left + 4 - 60, box.y + box.h / 2 - 6, { color: INK, width: 120, align: "center" });
  doc.restore();
  doc.save().rotate(90, { origin: [w.right - 4, box.y + box.h / 2] });
  w.line("sans", 7.5, "KKT residual, violation (log)", w.right - 4 - 70, box.y + box.h / 2 - 6, { color: INK_MUTED, width: 140, align: "center" });
  doc.restore();

  // series; a zero on the log axis is drawn at its floor
  const series = (values: (number | null)[], color: string, dash: number[] | null, width: number) => {
    doc.save().rect(box.x, box.y, box.w, box.h).clip();
    doc.lineWidth(width).strokeColor(color);
    if (dash) doc.dash(dash[0]!, { space: dash[1]! });
    let started = false;
    values.forEach((v, k) => {
      if (v === null) return (started = false);
      const x = X(pts[k]!.iteration);
      if (!started) doc.moveTo(x, v);
      else doc.lineTo(x, v);
      started = true;
    });
    doc.stroke().undash().restore();
  };
  const logY = (v: number) => (!Number.isFinite(v) ? null : L(Math.max(v, L.domain[0])));
  series(pts.map((p) => (Number.isFinite(p.objective) ? Y(p.objective) : null)), INK, null, 1.4);
  series(pts.map((p) => logY(p.kktResidual)), BRASS_STRONG, [3, 2], 1);
  series(pts.map((p) => logY(plottedViolation(p.maxViolation))), BAD, [1, 1.5], 1);

  // legend
  const ly = box.y + box.h + 27;
  let lx = w.left;
  const item = (color: string, dash: number[] | null, label: string) => {
    doc.lineWidth(1.3).strokeColor(color);
    if (dash) doc.dash(dash[0]!, { space: dash[1]! });
    doc.moveTo(lx, ly + 4).lineTo(lx + 18, ly + 4).stroke().undash();
    w.line("sans", 7.5, label, lx + 22, ly, { color: INK });
    lx += 22 + w.measure("sans", 7.5, label) + 16;
  };
  item(INK, null, `${objectiveLabel} (left axis)`);
  item(BRASS_STRONG, [3, 2], "KKT residual (right axis)");
  item(BAD, [1, 1.5], `largest violation (right axis; at ${formatResidual(VIOLATION_MET)} or below: every limit met)`);
  w.y = top + height + 8;
}
