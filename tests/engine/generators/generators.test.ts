// The generators against closed forms: member and node counts (a statically determinate plane
// truss has m = 2j - r, Maxwell's counting rule), geometry (widths, spans, depths), member
// forces of a determinate Pratt girder by the method of sections, total loads equal to the
// load intensity times its length or area, and for every kind and option: the model passes
// the upload gate (stable), and its analysis is in equilibrium (reactions balance the loads).
import { describe, expect, it } from "vitest";
import { analyseModel } from "~/engine/design";
import { generateModel, GENERATORS, parameterSchema } from "~/engine/generators";
import { parseModel, type TrussModel, type TrussModelInput } from "~/engine/truss";

function build(kind: string, params: Record<string, unknown>): TrussModel {
  const r = generateModel(kind, params);
  if (!r || !r.ok) throw new Error(`refused: ${JSON.stringify(r && !r.ok ? r.errors : kind)}`);
  const parsed = parseModel(r.model);
  if (!parsed.ok) throw new Error(`the gate refused the generated model: ${JSON.stringify(parsed.errors.slice(0, 3))}`);
  return parsed.model;
}

const byId = <T extends { id: string }>(list: T[]) => new Map(list.map((x) => [x.id, x]));
const dist = (a: { x: number; y: number; z?: number }, b: { x: number; y: number; z?: number }) => Math.hypot(a.x - b.x, a.y - b.y, (a.z ?? 0) - (b.z ?? 0));
const totalLoad = (m: TrussModelInput | TrussModel, axis: "fx" | "fy" | "fz") => m.loadCases[0]!.loads.reduce((s, l) => s + (l[axis] ?? 0), 0);

describe("planar trusses: counts by Maxwell's rule m + r = 2j (determinate, pinned + roller: r = 3)", () => {
  for (const n of [2, 4, 7, 12]) {
    it(`Pratt and Howe, flat, ${n} panels: 2(n+1) nodes, 4n+1 members`, () => {
      for (const pattern of ["pratt", "howe"]) {
        const m = build("planar-truss", { pattern, panels: n });
        expect(m.nodes.length).toBe(2 * (n + 1));
        expect(m.members.length).toBe(4 * n + 1);
        expect(m.members.length + 3).toBe(2 * m.nodes.length);
      }
    });
    it(`Warren, ${n} panels: 2n+1 nodes and 4n-1 members; with verticals 3n+1 and 6n-1`, () => {
      const w = build("planar-truss", { pattern: "warren", panels: n });
      expect([w.nodes.length, w.members.length]).toEqual([2 * n + 1, 4 * n - 1]);
      const wv = build("planar-truss", { pattern: "warren-verticals", panels: n });
      expect([wv.nodes.length, wv.members.length]).toEqual([3 * n + 1, 6 * n - 1]);
    });
  }
  it("a triangular (duo-pitch, depth 0 at the supports) Pratt of n panels: 2n nodes and 4n-3 members", () => {
    for (const n of [4, 6, 10]) {
      const m = build("planar-truss", { pattern: "pratt", chord: "duo-pitch", depth: 0, ridgeDepth: 3, panels: n });
      expect([m.nodes.length, m.members.length]).toEqual([2 * n, 4 * n - 3]);
    }
  });
  it("geometry: panel points at i L / n, depth at the supports, the ridge at mid-span, mono-pitch rising linearly", () => {
    const duo = byId(build("planar-truss", { chord: "duo-pitch", span: 30, panels: 10, depth: 1.5, ridgeDepth: 4 }).nodes);
    expect(duo.get("B3")!.x).toBeCloseTo(9000, 9);
    expect(duo.get("T0")!.y).toBeCloseTo(1500, 9);
    expect(duo.get("T5")!.y).toBeCloseTo(4000, 9);
    expect(duo.get("T2")!.y).toBeCloseTo(1500 + (2500 * 2) / 5, 9);
    const mono = byId(build("planar-truss", { chord: "mono-pitch", span: 20, panels: 4, depth: 1, ridgeDepth: 3 }).nodes);
    expect(mono.get("T4")!.y).toBeCloseTo(3000, 9);
    expect(mono.get("T1")!.y).toBeCloseTo(1500, 9);
  });
  it("the total load is the line load times the span, and the deflection limit is span / 250 by default (common practice)", () => {
    const m = build("planar-truss", { pattern: "warren", span: 18, panels: 6, lineLoad: 7.5 });
    expect(totalLoad(m, "fy")).toBeCloseTo(-7.5 * 18 * 1000, 6); // kN/m x m -> N
    expect(m.design!.constraints!.displacement).toEqual([{ node: "*", axis: "y", limit: 18000 / 250 }]);
    expect(m.design!.groups!.map((g) => g.id).sort()).toEqual(["bottom-chord", "diagonals", "top-chord"]);
  });
});

describe("a determinate Pratt girder by the method of sections", () => {
  // Flat Pratt, pinned + roller, n = 8 panels of a = 3 m, depth h = 2.4 m, q = 12 kN/m on the
  // top chord: interior top nodes carry q a, the end ones q a / 2 (straight into the supports).
  // Method of sections (any statics text): cut panel i (x_i to x_i+1) in the left half;
  //   bottom chord: moments about T_i          -> F = M(x_i) / h        (tension)
  //   top chord:    moments about B_i+1        -> F = -M(x_i+1) / h     (compression)
  //   diagonal T_i-B_i+1: vertical equilibrium -> F = V / sin(theta)    (tension)
  // with the beam's M(x) = q x (L - x) / 2 at the panel points and V = q (L/2 - (i + 1/2) a).
  const n = 8;
  const a = 3000;
  const h = 2400;
  const L = n * a;
  const q = 12; // N/mm
  const m = build("planar-truss", { pattern: "pratt", span: L / 1000, panels: n, depth: h / 1000, lineLoad: 12, design: false });
  const result = analyseModel(m);
  const force = new Map(result.members.map((x) => [x.id, x.force.LC1!]));
  const M = (x: number) => (q * x * (L - x)) / 2;
  const sin = h / Math.hypot(a, h);
  it("gives the chord and diagonal forces of every left-half panel", () => {
    for (let i = 0; i < n / 2; i++) {
      expect(force.get(`b${i + 1}`)).toBeCloseTo(M(i * a) / h, 6);
      expect(force.get(`t${i + 1}`)).toBeCloseTo(-M((i + 1) * a) / h, 6);
      expect(force.get(`d${i + 1}`)).toBeCloseTo((q * (L / 2 - (i + 0.5) * a)) / sin, 6);
    }
  });
  it("and the verticals carry the shear of the panel beside them (compression, joint equilibrium at the bottom nodes)", () => {
    // at B_i (left half, nothing loads it): the vertical balances the vertical component of
    // the diagonal T_i-1 - B_i, which is the shear of panel i-1
    for (let i = 1; i < n / 2; i++) expect(force.get(`v${i}`)).toBeCloseTo(-(q * (L / 2 - (i - 0.5) * a)), 6);
    // at T_0: its half panel load plus the first diagonal's pull: the whole reaction q L / 2
    expect(force.get("v0")).toBeCloseTo(-(q * L) / 2, 6);
  });
  it("reactions are qL/2 at each support", () => {
    for (const r of result.reactions) expect(r.values.LC1![1]).toBeCloseTo((q * L) / 2, 6);
  });
});

describe("lattice towers", () => {
  it("legs x (panels + 1) nodes; per panel and face one horizontal and one (single) or two (X) diagonals; widths at base and top", () => {
    for (const legs of [3, 4] as const) {
      const panels = 6;
      const single = build("lattice-tower", { legs, panels, bracing: "single", planBracingEvery: 0 });
      expect(single.nodes.length).toBe(legs * (panels + 1));
      const plan = legs === 4 ? 1 : 0; // the top level's plan diagonal
      expect(single.members.length).toBe(3 * legs * panels + plan);
      const x = build("lattice-tower", { legs, panels, bracing: "x", planBracingEvery: 2 });
      const planEvery = legs === 4 ? Math.floor((panels - 1) / 2) + 1 : 0;
      expect(x.members.length).toBe(4 * legs * panels + planEvery);
      const nodes = byId(x.nodes);
      expect(dist(nodes.get("L0_0")!, nodes.get("L0_1")!)).toBeCloseTo(4000, 6);
      expect(dist(nodes.get(`L${panels}_0`)!, nodes.get(`L${panels}_1`)!)).toBeCloseTo(1500, 6);
      expect(nodes.get(`L${panels}_2`)!.z).toBeCloseTo(30000, 6);
    }
  });
  it("K bracing: one middle node per face and panel, two half horizontals, two diagonals and the plan ties", () => {
    const k = build("lattice-tower", { legs: 3, panels: 4, bracing: "k", planBracingEvery: 0 });
    expect(k.nodes.length).toBe(3 * 5 + 3 * 4);
    expect(k.members.length).toBe(4 * 3 + 3 * 4 * 4 + 3 * 4); // legs + (2 half horizontals + 2 diagonals) per face + ring
  });
});

describe("space grids", () => {
  it("offset: (nx+1)(ny+1) + nx ny nodes; top, bottom and diagonal members by their closed forms; load = q Lx Ly", () => {
    for (const [nx, ny] of [[1, 1], [4, 3], [10, 7]] as const) {
      const m = build("space-grid", { layout: "offset", modulesX: nx, modulesY: ny, supports: "edges", moduleX: 2.5, moduleY: 3, areaLoad: 2 });
      expect(m.nodes.length).toBe((nx + 1) * (ny + 1) + nx * ny);
      const top = nx * (ny + 1) + ny * (nx + 1);
      const bottom = (nx - 1) * ny + nx * (ny - 1);
      expect(m.members.length).toBe(top + bottom + 4 * nx * ny);
      // the supported edge nodes take their share directly: only interior top nodes are loaded
      const interior = (nx - 1) * (ny - 1) * 2500 * 3000 * 2e-3;
      expect(totalLoad(m, "fz")).toBeCloseTo(-interior, 6);
    }
  });
  it("corner supports carry the whole area load", () => {
    const m = build("space-grid", { layout: "offset", modulesX: 6, modulesY: 4, supports: "corners", moduleX: 3, moduleY: 3, areaLoad: 1.5 });
    const corners = 4 * 1.5 * 1.5 * 1.5e-3 * 1e6; // each corner node's quarter module, N
    expect(totalLoad(m, "fz")).toBeCloseTo(-(18000 * 12000 * 1.5e-3 - corners), 6);
  });
});

// every kind with every option value: stable, and its analysis in equilibrium
const variants: [string, Record<string, unknown>][] = [];
for (const pattern of ["pratt", "howe", "warren", "warren-verticals"])
  for (const chord of ["flat", "duo-pitch", "mono-pitch"])
    for (const depth of chord === "flat" ? [2] : [2, 0]) for (const supports of ["pinned-roller", "pinned-pinned"]) variants.push(["planar-truss", { pattern, chord, depth, supports, panels: 6 }]);
for (const legs of [3, 4]) for (const bracing of ["single", "x", "k"]) for (const planBracingEvery of [0, 1, 3]) variants.push(["lattice-tower", { legs, bracing, planBracingEvery, panels: 5 }]);
for (const layout of ["offset", "aligned"]) for (const supports of ["edges", "corners"]) variants.push(["space-grid", { layout, supports, modulesX: 5, modulesY: 3 }]);

describe("every generator variant passes the upload gate and its analysis is in equilibrium", () => {
  it.each(variants.map(([k, p]) => [`${k} ${JSON.stringify(p)}`, k, p] as const))("%s", (_label, kind, params) => {
    const m = build(kind, params);
    const r = analyseModel(m);
    for (let c = 0; c < 3; c++) {
      const axis = (["fx", "fy", "fz"] as const)[c]!;
      const reaction = r.reactions.reduce((s, x) => s + x.values.LC1![c]!, 0);
      const load = totalLoad(m, axis);
      expect(Math.abs(reaction + load)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(load)) + 1e-6);
    }
    // moment of loads and reactions about the origin balances too (z component, every kind)
    const nodes = byId(m.nodes);
    let mz = 0;
    for (const l of m.loadCases[0]!.loads) mz += nodes.get(l.node)!.x * (l.fy ?? 0) - nodes.get(l.node)!.y * (l.fx ?? 0);
    for (const x of r.reactions) mz += nodes.get(x.node)!.x * x.values.LC1![1]! - nodes.get(x.node)!.y * x.values.LC1![0]!;
    expect(Math.abs(mz)).toBeLessThanOrEqual(1e-6 * Math.max(1, ...m.nodes.map((q) => Math.hypot(q.x, q.y))) * Math.max(1, Math.abs(totalLoad(m, "fy")) + Math.abs(totalLoad(m, "fx"))));
  });
});

describe("parameters", () => {
  it("every generator publishes a JSON Schema with a default for every field", () => {
    for (const g of GENERATORS) {
      const schema = parameterSchema(g) as { properties: Record<string, { default?: unknown }> };
      for (const [key, field] of Object.entries(schema.properties)) if (key !== "name") expect(field.default, `${g.kind}.${key}`).toBeDefined();
    }
  });
  it("names each bad parameter, unknown ones included", () => {
    const r = generateModel("planar-truss", { span: -3, panels: 2.5, pattern: "fink", spn: 3 });
    expect(r && !r.ok && r.errors.map((e) => e.path).sort()).toEqual(["panels", "pattern", "span", "spn"]);
    const t = generateModel("lattice-tower", { legs: 5 });
    expect(t && !t.ok && t.errors[0]!.path).toBe("legs");
    expect(generateModel("no-such-kind", {})).toBeNull();
  });
});
