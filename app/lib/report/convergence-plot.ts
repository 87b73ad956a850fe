// The convergence plot as vector graphics: the objective on a linear axis (left), the KKT
// residual and the largest constraint violation on a log axis (right), against iteration.
import type { HistoryEntry } from "~/engine/design/result-types";
import { num } from "./format";
import type { ReportWriter } from "./layout";
import { BAD, BRASS_STRONG, INK, INK_MUTED, RULE } from "./palette";

/** About `count` round tick values covering [lo, hi]. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) {
    const pad = Math.abs(lo) * 0.1 || 1;
    lo -= pad;
    hi += pad;
  }
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  const first = Math.floor(lo / step + 1e-9);
  const last = Math.ceil(hi / step - 1e-9);
  for (let k = first; k <= last; k++) out.push(Number((k * step).toPrecision(12)));
  return out;
}

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
  const xMin = Math.min(...iters);
  const xMax = Math.max(xMin + 1, ...iters);
  const objs = pts.map((p) => p.objective).filter(Number.isFinite);
  const yT = niceTicks(Math.min(...objs), Math.max(...objs));
  const yLo = yT[0]!;
  const yHi = yT[yT.length - 1]!;
  const positives = pts.flatMap((p) => [p.kktResidual, p.maxViolation]).filter((v) => Number.isFinite(v) && v > 0);
  const lMin = positives.length ? Math.floor(Math.log10(Math.min(...positives))) : -8;
  const lMax = positives.length ? Math.max(lMin + 1, Math.ceil(Math.log10(Math.max(...positives)))) : 0;
  const X = (i: number) => box.x + ((i - xMin) / (xMax - xMin)) * box.w;
  const Y = (v: number) => box.y + box.h - ((v - yLo) / (yHi - yLo || 1)) * box.h;
  const L = (v: number) => box.y + box.h - ((Math.log10(v) - lMin) / (lMax - lMin)) * box.h;

  // grid and axes
  doc.lineWidth(0.3).strokeColor(RULE);
  for (const t of yT) doc.moveTo(box.x, Y(t)).lineTo(box.x + box.w, Y(t)).stroke();
  doc.lineWidth(0.7).strokeColor(INK_MUTED).rect(box.x, box.y, box.w, box.h).stroke();
  for (const t of yT) w.line("mono", 6.5, num(t, 4), box.x - 44, Y(t) - 3, { width: 40, align: "right", color: INK_MUTED });
  const decades = lMax - lMin;
  const every = Math.max(1, Math.ceil(decades / 8));
  for (let d = lMin; d <= lMax; d += every) w.line("mono", 6.5, `1e${d}`.replace("-", "−"), box.x + box.w + 4, L(10 ** d) - 3, { color: INK_MUTED });
  for (const t of niceTicks(xMin, xMax, 8).filter((t) => t >= xMin && t <= xMax && Number.isInteger(t))) {
    doc.moveTo(X(t), box.y + box.h).lineTo(X(t), box.y + box.h + 3).lineWidth(0.5).strokeColor(INK_MUTED).stroke();
    w.line("mono", 6.5, String(t), X(t) - 15, box.y + box.h + 5, { width: 30, align: "center", color: INK_MUTED });
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
  const logY = (v: number) => (!Number.isFinite(v) ? null : L(v > 0 ? Math.max(v, 10 ** lMin) : 10 ** lMin));
  series(pts.map((p) => (Number.isFinite(p.objective) ? Y(p.objective) : null)), INK, null, 1.4);
  series(pts.map((p) => logY(p.kktResidual)), BRASS_STRONG, [3, 2], 1);
  series(pts.map((p) => logY(p.maxViolation)), BAD, [1, 1.5], 1);

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
  item(BAD, [1, 1.5], "largest violation (right axis; zero drawn at the floor)");
  w.y = top + height + 8;
}
