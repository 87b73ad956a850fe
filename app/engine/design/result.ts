// optimizeModel: a validated model in, the result JSON of docs/model-format.md out. The solver runs
// on one of the two formulations; everything reported about the final design (forces,
// stresses, displacements, utilization, limits met) comes from a fresh re-analysis.
import { buildStructure } from "../truss";
import { minimize, type SqpOptions, type SqpResult } from "../sqp";
import type { JobOptions } from "./options";
import type { DesignModel } from "./model-shape";
import type { TrussModel } from "../truss";
import type { JobSummary, ResultMember, ResultNode, TrussResult, SolverStatus } from "./result-types";
import { buildDesignProblem, designState, shapeValues, type DesignProblem } from "./problem";
import { nestedFormulation } from "./nested";
import { simultaneousFormulation } from "./simultaneous";
import { reanalyze, VERIFY_TOLERANCE } from "./verify";
import { activeConstraints, priceConstraints, shadowPrices } from "./shadow-prices";
import { memberForceMap, memberStressMap, nodeDisplacementMap, reactionBalance, reactions, resultCombinations } from "./responses";
import { maxOf } from "../util/extent";
import { criterionCosts } from "./criterion-costs";
import { deflectionSummary, problemDeflectionLimits } from "./deflection-summary";
import { constraintWords } from "./constraint-words";

const DESIGN_HINTS: Partial<Record<SolverStatus, string>> = {
  "not-converged":
    "Raise the iteration cap, start from areas closer to the expected sizes, or try the other formulation; the best design found is shown and re-checked below.",
  infeasible:
    "No design within the area bounds meets every limit: widen the area bounds (a larger maximum), relax the governing deflection or stress limit, or add members or supports.",
};

export const SOLVER_NAME = "strutwise-sqp";
export const ENGINE_VERSION = "1.0.0";

export interface DesignProgress {
  iteration: number;
  objective: number; // model units
  maxViolation: number;
  kktResidual: number;
}

export interface OptimizeOptions extends JobOptions {
  signal?: AbortSignal;
  /** asked between iterations: true stops the run and keeps its best design (a cancel) */
  stopRequested?: () => boolean;
  onProgress?: (p: DesignProgress) => void;
  timeLimitMs?: number;
  /** override the automatic choices (tests and benchmarks) */
  hessian?: "bfgs" | "lbfgs";
  screening?: number | null;
  /** simultaneous formulation: null-space steps (default above REDUCED_FROM variables) */
  reducedSpace?: boolean;
  /** the least-mass LP's design, per member (model units): one of the starts (multi-start.ts) */
  plasticStart?: ArrayLike<number>;
}

/**
 * Simultaneous formulation above this many variables: null-space steps over the design
 * variables (sqp/reduced-space.ts) instead of the full subproblem over areas and displacements.
 * Measured on ground structures: the full subproblem needs 3-10 times the iterations and its
 * dense work grows with the square of the displacement count (240 members: 42 s against 3.5 s).
 * Only on tiny models is it kept, where its quasi-Newton matrix also learns the
 * area-displacement coupling: on the ten-bar benchmark that keeps it on the nested path to
 * the 5060.8 lb optimum, while null-space steps end at the other local optimum near 5076.7 lb.
 */
const REDUCED_FROM = 50;
/** L-BFGS pairs kept: measured on ground structures, 5 pairs cost a third of 10 per iteration for the same iteration count */
const LBFGS_MEMORY = 5;
/** Above this many limits only the near-active ones enter each subproblem. */
const SCREEN_FROM = 200;
/** Scaled activity threshold of the screening: limits with g > -0.5 (half-used) enter. */
const SCREEN_THRESHOLD = 0.5;

export interface PreparedRun {
  design: DesignProblem;
  formulation: "nested" | "simultaneous";
  sqp: ReturnType<typeof nestedFormulation>["problem"];
  sqpOptions: SqpOptions;
  counters: { analyses: number; solves: number };
  objectiveScale: number;
}

/**
 * Builds the design problem and the solver problem without solving (benchmarks reuse it);
 * `start` replaces the model's starting design (scaled design vector, multi-start.ts).
 */
export function prepareRun(model: TrussModel | DesignModel, options: OptimizeOptions = {}, start?: Float64Array): PreparedRun {
  const structure = buildStructure(model as TrussModel);
  const built = buildDesignProblem(model, structure, options);
  const design = start ? { ...built, x0: start } : built;
  const f = design.formulation === "nested" ? nestedFormulation(design) : simultaneousFormulation(design);
  const n = f.problem.n;
  const objectiveScale = f.objectiveScale;
  const sqpOptions: SqpOptions = {
    maxIterations: design.maxIterations,
    tolerance: design.tolerance,
    hessian: options.hessian,
    memory: LBFGS_MEMORY,
    reducedSpace: options.reducedSpace ?? n > REDUCED_FROM,
    screening: options.screening === null ? undefined : (options.screening ?? (design.limits.length > SCREEN_FROM ? SCREEN_THRESHOLD : undefined)),
    signal: options.signal,
    stopRequested: options.stopRequested,
    timeLimitMs: options.timeLimitMs,
    onProgress: options.onProgress
      ? (pr) => options.onProgress!({ iteration: pr.iteration, objective: pr.f * objectiveScale, maxViolation: pr.maxViolation, kktResidual: pr.kktResidual })
      : undefined,
  };
  return { design, formulation: design.formulation, sqp: f.problem, sqpOptions, counters: f.counters, objectiveScale };
}

/** Continuous sizing (and shape); optimize.ts sends catalogue sizing elsewhere. */
export function optimizeContinuous(model: TrussModel | DesignModel, options: OptimizeOptions = {}): TrussResult {
  const t0 = Date.now();
  const run = prepareRun(model, options);
  const r = minimize(run.sqp, run.sqpOptions);
  return buildResult(run, r, Date.now() - t0);
}

/** The result JSON of a finished solver run. */
export function buildResult(run: PreparedRun, r: SqpResult, elapsedMs: number): TrussResult {
  const p = run.design;
  const s = p.structure;
  const z = r.x.subarray(0, p.nDesign);
  const { areas, coords } = designState(p, z);
  const re = reanalyze(p, areas, coords, Math.max(VERIFY_TOLERANCE, 10 * p.tolerance));
  const a = re.analysis;
  const objectiveFinal = p.objective === "mass" ? a.mass : a.compliance.reduce((x, y) => x + y, 0);
  const start = designState(p, p.x0);
  const objectiveInitial = run.objectiveScale;
  void start;

  let status: SolverStatus = r.status;
  let message = r.message;
  // the solver's hints speak of functions and gradients; the engineer needs them in truss terms
  let hint = DESIGN_HINTS[r.status] ?? r.hint;
  if (status === "optimal" && !re.verification.allLimitsMet) {
    const f = re.verification.failures[0];
    status = "not-converged";
    message = `The optimizer stopped at a point the independent re-analysis rejects: the ${constraintWords(f.id, p.model)} is at ${(100 * f.ratio).toFixed(2)} % of its limit.`;
    hint = "Tighten the tolerance or raise the iteration limit and run again.";
  }

  if (status === "infeasible" && re.verification.failures.length > 0) {
    // the solver names the row it measured (a scaled constraint, or an equilibrium row of the
    // displacement variables, "off by 1.48" with no unit); the engineer needs the limit that
    // the fresh analysis finds broken, as a share of that limit
    const worst = re.verification.failures.reduce((a, b) => (b.ratio > a.ratio ? b : a));
    message = `The limits cannot be met together near this design: in a fresh analysis of the least-violating design found, the ${constraintWords(worst.id, p.model)} is at ${(100 * worst.ratio).toFixed(1)} % of its limit.`;
  }

  const priced = priceConstraints(p, r, run.objectiveScale);
  const members: ResultMember[] = s.memberIds.map((id, e) => {
    const mm = p.model.members[e];
    return {
      id, start: mm.start, end: mm.end, ...(mm.group ? { group: mm.group } : {}),
      area: areas[e], length: a.lengths[e], force: memberForceMap(s, a, e), stress: memberStressMap(s, a, e),
      utilization: re.members[e].utilization, governing: re.members[e].governing,
      ...(re.members[e].governingCase ? { governingCase: re.members[e].governingCase } : {}),
      ...(p.buckling ? { bucklingFactor: p.buckling.k[e] } : {}),
    };
  });
  const nodes: ResultNode[] = s.nodeIds.map((id, i) => {
    const displacement = nodeDisplacementMap(s, a, i);
    const fixed = (p.model.nodes[i].fixed ?? []).slice();
    return {
      id, x: coords[3 * i], y: coords[3 * i + 1], z: coords[3 * i + 2],
      initial: { x: p.coords0[3 * i], y: p.coords0[3 * i + 1], z: p.coords0[3 * i + 2] },
      fixed, displacement,
    };
  });

  return {
    format: "strutwise.result",
    version: 1,
    model: p.model.name,
    units: { ...p.model.units },
    status,
    message,
    hint,
    formulation: run.formulation,
    objective: { kind: p.objective, initial: objectiveInitial, final: objectiveFinal },
    iterations: r.iterations,
    analyses: run.counters.analyses,
    kktResidual: r.kktResidual,
    maxViolation: r.maxViolation,
    volume: a.volume,
    mass: a.mass,
    members,
    nodes,
    loadCases: p.model.loadCases.map((lc) => ({ id: lc.id, ...(lc.name ? { name: lc.name } : {}), ...(lc.selfWeight ? { selfWeight: lc.selfWeight } : {}) })),
    ...(s.combinations.length ? { combinations: resultCombinations(s) } : {}),
    reactions: reactions(s, a),
    ...(p.buckling?.fit ? { sectionFit: { ...p.buckling.fit } } : {}),
    reactionBalance: reactionBalance(s, a),
    variables: shapeValues(p, z),
    activeConstraints: activeConstraints(priced),
    shadowPrices: shadowPrices(p, priced, objectiveFinal, run.objectiveScale),
    // only a proved optimum has multipliers that price a relaxation
    criterionCosts: status === "optimal" ? criterionCosts(p, r, run.objectiveScale, objectiveFinal) : [],
    deflections: deflectionSummary(s, p.model.dimension, a.displacements, problemDeflectionLimits(p)),
    verification: re.verification,
    history: r.history.map((h) => ({
      iteration: h.iteration,
      objective: h.f * run.objectiveScale,
      maxViolation: h.maxViolation,
      kktResidual: h.kktResidual,
    })),
    solver: { name: SOLVER_NAME, version: ENGINE_VERSION, elapsedMs },
  };
}

export function summarizeResult(result: TrussResult): JobSummary {
  return {
    objectiveKind: result.objective.kind,
    objectiveInitial: result.objective.initial,
    objectiveFinal: result.objective.final,
    iterations: result.iterations,
    maxUtilization: result.verification?.maxUtilization ?? Math.max(0, maxOf(result.members.map((m) => m.utilization))),
    status: result.status,
    ...(result.lowerBound ? { lowerBoundGap: result.lowerBound.gap } : {}),
  };
}
