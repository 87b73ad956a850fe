// Strutwise's own look for utilization, the same in the 3D view, legends, tables and the PDF:
// one continuous scale from pale sand (idle) through ochre to deep indigo (at the limit), its
// lightness falling evenly with utilization, so it reads the same in greyscale print and for
// colour-blind readers (lightness, not hue, carries the value). Members over their limit are
// not a sixth colour but a pattern: the darkest tone striped with white dashes (and a red
// outline on screen). Interpolated in OKLab (Ottosson 2020, a perceptually uniform space).

/** A member at its limit reads 1.000 give or take solver tolerance: "over" starts half a per cent above. */
export const OVER_LIMIT = 1.005;

export function isOverLimit(utilization: number): boolean {
  return !Number.isFinite(utilization) || utilization > OVER_LIMIT;
}

// OKLab stops [L, a, b] at utilization 0, 0.5 and 1 (our choice; L falls 0.93 → 0.36 evenly)
const STOPS: [number, [number, number, number]][] = [
  [0, [0.93, -0.005, 0.045]],
  [0.5, [0.645, 0.03, 0.11]],
  [1, [0.36, 0.02, -0.11]],
];

export function oklabToHex([L, a, b]: [number, number, number]): string {
  const l = (L + 0.3963377774 * a + 0.2158037573 * b) ** 3;
  const m = (L - 0.1055613458 * a - 0.0638541728 * b) ** 3;
  const s = (L - 0.0894841775 * a - 1.291485548 * b) ** 3;
  const lin = [4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s, -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s, -0.0041960863 * l - 0.7034186147 * m + 1.707614701 * s];
  return (
    "#" +
    lin
      .map((c) => {
        const v = c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(Math.max(0, c), 1 / 2.4) - 0.055;
        return Math.round(Math.min(1, Math.max(0, v)) * 255)
          .toString(16)
          .padStart(2, "0");
      })
      .join("")
  );
}

/** The scale's colour at a utilization (clamped to 0..1; over-limit members add the stripe). */
export function utilizationColor(utilization: number): string {
  const u = Number.isFinite(utilization) ? Math.min(1, Math.max(0, utilization)) : 1;
  let k = 0;
  while (k < STOPS.length - 2 && u > STOPS[k + 1]![0]) k++;
  const [u0, c0] = STOPS[k]!;
  const [u1, c1] = STOPS[k + 1]!;
  const t = (u - u0) / (u1 - u0);
  return oklabToHex([c0[0] + t * (c1[0] - c0[0]), c0[1] + t * (c1[1] - c0[1]), c0[2] + t * (c1[2] - c0[2])]);
}

/** OKLab lightness of a utilization's colour (tests: it must fall evenly for print and colour-blind readers). */
export function utilizationLightness(utilization: number): number {
  const u = Math.min(1, Math.max(0, utilization));
  return u <= 0.5 ? 0.93 + (u / 0.5) * (0.645 - 0.93) : 0.645 + ((u - 0.5) / 0.5) * (0.36 - 0.645);
}

/** CSS gradient of the whole scale, for legends. */
export function utilizationGradientCss(): string {
  const steps = [0, 0.125, 0.25, 0.375, 0.5, 0.625, 0.75, 0.875, 1].map((u) => `${utilizationColor(u)} ${u * 100}%`);
  return `linear-gradient(to right, ${steps.join(", ")})`;
}

/** The over-limit pattern as CSS: the darkest tone with white diagonal stripes. */
export const OVER_LIMIT_PATTERN_CSS = `repeating-linear-gradient(135deg, ${utilizationColor(1)} 0 3px, #ffffff 3px 5px)`;

/** The outline colour of over-limit members on screen (the app's "bad" token). */
export const OVER_LIMIT_OUTLINE = "#b3362c";
