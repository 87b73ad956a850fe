// Axis scales and ticks for the convergence plot: linear for the objective, base-10
// logarithmic for violation and KKT residual, which fall by many decades as a run converges.

export interface Scale {
  (v: number): number;
  ticks: number[];
  domain: [number, number];
  log: boolean;
}

/** Round a linear domain out to 1-2-5 steps and list about `count` ticks. */
export function linearScale(values: number[], range: [number, number], count = 5): Scale {
  const finite = values.filter(Number.isFinite);
  let lo = finite.length ? Math.min(...finite) : 0;
  let hi = finite.length ? Math.max(...finite) : 1;
  if (lo === hi) {
    const pad = Math.abs(lo) * 0.05 || 1;
    lo -= pad;
    hi += pad;
  }
  const step = niceStep((hi - lo) / count);
  lo = Math.floor(lo / step) * step;
  hi = Math.ceil(hi / step) * step;
  const ticks: number[] = [];
  for (let t = lo; t <= hi + step * 1e-9; t += step) ticks.push(Number(t.toPrecision(12)));
  const f = ((v: number) => range[0] + ((v - lo) / (hi - lo)) * (range[1] - range[0])) as Scale;
  f.ticks = ticks;
  f.domain = [lo, hi];
  f.log = false;
  return f;
}

/** Whole decades covering the positive values; zeros and negatives sit on the floor. */
export function logScale(values: number[], range: [number, number], floor = 1e-16): Scale {
  const pos = values.filter((v) => Number.isFinite(v) && v > 0);
  let lo = pos.length ? Math.floor(Math.log10(Math.min(...pos))) : -6;
  let hi = pos.length ? Math.ceil(Math.log10(Math.max(...pos))) : 0;
  if (lo === hi) hi = lo + 1;
  lo = Math.max(lo, Math.log10(floor));
  const decades = hi - lo;
  const every = Math.max(1, Math.ceil(decades / 6)); // at most about six labelled decades
  const ticks: number[] = [];
  for (let e = lo; e <= hi; e += every) ticks.push(Math.pow(10, e));
  const f = ((v: number) => {
    const e = v > 0 ? Math.max(lo, Math.log10(v)) : lo;
    return range[0] + ((e - lo) / (hi - lo)) * (range[1] - range[0]);
  }) as Scale;
  f.ticks = ticks;
  f.domain = [Math.pow(10, lo), Math.pow(10, hi)];
  f.log = true;
  return f;
}

export function niceStep(raw: number): number {
  if (!(raw > 0) || !Number.isFinite(raw)) return 1;
  const p = Math.pow(10, Math.floor(Math.log10(raw)));
  const f = raw / p;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10) * p;
}

/** SVG path through the points, broken where a value is missing. */
export function linePath(points: { x: number; y: number | null }[]): string {
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

export function tickLabel(v: number, log: boolean): string {
  if (log) {
    const e = Math.round(Math.log10(v));
    return e === 0 ? "1" : `1e${e}`;
  }
  const a = Math.abs(v);
  if (a !== 0 && (a >= 1e5 || a < 1e-3)) return v.toExponential(1).replace("e+", "e");
  return String(Number(v.toPrecision(6)));
}
