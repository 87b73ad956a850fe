// Planar girders and roof trusses: Pratt, Howe, Warren (with and without verticals) over flat,
// duo-pitch (ridge at mid-span) and mono-pitch chords. The bottom chord is straight at y = 0;
// the top chord's height above it is the depth at each x. A line load on the top chord is
// turned into panel-point loads by tributary length.
//
// Pratt: diagonals fall towards mid-span (tension under gravity), verticals in compression.
// Howe: diagonals rise towards mid-span (compression), verticals in tension.
// Warren: alternating diagonals meeting at top nodes over the middle of each bottom panel;
// with verticals, a vertical from each top node to a bottom node below it halves the bottom
// chord panels.
import { z } from "zod";
import { assemble, choice, commonFields, KN_TO_N, M_TO_MM, ModelBuilder, num, tributaryLengths, type CommonParams } from "./common";

export const PLANAR_PATTERNS = ["pratt", "howe", "warren", "warren-verticals"] as const;
export const CHORD_SHAPES = ["flat", "duo-pitch", "mono-pitch"] as const;
export const PLANAR_SUPPORTS = ["pinned-roller", "pinned-pinned"] as const;

export const planarParameters = z
  .object({
    pattern: choice(PLANAR_PATTERNS, "pratt", "Web pattern"),
    chord: choice(CHORD_SHAPES, "flat", "Top chord shape: flat, duo-pitch (ridge at mid-span) or mono-pitch (rising from left to right)"),
    span: num({ default: 24, unit: "m", description: "Span between the supports", positive: true, max: 500 }),
    panels: num({ default: 8, unit: "count", description: "Number of panels along the span", int: true, min: 2, max: 400 }),
    depth: num({ default: 2.4, unit: "m", description: "Depth at the supports (left support for mono-pitch); 0 gives a triangular roof truss when pitched", min: 0, max: 100 }),
    ridgeDepth: num({ default: 4, unit: "m", description: "Depth at the ridge (duo-pitch) or at the right end (mono-pitch); ignored for flat chords", positive: true, max: 100 }),
    supports: choice(PLANAR_SUPPORTS, "pinned-roller", "Pinned at the left end; at the right end a roller (vertical only) or a second pin"),
    lineLoad: num({ default: 12, unit: "kN/m", description: "Downward line load on the top chord, applied at its nodes by tributary length", min: 0 }),
    ...commonFields,
  })
  .strict();

export type PlanarParams = z.infer<typeof planarParameters>;

export function planarTruss(p: PlanarParams & CommonParams) {
  const n = p.panels;
  const warren = p.pattern === "warren" || p.pattern === "warren-verticals";
  const refusals: { path: string; message: string }[] = [];
  if (p.chord === "flat" && p.depth <= 0) refusals.push({ path: "depth", message: "a flat-chord truss needs a depth greater than 0 m" });
  if (p.chord === "duo-pitch" && !warren && n % 2 !== 0) refusals.push({ path: "panels", message: "a duo-pitch Pratt or Howe truss needs an even number of panels (a node at the ridge)" });
  if (!warren && p.depth <= 0 && n < 3) refusals.push({ path: "panels", message: "a triangular Pratt or Howe truss needs at least 3 panels" });
  if (refusals.length) return { ok: false as const, errors: refusals };

  const L = p.span * M_TO_MM;
  const d0 = p.depth * M_TO_MM;
  const d1 = p.chord === "flat" ? d0 : p.ridgeDepth * M_TO_MM;
  const depthAt = (x: number) => (p.chord === "flat" ? d0 : p.chord === "mono-pitch" ? d0 + ((d1 - d0) * x) / L : d0 + ((d1 - d0) * (1 - Math.abs(2 * x - L) / L)));
  const a = L / n;
  const b = new ModelBuilder(p.area);
  const bottom = (i: number) => b.node(`B${i}`, i * a, 0);
  for (let i = 0; i <= n; i++) bottom(i);
  for (let i = 0; i < n; i++) b.member(`b${i + 1}`, `B${i}`, `B${i + 1}`, "bottom-chord");

  const top: string[] = [];
  if (!warren) {
    // top node above every bottom node; where the depth is 0 it is the bottom node itself
    for (let i = 0; i <= n; i++) top.push(depthAt(i * a) > 1e-9 ? b.node(`T${i}`, i * a, depthAt(i * a)) : `B${i}`);
    for (let i = 0; i < n; i++) b.member(`t${i + 1}`, top[i]!, top[i + 1]!, "top-chord");
    for (let i = 0; i <= n; i++) if (top[i] !== `B${i}`) b.member(`v${i}`, `B${i}`, top[i]!, "verticals");
    for (let i = 0; i < n; i++) {
      const towardsMiddle = i + 0.5 < n / 2; // the panel lies in the left half
      const pratt = p.pattern === "pratt";
      // Pratt falls towards mid-span: from the top node nearer the support to the bottom node nearer the middle
      // an end panel of a triangular truss (depth 0 at the support) is a triangle already
      if (top[i] === `B${i}` || top[i + 1] === `B${i + 1}`) continue;
      const [s, e] = pratt === towardsMiddle ? [top[i]!, `B${i + 1}`] : [`B${i}`, top[i + 1]!];
      b.member(`d${i + 1}`, s, e, "diagonals");
    }
  } else {
    for (let i = 0; i < n; i++) top.push(b.node(`T${i}`, (i + 0.5) * a, depthAt((i + 0.5) * a)));
    for (let i = 0; i + 1 < n; i++) b.member(`t${i + 1}`, top[i]!, top[i + 1]!, "top-chord");
    for (let i = 0; i < n; i++) {
      b.member(`d${2 * i + 1}`, `B${i}`, top[i]!, "diagonals");
      b.member(`d${2 * i + 2}`, top[i]!, `B${i + 1}`, "diagonals");
    }
    if (p.pattern === "warren-verticals") {
      // a bottom node under each top node splits its bottom panel in two
      const splits = b.members.filter((m) => m.group === "bottom-chord");
      for (let i = 0; i < n; i++) {
        const mid = b.node(`M${i}`, (i + 0.5) * a, 0);
        const chord = splits[i]!;
        chord.end = mid;
        b.member(`${chord.id}b`, mid, `B${i + 1}`, "bottom-chord");
        chord.id = `${chord.id}a`;
        b.member(`v${i + 1}`, mid, top[i]!, "verticals");
      }
    }
  }

  b.fix("B0", ["x", "y"]);
  b.fix(`B${n}`, p.supports === "pinned-pinned" ? ["x", "y"] : ["y"]);

  const loaded = [...new Set(top)];
  const xs = loaded.map((id) => b.nodes.find((q) => q.id === id)!.x);
  const shares = tributaryLengths(xs, 0, L);
  if (p.lineLoad > 0) loaded.forEach((id, k) => b.load(id, { fy: -(p.lineLoad * KN_TO_N * shares[k]!) / M_TO_MM }));

  const words = { pratt: "Pratt", howe: "Howe", warren: "Warren", "warren-verticals": "Warren with verticals" }[p.pattern];
  const chordWords = { flat: "flat", "duo-pitch": "duo-pitch", "mono-pitch": "mono-pitch" }[p.chord];
  return {
    ok: true as const,
    model: assemble(b, p, {
      name: `${words} truss, ${fmt(p.span)} m span, ${n} panels`,
      description: `${words} truss with ${chordWords} top chord: span ${fmt(p.span)} m, ${n} panels, depth ${fmt(p.depth)} m${p.chord === "flat" ? "" : ` rising to ${fmt(p.ridgeDepth)} m`}, ${p.supports} supports, ${fmt(p.lineLoad)} kN/m on the top chord. Generated by the Strutwise workbench.`,
      dimension: 2,
      loadCase: { id: "LC1", name: `Line load ${fmt(p.lineLoad)} kN/m on the top chord` },
      groups: ["top-chord", "bottom-chord", "diagonals", "verticals"],
      deflection: { node: "*", axis: "y", limit: round(L / p.deflectionRatio) },
    }),
  };
}

export const fmt = (v: number) => String(Math.round(v * 1000) / 1000);
export const round = (v: number) => Math.round(v * 1e6) / 1e6;
