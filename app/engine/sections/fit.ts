// The smooth I(A) that continuous sizing uses with a catalogue (docs/model-format.md):
// I = a * A^b, a and b fitted by least squares to (ln A, ln I) over every section. A straight
// line in log-log coordinates is the usual form for a family of similar shapes: I scales as
// A^2 when a section grows geometrically similar, and faster (b > 2) when its walls thin out.
// The fit's error over the catalogue is reported with every run that uses it.

export interface SectionLike {
  id: string;
  area: number;
  I: number;
}

export interface SectionFit {
  a: number;
  b: number;
  /** number of sections fitted */
  count: number;
  /** largest |I_fit / I - 1| over the catalogue, and the section where it occurs */
  maxRelativeError: number;
  worstSection: string;
  /** root mean square of ln(I_fit / I) */
  rmsLogError: number;
}

/** Least-squares line ln I = ln a + b ln A. One section (or one distinct area) fixes b = 2. */
export function fitSecondMoment(sections: readonly SectionLike[]): SectionFit {
  if (sections.length === 0) throw new RangeError("fitSecondMoment needs at least one section");
  const n = sections.length;
  let sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (const s of sections) {
    const x = Math.log(s.area), y = Math.log(s.I);
    sx += x; sy += y; sxx += x * x; sxy += x * y;
  }
  const det = n * sxx - sx * sx;
  let b: number, lnA: number;
  if (det > 1e-12 * Math.max(1, n * sxx)) {
    b = (n * sxy - sx * sy) / det;
    lnA = (sy - b * sx) / n;
  } else {
    // every section has the same area: no slope to fit; I = a A^2 (geometric similarity) through their mean
    b = 2;
    lnA = (sy - 2 * sx) / n;
  }
  const a = Math.exp(lnA);
  let maxRel = 0, worst = sections[0].id, ss = 0;
  for (const s of sections) {
    const fit = a * s.area ** b;
    const rel = Math.abs(fit / s.I - 1);
    if (rel > maxRel) { maxRel = rel; worst = s.id; }
    const r = Math.log(fit / s.I);
    ss += r * r;
  }
  return { a, b, count: n, maxRelativeError: maxRel, worstSection: worst, rmsLogError: Math.sqrt(ss / n) };
}
