// Several starts: the design problems are not convex (the ten-bar cantilever has local optima
// at 5060.8 lb and near 5076.7 lb), so one start can end at a worse local optimum than another.
// The design runs from several starting designs — the engineer's own, a fully stressed
// design, the engineer's areas scaled up and down, and seeded random perturbations — keeps the
// lightest design that the solver proved optimal and the re-analysis accepts, and says how
// many starts reached it.
//
// Each start is an independent run (runStart), so the worker runs them in parallel threads and
// this module only combines their results (combineStarts); optimizeWithStarts runs them one
// after the other in the calling thread.
import { buildStructure, type TrussModel } from "../truss";
import type { DesignModel } from "./model-shape";
import type { DesignProblem } from "./problem";
import { buildDesignProblem, designState } from "./problem";
import type { StartsSummary, TrussResult } from "./result-types";
import { reanalyze } from "./verify";
import { minimize } from "../sqp";
import { buildResult, prepareRun, type OptimizeOptions, type PreparedRun } from "./result";
import { seededRandom } from "../util/seeded-random";

/** Starts run by default (the engineer's start, fully stressed, two scaled, two perturbed). */
export const DEFAULT_STARTS = 6;
/** Models with more design variables than this run one start unless the options ask for more. */
export const MULTI_START_MAX_VARIABLES = 300;
/** Most starts a run may ask for. */
export const MAX_STARTS = 12;
/** Two starts reached the same design when their objectives differ by less than this share. */
export const SAME_DESIGN = 1e-4;
/** The label of the engineer's own start (always the first). */
const OWN_START = "your start";
/** Resizing passes of the fully stressed start. */
const FULLY_STRESSED_PASSES = 6;
/** Spread of the perturbed starts: each area times exp(u), u uniform in +-PERTURBATION. */
const PERTURBATION = 0.7;
/** Seed of the perturbed starts: the same model gives the same starts on every machine. */
const PERTURBATION_SEED = 0x5eed17;

export interface StartDesign {
  label: string;
  /** scaled design vector (problem.ts), inside the bounds */
  z: Float64Array;
}

/**
 * Least compliance over the member areas alone, under a volume limit and area bounds, with loads
 * that do not depend on the areas (no own weight): f' K(A)^-1 f is convex in A when K is linear in
 * A, and the limits are linear, so every local optimum is the global one (from memory: Svanberg
 * 1984; Ben-Tal and Bendsoe 1993). More starts could only reach the same design again.
 */
export function convexInAreas(p: DesignProblem): boolean {
  return p.objective === "compliance" && p.shapeVars.length === 0 && !p.structure.hasSelfWeight && p.limits.every((l) => l.kind === "volume");
}

/** How many starts a run makes: the option when given, else the default by model size and kind. */
export function startCount(design: DesignProblem, options: OptimizeOptions): number {
  if (options.starts !== undefined) return Math.max(1, Math.min(MAX_STARTS, Math.floor(options.starts)));
  if (convexInAreas(design)) return 1;
  return design.nDesign <= MULTI_START_MAX_VARIABLES ? DEFAULT_STARTS : 1;
}

/** Starts a run of this model with these options makes (builds the design problem, no solve). */
export function plannedStarts(model: TrussModel | DesignModel, options: OptimizeOptions): number {
  // catalogue sizing runs its own continuous solve and discrete search (optimizeModel); the
  // several-starts path knows only continuous sizing, so it must not take such a model over
  if (model.design?.sizing === "catalogue") return 1;
  return startCount(buildDesignProblem(model, buildStructure(model as TrussModel), options), options);
}

function clampInto(p: DesignProblem, z: Float64Array): Float64Array {
  for (let k = 0; k < z.length; k++) z[k] = Math.min(p.upper[k], Math.max(p.lower[k], z[k]));
  return z;
}

/**
 * Fully stressed design (common practice): each area resized by its member's utilization
 * (stress: A u; Euler buckling, whose stress capacity grows with A: A sqrt(u)), the largest over
 * the members of a group, then all areas scaled together until the displacement limits hold
 * (displacements fall as 1/A under a common scale). Null for a compliance objective, where no
 * member stress decides the size.
 */
export function fullyStressedStart(p: DesignProblem, from: Float64Array = p.x0): Float64Array | null {
  if (p.objective !== "mass" || p.areaVars.length === 0) return null;
  const z = Float64Array.from(from);
  const nA = p.areaVars.length;
  for (let pass = 0; pass < FULLY_STRESSED_PASSES; pass++) {
    const { areas, coords } = designState(p, z);
    const re = reanalyze(p, areas, coords);
    for (let v = 0; v < nA; v++) {
      let factor = 0;
      for (const e of p.areaVars[v].members) {
        const c = re.members[e];
        factor = Math.max(factor, c.governing.startsWith("buckling") ? Math.sqrt(c.utilization) : c.utilization);
      }
      z[v] *= Math.max(factor, 1e-3);
    }
    clampInto(p, z);
    // the displacements of the resized design, then one common scale that meets their limits
    const resized = designState(p, z);
    const displacements = reanalyze(p, resized.areas, resized.coords).analysis.displacements;
    let worstDisplacement = 0;
    for (const l of p.limits) {
      if (l.kind !== "displacement") continue;
      worstDisplacement = Math.max(worstDisplacement, Math.abs(displacements[l.loadCase][l.dof]) / l.limit);
    }
    if (worstDisplacement > 1) for (let v = 0; v < nA; v++) z[v] *= worstDisplacement;
    clampInto(p, z);
  }
  for (const x of z) if (!Number.isFinite(x)) return null;
  return z;
}

/**
 * The least-mass LP's design (app/engine/lp, per member, model units) made elastic: each area
 * variable at its members' largest LP area (members the LP drops at their minimum area), the
 * fully stressed passes, which size it to the stresses and displacements of elastic analyses,
 * then one common scale until every stress, buckling and displacement limit holds (forces stay,
 * so stresses and displacements fall as 1/scale, Euler utilization as its square). Mass designs
 * without shape variables only (the LP is taken at the model's geometry).
 */
export function plasticStart(p: DesignProblem, memberAreas: ArrayLike<number>): Float64Array | null {
  if (p.objective !== "mass" || p.shapeVars.length > 0 || memberAreas.length !== p.structure.memberIds.length) return null;
  const z = new Float64Array(p.nDesign);
  p.areaVars.forEach((v, k) => {
    for (const e of v.members) z[k] = Math.max(z[k], memberAreas[e] / v.scale);
  });
  const sized = fullyStressedStart(p, clampInto(p, z));
  if (!sized) return null;
  const { areas, coords } = designState(p, sized);
  let scale = 1;
  for (const c of reanalyze(p, areas, coords, 0).verification.failures) {
    if (c.kind === "stress" || c.kind === "displacement") scale = Math.max(scale, c.ratio);
    else if (c.kind === "buckling") scale = Math.max(scale, Math.sqrt(c.ratio));
  }
  for (let v = 0; v < p.areaVars.length; v++) sized[v] *= scale;
  return clampInto(p, sized);
}

/**
 * The starting designs of a run, the engineer's first; `count` of them (fewer only if count is).
 * `plastic`: the least-mass LP's member areas, which become the second start when given.
 */
export function startingDesigns(p: DesignProblem, count: number, plastic?: ArrayLike<number>): StartDesign[] {
  const nA = p.areaVars.length;
  const starts: StartDesign[] = [{ label: OWN_START, z: Float64Array.from(p.x0) }];
  const lp = count > 1 && plastic ? plasticStart(p, plastic) : null;
  if (lp) starts.push({ label: "least-mass LP", z: lp });
  const fsd = count > 1 ? fullyStressedStart(p) : null;
  if (fsd) starts.push({ label: "fully stressed", z: fsd });
  for (const factor of [2, 0.5]) {
    if (starts.length >= count) break;
    const z = Float64Array.from(p.x0);
    for (let v = 0; v < nA; v++) z[v] *= factor;
    starts.push({ label: `your areas × ${factor}`, z: clampInto(p, z) });
  }
  const random = seededRandom(PERTURBATION_SEED);
  for (let k = 1; starts.length < count; k++) {
    const z = Float64Array.from(p.x0);
    for (let v = 0; v < nA; v++) z[v] *= Math.exp(PERTURBATION * (2 * random() - 1));
    // shape variables: anywhere in the middle half of their range
    for (let i = nA; i < p.nDesign; i++) z[i] = p.lower[i] + (0.25 + 0.5 * random()) * (p.upper[i] - p.lower[i]);
    starts.push({ label: `perturbed ${k}`, z: clampInto(p, z) });
  }
  return starts.slice(0, count);
}

export type StartDesigns = typeof startingDesigns;

/**
 * startingDesigns made once and then handed out again: the starts of one run share it, since
 * the fully stressed and LP starts each cost a dozen analyses (more than a small model's solve).
 */
export function startingDesignsOnce(): StartDesigns {
  let made: StartDesign[] | null = null;
  return (p, count, plastic) => (made ??= startingDesigns(p, count, plastic));
}

/**
 * One start of a multi-start run, as a complete result of its own (progress from the first
 * only). `designs`: the run's starting designs, shared between its starts (startingDesignsOnce).
 */
export function runStart(
  model: TrussModel | DesignModel,
  options: OptimizeOptions,
  index: number,
  count: number,
  prepared?: PreparedRun,
  designs: StartDesigns = startingDesigns,
): { label: string; result: TrussResult } {
  const t0 = Date.now();
  const base = prepared ?? prepareRun(model, { ...options, onProgress: index === 0 ? options.onProgress : undefined });
  if (index === 0) {
    // the engineer's own start is the prepared run itself: no other start need be made for it
    const r = minimize(base.sqp, base.sqpOptions);
    return { label: OWN_START, result: buildResult(base, r, Date.now() - t0) };
  }
  const start = designs(base.design, count, options.plasticStart)[index];
  if (!start) throw new RangeError(`Start ${index} does not exist: this run has ${count} starts.`);
  const run = prepareRun(model, { ...options, onProgress: undefined }, start.z);
  const r = minimize(run.sqp, run.sqpOptions);
  return { label: start.label, result: buildResult(run, r, Date.now() - t0) };
}

/** A design the result can stand on: proved optimal and accepted by the re-analysis. */
function trusted(r: TrussResult): boolean {
  return r.status === "optimal" && r.verification?.allLimitsMet === true;
}

function formatObjective(r: TrussResult): string {
  const unit = r.objective.kind === "mass" ? r.units.mass : `${r.units.force}·${r.units.length}`;
  return `${Number(r.objective.final.toPrecision(5)).toLocaleString("en-US")} ${unit}`;
}

/**
 * The result of a multi-start run: the lightest trusted design (else the engineer's start's
 * result, so a run that never converged reports the engineer's own path), its `starts`
 * summary, and a sentence on how many starts reached it.
 */
export function combineStarts(runs: { label: string; result: TrussResult }[], elapsedMs: number): TrussResult {
  if (runs.length === 0) throw new RangeError("combineStarts needs at least one run.");
  const own = runs[0].result;
  if (runs.length === 1) return own;
  let best = runs[0];
  for (const run of runs) {
    const better = trusted(run.result) && (!trusted(best.result) || run.result.objective.final < best.result.objective.final);
    if (better) best = run;
  }
  const f = best.result.objective.final;
  const same = (r: TrussResult) => trusted(r) && Math.abs(r.objective.final - f) <= SAME_DESIGN * Math.abs(f);
  const reached = trusted(best.result) ? runs.filter((r) => same(r.result)).length : 0;
  const others = runs.filter((r) => !same(r.result));
  const otherEnds = [...new Set(others.filter((r) => trusted(r.result)).map((r) => formatObjective(r.result)))];
  const unfinished = others.filter((r) => !trusted(r.result)).length;
  let summary = trusted(best.result)
    ? `${reached} of ${runs.length} starts reached this design`
    : `None of the ${runs.length} starts reached a design proved optimal; this is the run from your start`;
  if (trusted(best.result) && others.length > 0) {
    const ends = otherEnds.join(", ");
    if (unfinished === 0) summary += `; the others stopped at ${ends}`;
    else if (otherEnds.length === 0) summary += unfinished === 1 ? "; the other did not converge" : `; the other ${unfinished} did not converge`;
    else summary += `; the others stopped at ${ends} and ${unfinished} did not converge`;
  }
  summary += ".";
  const starts: StartsSummary = {
    tried: runs.length,
    reachedBest: reached,
    best: best.label,
    summary,
    runs: runs.map((r) => ({
      label: r.label,
      status: r.result.status,
      objective: r.result.objective.final,
      iterations: r.result.iterations,
    })),
  };
  return {
    ...best.result,
    message: `${best.result.message} ${summary}`,
    // the objective before optimizing is the engineer's design, whichever start won
    objective: { ...best.result.objective, initial: own.objective.initial },
    starts,
    solver: best.result.solver ? { ...best.result.solver, elapsedMs } : undefined,
  };
}

/** Every start one after the other in this thread (the worker spreads them over threads). */
export function optimizeWithStarts(model: TrussModel | DesignModel, options: OptimizeOptions = {}): TrussResult {
  const t0 = Date.now();
  const first = prepareRun(model, options);
  const count = startCount(first.design, options);
  const runs: { label: string; result: TrussResult }[] = [];
  const designs = startingDesignsOnce();
  for (let k = 0; k < count; k++) {
    // after a stop request no further start begins (the one under way stopped at an iteration)
    if (k > 0 && options.stopRequested?.()) break;
    runs.push(runStart(model, options, k, count, k === 0 ? first : undefined, designs));
  }
  return combineStarts(runs, Date.now() - t0);
}
