// A simply supported Warren truss (no verticals) of n panels, loaded at the top-chord nodes,
// sized by its exact minimum-mass design under stress limits. The truss is statically
// determinate, so member forces do not depend on the areas and the optimum is the fully
// stressed design A = max |F| / allowable over each area variable's members and load cases,
// held at the lower bound where that is larger (common practice: fully stressed design is
// optimal for a determinate truss under stress limits alone).
//   Forces by the method of sections (common practice): chord force = M / h about the
//   opposite node, diagonal force = -/+ V / sin(theta) from the shear of the panel.
//   Displacements by joint-by-joint compatibility with a rigid-rotation correction for the
//   roller (the Williot-Mohr construction, common practice), from the elongations F L / (E A).
// The iteration history is synthetic (a geometric decay): the report only plots it.
import type { TrussResult } from "~/engine/design/result-types";
import type { ModelFile, ReportData, ReportReview } from "~/lib/report/report-data";

export interface WarrenOptions {
  panels: number;
  panel?: number; // mm
  height?: number; // mm
  loadCases?: { id: string; name: string; load: (topIndex: number, n: number) => number }[]; // fy per top node, N
  /** factor on the default loads; a long truss needs a small one to stay within the area bounds */
  loadScale?: number;
}

export interface WarrenFixture {
  model: ModelFile & { format: "strutwise.truss"; version: 1 };
  result: TrussResult;
  finalMass: number;
  initialMass: number;
  governing: { member: string; loadCase: string; force: number }; // the largest force of all
}

const E = 210000; // N/mm², structural steel (common practice)
const RHO = 7.85e-9; // t/mm³ (common practice)
const ALLOW_T = 235; // N/mm²
const ALLOW_C = 160; // N/mm², lower in compression
const A_MIN = 150;
const A_MAX = 40000;
const A_START = 2000;

export function warrenFixture(opts: WarrenOptions): WarrenFixture {
  const n = opts.panels;
  const a = opts.panel ?? 2500;
  const h = opts.height ?? 2000;
  const span = n * a;
  const k = opts.loadScale ?? 1;
  const lcs = opts.loadCases ?? [
    { id: "LC1", name: "Roof dead load and snow", load: () => -40000 * k },
    { id: "LC2", name: "Drifted snow on the left half", load: (i: number, nn: number) => (i <= Math.ceil(nn / 2) ? -60000 : -10000) * k },
  ];

  // nodes: L0..Ln on the bottom chord, U1..Un on the top chord at the panel middles
  type Node = { id: string; x: number; y: number; fixed?: string[] };
  const nodes: Node[] = [];
  for (let i = 0; i <= n; i++) nodes.push({ id: `L${i}`, x: i * a, y: 0, ...(i === 0 ? { fixed: ["x", "y"] } : i === n ? { fixed: ["y"] } : {}) });
  for (let i = 1; i <= n; i++) nodes.push({ id: `U${i}`, x: (i - 0.5) * a, y: h });
  const nodeById = new Map(nodes.map((nd) => [nd.id, nd]));

  type Member = { id: string; start: string; end: string; material: string; area: number; group?: string };
  const members: Member[] = [];
  for (let i = 0; i < n; i++) members.push({ id: `BC${i + 1}`, start: `L${i}`, end: `L${i + 1}`, material: "S235", area: A_START, group: "bottom-chord" });
  for (let i = 1; i < n; i++) members.push({ id: `TC${i}`, start: `U${i}`, end: `U${i + 1}`, material: "S235", area: A_START, group: "top-chord" });
  for (let i = 1; i <= n; i++) {
    members.push({ id: `D${2 * i - 1}`, start: `L${i - 1}`, end: `U${i}`, material: "S235", area: A_START });
    members.push({ id: `D${2 * i}`, start: `U${i}`, end: `L${i}`, material: "S235", area: A_START });
  }
  const len = (m: Member) => {
    const p = nodeById.get(m.start)!;
    const q = nodeById.get(m.end)!;
    return Math.hypot(q.x - p.x, q.y - p.y);
  };

  // statics per load case, method of sections
  const d = Math.hypot(a / 2, h);
  const sin = h / d;
  const forces = new Map<string, Record<string, number>>(members.map((m) => [m.id, {}]));
  for (const lc of lcs) {
    const P = Array.from({ length: n + 1 }, (_, i) => (i === 0 ? 0 : -lc.load(i, n))); // downward positive
    const xs = (k: number) => (k - 0.5) * a;
    let RA = 0;
    for (let k = 1; k <= n; k++) RA += (P[k]! * (span - xs(k))) / span;
    const M = (x: number) => {
      let m = RA * x;
      for (let k = 1; k <= n && xs(k) < x; k++) m -= P[k]! * (x - xs(k));
      return m;
    };
    const V = (x: number) => {
      let v = RA;
      for (let k = 1; k <= n && xs(k) < x; k++) v -= P[k]!;
      return v;
    };
    for (let i = 0; i < n; i++) forces.get(`BC${i + 1}`)![lc.id] = M((i + 0.5) * a) / h;
    for (let i = 1; i < n; i++) forces.get(`TC${i}`)![lc.id] = -M(i * a) / h;
    for (let i = 1; i <= n; i++) {
      forces.get(`D${2 * i - 1}`)![lc.id] = -V((i - 0.75) * a) / sin;
      forces.get(`D${2 * i}`)![lc.id] = V((i - 0.25) * a) / sin;
    }
  }

  // fully stressed areas per variable (groups share one)
  const need = (f: number) => (f >= 0 ? f / ALLOW_T : -f / ALLOW_C);
  const varOf = (m: Member) => m.group ?? m.id;
  const area = new Map<string, number>();
  const govern = new Map<string, { member: string; lc: string; force: number; need: number }>();
  for (const m of members) {
    for (const lc of lcs) {
      const f = forces.get(m.id)![lc.id]!;
      const g = govern.get(varOf(m));
      if (!g || need(f) > g.need) govern.set(varOf(m), { member: m.id, lc: lc.id, force: f, need: need(f) });
    }
  }
  for (const [v, g] of govern) {
    // beyond the upper bound no design meets the limits; a fixture must not pretend otherwise
    if (g.need > A_MAX) throw new Error(`warrenFixture: ${v} needs ${g.need.toFixed(0)} mm², above the ${A_MAX} mm² bound; lower loadScale`);
    area.set(v, Math.max(A_MIN, g.need));
  }

  const loadsOf = (lcId: string) => {
    const lc = lcs.find((l) => l.id === lcId)!;
    return Array.from({ length: n }, (_, k) => ({ node: `U${k + 1}`, fx: 0, fy: lc.load(k + 1, n) }));
  };

  // displacements: joints in the order L0, L1, U1, U2, L2, U3, L3, ... each fixed by two known ends
  const ids = nodes.map((nd) => nd.id);
  const disp: Record<string, Map<string, [number, number]>> = {};
  for (const lc of lcs) {
    const u = new Map<string, [number, number]>();
    const elong = (m: Member) => (forces.get(m.id)![lc.id]! * len(m)) / (E * area.get(varOf(m))!);
    const byEnds = new Map(members.map((m) => [`${m.start}|${m.end}`, m]));
    const member = (p: string, q: string) => byEnds.get(`${p}|${q}`) ?? byEnds.get(`${q}|${p}`)!;
    const place = (id: string, p: string, q: string) => {
      // (u_id - u_p)·e_p = δ_p and (u_id - u_q)·e_q = δ_q, e = unit vector from the known node
      const rows = [p, q].map((k) => {
        const m = member(id, k);
        const A = nodeById.get(k)!;
        const B = nodeById.get(id)!;
        const L = Math.hypot(B.x - A.x, B.y - A.y);
        const e = [(B.x - A.x) / L, (B.y - A.y) / L] as const;
        const uk = u.get(k)!;
        return { e, rhs: elong(m) + e[0] * uk[0] + e[1] * uk[1] };
      });
      const [r1, r2] = rows as [(typeof rows)[0], (typeof rows)[0]];
      const det = r1.e[0] * r2.e[1] - r1.e[1] * r2.e[0];
      u.set(id, [(r1.rhs * r2.e[1] - r1.e[1] * r2.rhs) / det, (r1.e[0] * r2.rhs - r1.rhs * r2.e[0]) / det]);
    };
    u.set("L0", [0, 0]);
    u.set("L1", [elong(member("L0", "L1")), 0]); // provisional: L1 kept level, corrected below
    place("U1", "L0", "L1");
    for (let i = 2; i <= n; i++) {
      place(`U${i}`, `U${i - 1}`, `L${i - 1}`);
      place(`L${i}`, `L${i - 1}`, `U${i}`);
    }
    // rigid rotation about L0 that brings the roller L(n) back onto its support
    const omega = -u.get(`L${n}`)![1] / span;
    for (const id of ids) {
      const nd = nodeById.get(id)!;
      const [ux, uy] = u.get(id)!;
      u.set(id, [ux - omega * nd.y, uy + omega * nd.x]);
    }
    disp[lc.id] = u;
  }

  // equilibrium at every joint from the member forces: an independent check of the statics
  let resid = 0;
  let fmax = 0;
  for (const lc of lcs) {
    const sum = new Map(ids.map((id) => [id, [0, 0]]));
    for (const l of loadsOf(lc.id)) {
      sum.get(l.node)![1] += l.fy;
      fmax = Math.max(fmax, Math.abs(l.fy));
    }
    for (const m of members) {
      const p = nodeById.get(m.start)!;
      const q = nodeById.get(m.end)!;
      const L = len(m);
      const f = forces.get(m.id)![lc.id]!;
      const e = [(q.x - p.x) / L, (q.y - p.y) / L];
      sum.get(m.start)![0] += f * e[0]!;
      sum.get(m.start)![1] += f * e[1]!;
      sum.get(m.end)![0] -= f * e[0]!;
      sum.get(m.end)![1] -= f * e[1]!;
    }
    for (const nd of nodes) {
      const s = sum.get(nd.id)!;
      if (!nd.fixed?.includes("x")) resid = Math.max(resid, Math.abs(s[0]!));
      if (!nd.fixed?.includes("y")) resid = Math.max(resid, Math.abs(s[1]!));
    }
  }

  const massOf = (A: (m: Member) => number) => members.reduce((s, m) => s + RHO * A(m) * len(m), 0);
  const initialMass = massOf(() => A_START);
  const finalMass = massOf((m) => area.get(varOf(m))!);
  const volume = members.reduce((s, m) => s + area.get(varOf(m))! * len(m), 0);

  const resultMembers = members.map((m) => {
    const A = area.get(varOf(m))!;
    const f = forces.get(m.id)!;
    const stress: Record<string, number> = {};
    let util = 0;
    let gov = "";
    for (const lc of lcs) {
      stress[lc.id] = f[lc.id]! / A;
      const r = need(f[lc.id]!) / A;
      if (r > util) [util, gov] = [r, `stress:${lc.id}`];
    }
    return { id: m.id, start: m.start, end: m.end, group: m.group, area: A, length: len(m), force: { ...f }, stress, utilization: util, governing: gov };
  });

  const varLength = new Map<string, number>();
  for (const m of members) varLength.set(varOf(m), (varLength.get(varOf(m)) ?? 0) + len(m));
  const active: TrussResult["activeConstraints"] = [];
  const prices: NonNullable<TrussResult["shadowPrices"]> = [];
  for (const [v, g] of govern) {
    const L = varLength.get(v)!;
    if (area.get(v)! > A_MIN) {
      const allow = g.force >= 0 ? ALLOW_T : ALLOW_C;
      const mult = (RHO * L * Math.abs(g.force)) / (allow * allow); // -d mass / d allowable
      active.push({ id: `stress:${g.member}:${g.lc}`, multiplier: mult });
      prices.push({
        constraint: `stress:${g.member}:${g.lc}`,
        multiplier: mult,
        unit: "t per N/mm²",
        sentence: `Allowing 1 N/mm² more ${g.force >= 0 ? "tension" : "compression"} stress in member ${g.member} under ${g.lc} would save about ${mult.toPrecision(3)} t of steel.`,
      });
    } else {
      active.push({ id: `area-min:${v}`, multiplier: RHO * L });
      prices.push({ constraint: `area-min:${v}`, multiplier: RHO * L, unit: "t per mm²", sentence: `Member ${v} sits at the smallest area allowed; each 1 mm² off that bound would save ${(RHO * L).toPrecision(3)} t.` });
    }
  }

  const iterations = 9;
  const history = Array.from({ length: iterations + 1 }, (_, k) => ({
    iteration: k,
    objective: finalMass + (initialMass - finalMass) * 0.45 ** k,
    maxViolation: k === iterations ? 0 : 0.3 * 0.35 ** k,
    kktResidual: 0.8 * 0.12 ** k,
  }));

  const checks = resultMembers.flatMap((m) =>
    lcs.map((lc) => {
      const s = m.stress[lc.id]!;
      const limit = s >= 0 ? ALLOW_T : ALLOW_C;
      return { id: `stress:${m.id}:${lc.id}`, kind: "stress" as const, value: s, limit, ratio: Math.abs(s) / limit, ok: Math.abs(s) / limit <= 1 + 1e-9 };
    }),
  );
  const worst = [...checks].sort((x, y) => y.ratio - x.ratio).slice(0, 8);
  const all = [...forces].flatMap(([id, f]) => lcs.map((lc) => ({ member: id, loadCase: lc.id, force: f[lc.id]! })));
  const biggest = all.reduce((b, x) => (Math.abs(x.force) > Math.abs(b.force) ? x : b));

  const model: WarrenFixture["model"] = {
    format: "strutwise.truss",
    version: 1,
    name: `Warren roof truss, ${n} panels`,
    description: `Roof truss of the Fenwick Lane depot extension, ${n} panels of ${a} mm, depth ${h} mm (invented scenario).`,
    units: { length: "mm", force: "N", mass: "t" },
    dimension: 2,
    materials: [{ id: "S235", E, density: RHO, allowableTension: ALLOW_T, allowableCompression: ALLOW_C }],
    nodes,
    members,
    loadCases: lcs.map((lc) => ({ id: lc.id, name: lc.name, loads: loadsOf(lc.id) })),
    design: {
      objective: "mass",
      formulation: "nested",
      areaBounds: { min: A_MIN, max: A_MAX },
      groups: [
        { id: "bottom-chord", min: A_MIN, max: A_MAX },
        { id: "top-chord", min: A_MIN, max: A_MAX },
      ],
      constraints: { stress: true },
      solver: { maxIterations: 200, tolerance: 1e-6 },
    },
  };

  const result: TrussResult = {
    format: "strutwise.result",
    version: 1,
    model: model.name!,
    units: { length: "mm", force: "N", mass: "t" },
    status: "optimal",
    message: `KKT residual ${history[iterations]!.kktResidual.toExponential(1)} below tolerance after ${iterations} iterations`,
    formulation: "nested",
    objective: { kind: "mass", initial: initialMass, final: finalMass },
    iterations,
    analyses: iterations + 3,
    kktResidual: history[iterations]!.kktResidual,
    maxViolation: 0,
    volume,
    mass: finalMass,
    members: resultMembers,
    nodes: nodes.map((nd) => ({
      id: nd.id,
      x: nd.x,
      y: nd.y,
      z: 0,
      fixed: nd.fixed,
      displacement: Object.fromEntries(lcs.map((lc) => [lc.id, [...disp[lc.id]!.get(nd.id)!, 0] as [number, number, number]])),
    })),
    loadCases: lcs.map((lc) => ({ id: lc.id, name: lc.name })),
    variables: [],
    activeConstraints: active,
    shadowPrices: prices,
    verification: {
      equilibriumResidual: resid / fmax,
      maxUtilization: Math.max(...resultMembers.map((m) => m.utilization)),
      allLimitsMet: checks.every((c) => c.ok),
      checked: checks.length,
      failures: checks.filter((c) => !c.ok),
      worst,
    },
    history,
    solver: { name: "strutwise-sqp", version: "0.1.0", elapsedMs: 412 },
  };
  return { model, result, finalMass, initialMass, governing: biggest };
}

export function reportDataFor(f: WarrenFixture, reviews: ReportReview[] = [], jobId = "job-7q2c9x"): ReportData {
  return {
    job: {
      id: jobId,
      status: "succeeded",
      options: {},
      createdAt: new Date("2026-11-30T09:00:00Z"),
      startedAt: new Date("2026-11-30T09:00:04Z"),
      finishedAt: new Date("2026-11-30T09:00:31Z"),
      submitter: "Ines Okafor <ines.okafor@brightspan.example>",
    },
    project: { code: "FLD-24", name: "Fenwick Lane depot extension", client: "Calder Vale Logistics" },
    model: {
      id: "mdl-1",
      name: f.model.name!,
      fileName: "fenwick-roof.truss.json",
      sha256: "9c1f0a6e4b7d2c3a8e5f6b1d0c9a7e2f4b6d8a0c1e3f5a7b9d2c4e6f8a0b1c3d",
      sizeBytes: 18234,
      uploadedAt: new Date("2026-11-30T08:55:00Z"),
      file: f.model,
    },
    result: f.result,
    reviews,
    generatedAt: new Date("2026-11-30T16:00:00Z"),
  };
}
