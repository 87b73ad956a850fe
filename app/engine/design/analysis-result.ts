// analyseModel: the model as given (its own areas and coordinates, no design block needed)
// in, a result JSON of truss-format.md out with status "analysed". The same member, node and
// reaction fields as an optimized result, so the job page, the report and the review read it
// alike. Utilization is the worst of stress (against the material allowables) and, when the
// model's design block asks for it, the Euler buckling check, over every load case.
import { analyze, buildStructure, type TrussModel } from "../truss";
import { ENGINE_VERSION, SOLVER_NAME } from "./result";
import type { ResultMember, ResultNode, TrussResult } from "./result-types";

export interface ResultReaction {
  node: string;
  /** per load case: the support's reaction [x, y, z] in model force units; 0 on free axes */
  values: Record<string, [number, number, number]>;
}

export type AnalysisResult = TrussResult & { reactions: ResultReaction[] };

export function analyseModel(model: TrussModel): AnalysisResult {
  const t0 = Date.now();
  const s = buildStructure(model);
  const a = analyze(s); // a mechanism throws MechanismError naming the node and direction
  const buckling = model.design?.constraints?.buckling;
  const objectiveKind = model.design?.objective ?? "mass";
  const objective = objectiveKind === "mass" ? a.mass : a.compliance.reduce((x, y) => x + y, 0);

  const sections = new Map((model.sections ?? []).map((sec) => [sec.id, sec]));
  // I of a member: its catalogue section's, else sectionRatio * A^2; neither: no buckling check
  const secondMoment = (e: number): number | null => {
    const sec = model.members[e].section === undefined ? undefined : sections.get(model.members[e].section!);
    if (sec) return sec.I;
    return buckling?.sectionRatio === undefined ? null : buckling.sectionRatio * a.areas[e] * a.areas[e];
  };
  const members: ResultMember[] = model.members.map((m, e) => {
    const I = buckling ? secondMoment(e) : null;
    const k = m.bucklingFactor ?? buckling?.effectiveLengthFactor ?? 1;
    const force: Record<string, number> = {};
    const stress: Record<string, number> = {};
    let utilization = 0;
    let governing = "";
    s.loadCaseIds.forEach((lc, l) => {
      const sigma = a.stresses[l][e];
      force[lc] = a.forces[l][e];
      stress[lc] = sigma;
      const allow = sigma >= 0 ? s.allowTension[e] : s.allowCompression[e];
      const r = Number.isFinite(allow) ? Math.abs(sigma) / allow : 0;
      if (r > utilization) [utilization, governing] = [r, `stress:${lc}`];
      if (I !== null && sigma < 0) {
        const kL = k * a.lengths[e];
        const sigmaE = (Math.PI * Math.PI * s.E[e] * I) / (kL * kL * a.areas[e]);
        if (-sigma / sigmaE > utilization) [utilization, governing] = [-sigma / sigmaE, `buckling:${lc}`];
      }
    });
    return {
      id: m.id, start: m.start, end: m.end, ...(m.group ? { group: m.group } : {}),
      area: a.areas[e], length: a.lengths[e], force, stress, utilization, ...(governing ? { governing } : {}),
    };
  });

  const triple = (v: Float64Array, i: number): [number, number, number] => [v[3 * i], v[3 * i + 1], v[3 * i + 2]];
  const nodes: ResultNode[] = model.nodes.map((n, i) => ({
    id: n.id, x: s.coords[3 * i], y: s.coords[3 * i + 1], z: s.coords[3 * i + 2],
    fixed: (n.fixed ?? []).slice(),
    displacement: Object.fromEntries(s.loadCaseIds.map((lc, l) => [lc, triple(a.displacements[l], i)])),
  }));
  const reactions: ResultReaction[] = [];
  model.nodes.forEach((n, i) => {
    if (!n.fixed?.length) return;
    reactions.push({ node: n.id, values: Object.fromEntries(s.loadCaseIds.map((lc, l) => [lc, triple(a.reactions[l], i)])) });
  });
  const maxUtilization = Math.max(0, ...members.map((m) => m.utilization));

  return {
    format: "strutwise.result",
    version: 1,
    model: model.name,
    units: { ...model.units },
    status: "analysed",
    message: `Analysed at the model's own areas: ${s.loadCaseIds.length} load case${s.loadCaseIds.length === 1 ? "" : "s"}, highest utilization ${(100 * maxUtilization).toFixed(1)}%, equilibrium residual ${a.equilibriumResidual.toExponential(1)}.`,
    objective: { kind: objectiveKind, initial: objective, final: objective },
    iterations: 0,
    analyses: 1,
    kktResidual: 0,
    maxViolation: 0,
    volume: a.volume,
    mass: a.mass,
    members,
    nodes,
    reactions,
    loadCases: model.loadCases.map((lc) => ({ id: lc.id, ...(lc.name ? { name: lc.name } : {}) })),
    variables: [],
    activeConstraints: [],
    history: [],
    solver: { name: SOLVER_NAME, version: ENGINE_VERSION, elapsedMs: Date.now() - t0 },
  };
}
