// Catalogue sizing (design.sizing "catalogue"): the continuous optimum first (buckling with the
// fitted I = a A^b of the model's sections), then the discrete search of catalogue-search.ts
// at the continuous node positions, then the same independent re-analysis every result gets,
// now with each member's own section I. The result names each member's section and keeps the
// continuous optimum beside it (continuousObjective, catalogue.choices).
import { minimize, type SqpResult } from "../sqp";
import { sectionLadder } from "../sections";
import type { CatalogueChoice, TrussResult } from "./result-types";
import { designState, DesignSetupError, type DesignProblem } from "./problem";
import { buildResult, prepareRun, type OptimizeOptions, type PreparedRun } from "./result";
import { searchCatalogue } from "./catalogue-search";
import type { DesignModel } from "./model-shape";
import type { TrussModel } from "../truss";
import { maxOf } from "../util/extent";

export function optimizeCatalogue(model: TrussModel | DesignModel, options: OptimizeOptions = {}): TrussResult {
  const t0 = Date.now();
  const sections = model.sections ?? [];
  if (sections.length === 0) throw new DesignSetupError('Catalogue sizing needs a section catalogue: add "sections" to the model.');
  const run = prepareRun(model, options);
  const p = run.design;
  const ladders = p.areaVars.map((v) => {
    const ladder = sectionLadder(sections, v.min, v.max);
    if (ladder.length === 0) throw new DesignSetupError(`Area variable "${v.id}" has no section with an area within its bounds ${v.min}..${v.max}.`);
    return ladder;
  });

  const r = minimize(run.sqp, run.sqpOptions);
  const z = r.x.subarray(0, p.nDesign);
  const { coords } = designState(p, z);
  const continuous = buildResult(run, r, Date.now() - t0);
  const continuousAreas = Float64Array.from(p.areaVars, (v, k) => v.scale * z[k]);

  const left = options.timeLimitMs !== undefined ? Math.max(0, options.timeLimitMs - (Date.now() - t0)) : undefined;
  const found = searchCatalogue(p, ladders, coords, continuousAreas, { timeLimitMs: left, signal: options.signal });

  // the catalogue design as a solver point: sections' areas, continuous shape, I per member
  const pc: DesignProblem = { ...p, buckling: p.buckling ? { ...p.buckling, memberI: found.memberI } : null };
  const x = Float64Array.from(r.x);
  p.areaVars.forEach((v, k) => (x[k] = ladders[k][found.choice[k]].area / v.scale));
  const zeros = (n: number) => new Float64Array(n);
  const point: SqpResult = {
    ...r,
    status: found.feasible ? (r.status === "optimal" ? "optimal" : "not-converged") : "infeasible",
    x,
    ineq: found.limitValues,
    multipliers: { eq: zeros(r.multipliers.eq.length), ineq: zeros(r.multipliers.ineq.length), lower: zeros(r.multipliers.lower.length), upper: zeros(r.multipliers.upper.length) },
    maxViolation: Math.max(0, maxOf(found.limitValues)),
  };
  const catRun: PreparedRun = { ...run, design: pc, counters: { ...run.counters, analyses: run.counters.analyses + found.analyses } };
  const result = buildResult(catRun, point, Date.now() - t0);

  const sectionOf = (k: number) => sections[ladders[k][found.choice[k]].section];
  result.members.forEach((mm, e) => {
    const sec = sectionOf(p.memberVar[e]);
    mm.section = sec.id;
    mm.area = sec.area; // exactly the catalogue's figure
  });
  const choices: CatalogueChoice[] = p.areaVars.map((v, k) => ({
    id: v.id,
    members: v.members.length,
    continuousArea: continuousAreas[k],
    section: sectionOf(k).id,
    area: sectionOf(k).area,
    steppedBy: found.steppedBy[k],
  }));
  const cObj = continuous.objective.final;
  result.continuousObjective = cObj;
  result.catalogue = {
    continuousObjective: cObj,
    continuousStatus: continuous.status,
    roundedObjective: found.roundedObjective,
    gap: cObj > 0 ? result.objective.final / cObj - 1 : 0,
    analyses: found.analyses,
    choices,
  };
  result.activeConstraints = [];
  result.shadowPrices = [];
  // a discrete design has no multipliers: the continuous optimum's criterion costs stand in, named as such
  result.criterionCosts = continuous.criterionCosts ?? [];
  if (result.criterionCosts.length) result.criterionCostsOf = "continuous optimum";
  const kind = p.objective === "mass" ? "mass" : "compliance";
  if (found.feasible && result.status !== "not-converged") {
    result.message = `Catalogue design: ${p.areaVars.length} variable${p.areaVars.length === 1 ? "" : "s"} sized from ${sections.length} sections, every limit met in a fresh analysis; ${kind} ${fmt(result.objective.final)} against ${fmt(cObj)} for the continuous optimum (+${(100 * result.catalogue.gap).toFixed(1)}%), ${found.roundedFeasible ? `${fmt(found.roundedObjective)} by rounding up and repairing` : "rounding up and repairing found no feasible design"}.`;
  } else if (found.feasible) {
    result.message = `Catalogue design found with every limit met, but the continuous optimum it started from did not converge (${continuous.message}); a better catalogue design may exist.`;
  } else {
    result.status = "infeasible";
    result.message = `No catalogue design meets every limit: even the largest sections within the bounds leave ${result.verification?.failures[0]?.id ?? "a limit"} broken.`;
    result.hint = "Add larger sections to the catalogue, widen the area bounds, or relax the governing limit.";
  }
  return result;
}

const fmt = (v: number) => (Math.abs(v) >= 100 ? v.toFixed(1) : v.toPrecision(4));
