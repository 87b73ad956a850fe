// The least-mass certificate beside a mass result: the plastic-design LP's optimum at the
// result's geometry, the gap to the result's mass, and in words what the bound assumes.
// Everything it cannot honestly certify comes back as a withheld bound with the reason.
import { buildStructure, type TrussModel } from "../truss";
import { buildDesignProblem } from "../design/problem";
import type { JobOptions } from "../design/options";
import type { LowerBound, TrussResult } from "../design/result-types";
import type { LpSolver } from "./solver";
import type { BoundOutcome } from "./outcome";
import { plasticInputFromModel, resultCoords } from "./from-model";
import { solvePlasticDesign, type PlasticDesign } from "./plastic";
import { complianceLowerBound } from "./compliance-bound";

export type { BoundOutcome };

/**
 * The plastic design at the model's own geometry, when a mass run's bound will be taken there
 * (stresses checked, no shape variables, a strength case); else null. Solved before the run, it
 * is the solver's LP start (multi-start.ts) and, after the run, the bound itself: one LP a run.
 * Never throws.
 */
export function plasticDesignBeforeRun(model: TrussModel, options: JobOptions, solver: LpSolver): PlasticDesign | null {
  const objective = options.objective ?? model.design?.objective ?? "mass";
  const stressChecked = options.stress ?? model.design?.constraints?.stress ?? false;
  if (objective !== "mass" || !stressChecked || (model.design?.shape?.length ?? 0) > 0) return null;
  try {
    const { input, checked } = plasticInputFromModel(model);
    return checked.cases.length === 0 ? null : solvePlasticDesign(input, solver);
  } catch {
    return null; // the bound after the run tries again and reports the failure in words
  }
}

/**
 * Whether a run of this model may solve an LP, before it or for its bound: compliance runs and
 * mass runs with stress checks. The others need not load the LP runtime (HiGHS, about 0.1 s of
 * CPU): their bound is withheld without one (boundWithheldWithoutLp).
 */
export function runUsesLp(model: TrussModel, options: JobOptions): boolean {
  const objective = options.objective ?? model.design?.objective ?? "mass";
  return objective === "compliance" || (options.stress ?? model.design?.constraints?.stress ?? false);
}

/** The reasons for no bound that need no LP (no design, or a mass run that checks no stresses); else null. */
export function boundWithheldWithoutLp(model: TrussModel, result: TrussResult, options: JobOptions): BoundOutcome | null {
  if (!Number.isFinite(result.objective.final)) return { kind: "withheld", reason: "The run produced no design to compare with a bound." };
  if (result.objective.kind === "compliance") return null;
  const stressChecked = options.stress ?? model.design?.constraints?.stress ?? false;
  if (!stressChecked) {
    return {
      kind: "withheld",
      reason: "This run checks no stresses. The least-mass bound rests on the allowable stresses; without them a design may be lighter than any bound they give, so none is shown.",
    };
  }
  return null;
}

/**
 * Mass (or compliance) result -> its lower bound, or the reason there is none. Never throws for
 * bad data. `before`: the plastic design solved before the run (plasticDesignBeforeRun), used
 * instead of solving the same LP again when the bound is taken at the model's geometry.
 */
export function lowerBoundForResult(model: TrussModel, result: TrussResult, options: JobOptions, solver: LpSolver, before?: PlasticDesign | null): BoundOutcome {
  const withheld = boundWithheldWithoutLp(model, result, options);
  if (withheld) return withheld;
  if (result.objective.kind === "compliance") return complianceLowerBound(model, result, options, solver);
  const final = (model.design?.shape?.length ?? 0) > 0;
  const coords = final ? resultCoords(model, result) : undefined;
  const { input, checked } = plasticInputFromModel(model, coords);
  if (checked.cases.length === 0) {
    return { kind: "withheld", reason: "The model has combinations but none for strength, so no stress limit applies and no least-mass bound follows." };
  }
  const lp = before && !final ? before : solvePlasticDesign(input, solver);
  if (lp.status !== "optimal") return { kind: "withheld", reason: lp.message };
  if (!(lp.mass > 0)) {
    return {
      kind: "withheld",
      reason: "The least-mass bound is zero here (members without density, or without allowable stresses on the side they work in), so it certifies nothing.",
    };
  }
  const leftOut = limitsLeftOut(model, options);
  return {
    kind: "bound",
    plasticAreas: lp.memberAreas,
    lowerBound: {
      value: lp.mass,
      gap: result.objective.final / lp.mass - 1,
      basis: massBasis(model, checked.kind, checked.cases.length, final, lp.solver),
      geometry: final ? "final" : "model",
      ...(leftOut.length > 0 ? { leftOut } : {}),
    },
  };
}

/** The run's limits the least-mass LP does not model, read from the run's own list of limits. */
function limitsLeftOut(model: TrussModel, options: JobOptions): NonNullable<LowerBound["leftOut"]> {
  const kinds = new Set(buildDesignProblem(model, buildStructure(model), options).limits.map((l) => l.kind));
  return (["buckling", "displacement", "volume"] as const).filter((k) => kinds.has(k));
}

function massBasis(model: TrussModel, kind: string, nCases: number, final: boolean, solver: string): string {
  const cases = nCases === 1 ? `its ${kind === "load cases" ? "load case" : "strength combination"}` : `all ${nCases} ${kind}`;
  const own = model.loadCases.some((lc) => (lc.selfWeight ?? 0) !== 0) ? " Own weight follows the areas." : "";
  const where = final
    ? ` It is taken at the final node positions of this run: another geometry could be lighter, so it bounds the sizing at this shape only.`
    : "";
  return (
    `The least mass of any truss on these ${model.members.length} members and ${model.nodes.length} nodes that carries ${cases} ` +
    `within its materials' allowable stresses (plastic-design linear program, solved with ${solver}). ` +
    "The member forces only have to balance the loads, not fit one elastic deformation; areas may fall to zero " +
    "(minimum areas dropped) and have no upper limit; members of a group share one area." +
    own +
    " Displacement, buckling and volume limits are left out: they can only add mass, so the bound holds with them." +
    where
  );
}

/** The result with its bound (or the reason for none) and, for layout studies, each member's LP area. */
export function withLowerBound(result: TrussResult, outcome: BoundOutcome): TrussResult {
  if (outcome.kind === "withheld") return { ...result, lowerBoundWithheld: outcome.reason };
  const areas = outcome.plasticAreas;
  return {
    ...result,
    lowerBound: outcome.lowerBound,
    members: areas ? result.members.map((m, e) => ({ ...m, plasticArea: areas[e] })) : result.members,
  };
}

/**
 * The result with its bound attached, as the worker and the command line store it. A failure
 * inside the bound never fails the run: it becomes the reason the bound is withheld.
 */
export function attachLowerBound(model: TrussModel, result: TrussResult, options: JobOptions, solver: LpSolver, before?: PlasticDesign | null): TrussResult {
  let outcome: BoundOutcome;
  try {
    outcome = lowerBoundForResult(model, result, options, solver, before);
  } catch (e) {
    outcome = { kind: "withheld", reason: `The bound could not be computed: ${(e as Error).message}` };
  }
  return withLowerBound(result, outcome);
}
