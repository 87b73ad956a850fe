// analyseModel: the model as given (its own areas and coordinates, no design block needed)
// in, a result JSON of docs/model-format.md out with status "analysed". The same member, node and
// reaction fields as an optimized result, so the job page, the report and the review read it
// alike. Utilization is the worst of stress (against the material allowables) and, when the
// model's design block asks for it, the Euler buckling check, over the strength responses
// (the strength combinations, else every load case); forces, stresses, displacements and
// reactions over every load case and combination.
import { analyze, buildStructure, type TrussModel } from "../truss";
import { ENGINE_VERSION, SOLVER_NAME } from "./result";
import type { ResultMember, ResultNode, ResultReaction, TrussResult } from "./result-types";
import { bucklingModel, displacementLimitMap, displacementSpecs, responsesFor } from "./problem";
import { deflectionSummary } from "./deflection-summary";
import { eulerStress } from "./buckling";
import { memberForceMap, memberStressMap, nodeDisplacementMap, reactionBalance, reactions as supportReactions, resultCombinations } from "./responses";
import { maxOf } from "../util/extent";

export type { ResultReaction } from "./result-types";

export type AnalysisResult = TrussResult & { reactions: ResultReaction[] };

export function analyseModel(model: TrussModel): AnalysisResult {
  const t0 = Date.now();
  const s = buildStructure(model);
  const a = analyze(s); // a mechanism throws MechanismError naming the node and direction
  const buckling = model.design?.constraints?.buckling;
  const objectiveKind = model.design?.objective ?? "mass";
  const objective = objectiveKind === "mass" ? a.mass : a.compliance.reduce((x, y) => x + y, 0);

  const sections = new Map((model.sections ?? []).map((sec) => [sec.id, sec]));
  // I of a member: its catalogue section's, else the fit over the model's sections, else
  // sectionRatio * A^2; none of these: no buckling check
  const bm = buckling && (buckling.sectionRatio !== undefined || sections.size > 0) ? bucklingModel(model, buckling) : null;
  if (bm) {
    const memberI = new Float64Array(model.members.length);
    model.members.forEach((m, e) => {
      const sec = m.section === undefined ? undefined : sections.get(m.section);
      memberI[e] = sec ? sec.I : bm.a * a.areas[e] ** bm.b;
    });
    bm.memberI = memberI;
  }
  const strength = responsesFor(s, "strength");
  const members: ResultMember[] = model.members.map((m, e) => {
    let utilization = 0;
    let governing = "";
    let governingCase = "";
    for (const l of strength) {
      const lc = s.responseIds[l];
      const sigma = a.stresses[l][e];
      const allow = sigma >= 0 ? s.allowTension[e] : s.allowCompression[e];
      const r = Number.isFinite(allow) ? Math.abs(sigma) / allow : 0;
      if (r > utilization) [utilization, governing, governingCase] = [r, `stress:${lc}`, lc];
      if (bm && sigma < 0) {
        const ratio = -sigma / eulerStress(bm, e, s.E[e], a.areas[e], a.lengths[e]);
        if (ratio > utilization) [utilization, governing, governingCase] = [ratio, `buckling:${lc}`, lc];
      }
    }
    return {
      id: m.id, start: m.start, end: m.end, ...(m.group ? { group: m.group } : {}), ...(m.section ? { section: m.section } : {}),
      area: a.areas[e], length: a.lengths[e], force: memberForceMap(s, a, e), stress: memberStressMap(s, a, e), utilization,
      ...(governing ? { governing, governingCase } : {}), ...(bm ? { bucklingFactor: bm.k[e] } : {}),
    };
  });

  const nodes: ResultNode[] = model.nodes.map((n, i) => ({
    id: n.id, x: s.coords[3 * i], y: s.coords[3 * i + 1], z: s.coords[3 * i + 2],
    fixed: (n.fixed ?? []).slice(),
    displacement: nodeDisplacementMap(s, a, i),
  }));
  const reactions: ResultReaction[] = supportReactions(s, a);
  const maxUtilization = Math.max(0, maxOf(members.map((m) => m.utilization)));

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
    loadCases: model.loadCases.map((lc) => ({ id: lc.id, ...(lc.name ? { name: lc.name } : {}), ...(lc.selfWeight ? { selfWeight: lc.selfWeight } : {}) })),
    ...(s.combinations.length ? { combinations: resultCombinations(s) } : {}),
    reactionBalance: reactionBalance(s, a),
    // against the model's deflection limits, when its design block has any
    deflections: deflectionSummary(s, model.dimension, a.displacements, displacementLimitMap(displacementSpecs(model), s)),
    variables: [],
    activeConstraints: [],
    history: [],
    solver: { name: SOLVER_NAME, version: ENGINE_VERSION, elapsedMs: Date.now() - t0 },
  };
}
