// Convergence of a run, in clean SVG: the objective per iteration on a linear axis above,
// the largest constraint violation and the KKT residual on a shared log axis below (both
// fall by decades as the solver converges). The numbers are also in a table for screen
// readers and for copying.
import { useEffect, useRef, useState } from "react";
import { formatNumber, formatResidual, linearAxis, logAxis, plottedViolation, VIOLATION_FLOOR, VIOLATION_MET } from "~/lib/format";
import { EmptyState } from "~/components/ui/States";
import { maxOf, minOf } from "~/engine/util/extent";

export interface ConvergencePoint {
  iteration: number;
  objective: number | null;
  maxViolation: number | null;
  kktResidual: number | null;
}

const M = { left: 64, right: 16, top: 14, bottom: 30 };
const PANEL_H = 150;
const GAP = 34;

export function ConvergencePlot({
  history,
  objectiveLabel = "objective",
  live = false,
}: {
  history: ConvergencePoint[];
  objectiveLabel?: string;
  live?: boolean;
}) {
  const box = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(720);
  useEffect(() => {
    const el = box.current;
    if (!el || typeof ResizeObserver === "undefined") return;
    const ro = new ResizeObserver((entries) => setWidth(Math.max(280, Math.round(entries[0]!.contentRect.width))));
    ro.observe(el);
    return () => ro.disconnect();
    // the box exists only once there is something to plot
  }, [history.length > 0]);

  if (history.length === 0)
    return (
      <EmptyState title={live ? "Waiting for the first iteration" : "No iteration history"}>
        {live ? "The plot fills in as the solver reports each iteration." : "This run recorded no iterations."}
      </EmptyState>
    );

  const its = history.map((h) => h.iteration);
  // iterations are whole numbers: no tick between two of them
  const x = linearAxis([minOf(its), Math.max(maxOf(its), minOf(its) + 1)], [M.left, width - M.right], { count: Math.max(2, Math.floor(width / 90)), integer: true });
  const top: [number, number] = [M.top + PANEL_H, M.top];
  const bottom: [number, number] = [M.top + 2 * PANEL_H + GAP, M.top + PANEL_H + GAP];
  const yObj = linearAxis(history.map((h) => h.objective ?? NaN), top, { count: 4 });
  // the log axis reaches down to the KKT residual (floored against rounding noise); violations
  // are drawn no lower than the "met" level (plottedViolation), so a converged run's line stays
  // flat there instead of seeming to climb in its last steps
  const yLog = logAxis(history.flatMap((h) => [plottedViolation(h.maxViolation ?? NaN), h.kktResidual ?? NaN]), bottom, { floor: VIOLATION_FLOOR });
  const height = bottom[0] + M.bottom;
  const series = [
    { key: "objective", label: objectiveLabel, cls: "stroke-ink", dot: "fill-ink", y: yObj, pick: (h: ConvergencePoint) => h.objective, dash: undefined },
    {
      key: "maxViolation",
      label: `largest violation (at ${formatResidual(VIOLATION_MET)} or below: every limit met)`,
      cls: "stroke-compression",
      dot: "fill-compression",
      y: yLog,
      pick: (h: ConvergencePoint) => (h.maxViolation == null || !Number.isFinite(h.maxViolation) ? h.maxViolation : plottedViolation(h.maxViolation)),
      dash: undefined,
    },
    { key: "kktResidual", label: "KKT residual", cls: "stroke-info", dot: "fill-info", y: yLog, pick: (h: ConvergencePoint) => h.kktResidual, dash: "5 3" },
  ];
  const last = history[history.length - 1]!;

  return (
    <figure className="m-0" data-testid="convergence-plot">
      <div ref={box} className="w-full">
        <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={`Convergence over ${history.length} iterations`} className="block max-w-full font-mono text-[10px]">
          {[{ y: yObj, r: top, name: objectiveLabel }, { y: yLog, r: bottom, name: "violation, KKT (log)" }].map((p) => (
            <g key={p.name}>
              {p.y.ticks.map((t) => (
                <g key={t}>
                  <line x1={M.left} x2={width - M.right} y1={p.y(t)} y2={p.y(t)} className="stroke-rule" strokeWidth={0.75} />
                  <text x={M.left - 6} y={p.y(t)} dy="0.32em" textAnchor="end" className="fill-ink-muted">
                    {p.y.label(t)}
                  </text>
                </g>
              ))}
              <text x={M.left} y={p.r[1] - 4} className="fill-ink-soft font-sans text-[11px]">
                {p.name}
              </text>
            </g>
          ))}
          {x.ticks.map((t) => (
            <text key={t} x={x(t)} y={bottom[0] + 16} textAnchor="middle" className="fill-ink-muted">
              {x.label(t)}
            </text>
          ))}
          <text x={width - M.right} y={bottom[0] + 28} textAnchor="end" className="fill-ink-soft font-sans text-[11px]">
            iteration
          </text>
          {series.map((s) => {
            // mark the newest point, so a run that has reported once already shows something
            const v = valueOrNull(s.pick(last), s.y.log);
            return v === null ? null : <circle key={`${s.key}-last`} cx={x(last.iteration)} cy={s.y(s.y.log ? Math.max(v, s.y.domain[0]) : v)} r={2.5} className={s.dot} />;
          })}
          {series.map((s) => (
            <path
              key={s.key}
              d={linePath(history.map((h) => ({ x: x(h.iteration), y: valueOrNull(s.pick(h), s.y.log) === null ? null : s.y(s.y.log ? Math.max(s.pick(h)!, s.y.domain[0]) : s.pick(h)!) })))}
              fill="none"
              className={s.cls}
              strokeWidth={1.75}
              strokeDasharray={s.dash}
              strokeLinejoin="round"
            />
          ))}
        </svg>
      </div>
      <figcaption className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft">
        {series.map((s) => (
          <span key={s.key} className="flex items-center gap-1.5">
            <svg width="20" height="6" aria-hidden>
              <line x1="0" x2="20" y1="3" y2="3" className={s.cls} strokeWidth={2} strokeDasharray={s.dash} />
            </svg>
            {s.label}
          </span>
        ))}
        <span className="text-ink-muted">
          last: iteration {last.iteration}, {objectiveLabel} {formatNumber(last.objective)}, violation {formatResidual(last.maxViolation)}, KKT {formatResidual(last.kktResidual)}
        </span>
      </figcaption>
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer text-ink-muted">Iteration values</summary>
        <div className="mt-2 max-h-64 overflow-auto">
          <table className="data-table">
            <thead>
              <tr>
                <th className="num">iteration</th>
                <th className="num">{objectiveLabel}</th>
                <th className="num">max violation</th>
                <th className="num">KKT residual</th>
              </tr>
            </thead>
            <tbody>
              {history.map((h) => (
                <tr key={h.iteration}>
                  <td className="num">{h.iteration}</td>
                  <td className="num">{formatNumber(h.objective, { sig: 6 })}</td>
                  <td className="num">{formatResidual(h.maxViolation)}</td>
                  <td className="num">{formatResidual(h.kktResidual)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </details>
    </figure>
  );
}

function valueOrNull(v: number | null, log: boolean): number | null {
  if (v === null || !Number.isFinite(v)) return null;
  if (log && v < 0) return null;
  return v;
}

/** SVG path through the points, broken where a value is missing. */
function linePath(points: { x: number; y: number | null }[]): string {
  let d = "";
  let pen = false;
  for (const p of points) {
    if (p.y === null || !Number.isFinite(p.y)) {
      pen = false;
      continue;
    }
    d += `${pen ? "L" : "M"}${p.x.toFixed(1)},${p.y.toFixed(1)}`;
    pen = true;
  }
  return d;
}
