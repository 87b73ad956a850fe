// The discrete stage of catalogue sizing (docs/model-format.md):
// every area variable takes one rung of its section ladder (sections/ladder.ts), node positions
// stay where the continuous optimum put them, and every candidate is judged by a full
// analysis: all limits of the design problem evaluated with each member's own section I.
//
// 1. Floor: round every variable up to the lightest section at least as large as its continuous
//    area, then repair: while a limit fails, the variables of members whose stress or buckling
//    fails step up one rung; for a failing displacement (or other global) limit, the one-rung
//    step with the best cut in total violation per unit of objective added, each step tried by
//    analysis. The same repair from rounding to the nearest rung gives a second start.
// 2. Neighbourhood search from the lighter feasible start: single steps down (largest saving
//    first), then pair moves (one variable down, another up, only when the pair saves) for the
//    variables whose own step down failed, i.e. those near their limits. A move is kept only
//    when it is feasible and lowers the objective, so the result is never worse than the floor.
// 3. For each variable, the limit a one-rung lighter section breaks: "what made it step up".
import { analyze } from "../truss";
import type { LadderStep } from "../sections";
import { limitValue, objectiveValue, type LimitState } from "./limits";
import type { DesignProblem } from "./problem";

/** A limit value above this (problem.ts forms, 0 on the limit) is a failure. */
export const CATALOGUE_FEASIBILITY = 1e-9;
/** Default cap on full analyses of the discrete search. */
export const CATALOGUE_MAX_ANALYSES = 50000;

export interface CatalogueSearchOptions {
  maxAnalyses?: number;
  timeLimitMs?: number;
  signal?: AbortSignal;
}

export interface CatalogueSearchResult {
  /** rung per area variable */
  choice: Int32Array;
  objective: number;
  feasible: boolean;
  /** objective of round-up-and-repair (Infinity when even that found no feasible design) */
  roundedObjective: number;
  roundedFeasible: boolean;
  analyses: number;
  /** per variable: the limit a one-rung lighter section breaks, "lightest", or "objective" */
  steppedBy: string[];
  /** member areas and I at the chosen sections */
  areas: Float64Array;
  memberI: Float64Array;
  /** limit values at the chosen design */
  limitValues: Float64Array;
}

interface Evaluation {
  objective: number;
  g: Float64Array;
  worst: number;
  worstLimit: number;
}

export function searchCatalogue(
  p: DesignProblem, ladders: LadderStep[][], coords: Float64Array, continuousAreas: Float64Array, opts: CatalogueSearchOptions = {},
): CatalogueSearchResult {
  const s = p.structure;
  const m = s.memberIds.length;
  const nV = p.areaVars.length;
  const maxAnalyses = opts.maxAnalyses ?? CATALOGUE_MAX_ANALYSES;
  const deadline = opts.timeLimitMs !== undefined ? Date.now() + opts.timeLimitMs : Infinity;
  const memberI = new Float64Array(m);
  const pc: DesignProblem = { ...p, buckling: p.buckling ? { ...p.buckling, memberI } : null };
  const cache = new Map<string, Evaluation>();
  let analyses = 0;
  const budgetLeft = () => analyses < maxAnalyses && Date.now() < deadline && !opts.signal?.aborted;

  function fill(choice: Int32Array, areas: Float64Array) {
    for (let e = 0; e < m; e++) {
      const step = ladders[p.memberVar[e]][choice[p.memberVar[e]]];
      areas[e] = step.area;
      memberI[e] = step.I;
    }
  }

  function evaluate(choice: Int32Array): Evaluation {
    const key = choice.join(",");
    const hit = cache.get(key);
    if (hit) return hit;
    const areas = new Float64Array(m);
    fill(choice, areas);
    const a = analyze(s, { areas, coords });
    analyses++;
    const st: LimitState = { areas, coords, lengths: a.lengths, volume: a.volume, displacements: a.displacements, loads: a.loads };
    const g = new Float64Array(p.limits.length);
    let worst = -Infinity, worstLimit = -1;
    for (let r = 0; r < p.limits.length; r++) {
      g[r] = limitValue(pc, p.limits[r], st);
      if (g[r] > worst) { worst = g[r]; worstLimit = r; }
    }
    const ev = { objective: objectiveValue(pc, st), g, worst, worstLimit };
    cache.set(key, ev);
    return ev;
  }
  const feasible = (ev: Evaluation) => ev.worst <= CATALOGUE_FEASIBILITY;
  const violation = (ev: Evaluation) => ev.g.reduce((t, v) => t + Math.max(0, v), 0);
  const top = (v: number) => ladders[v].length - 1;
  const moved = (choice: Int32Array, v: number, d: number) => {
    const c = Int32Array.from(choice);
    c[v] += d;
    return c;
  };

  function repair(start: Int32Array): { choice: Int32Array; ev: Evaluation } {
    let choice = Int32Array.from(start);
    let ev = evaluate(choice);
    while (!feasible(ev) && budgetLeft()) {
      const up = new Set<number>();
      for (let r = 0; r < p.limits.length; r++) {
        const lim = p.limits[r];
        if (ev.g[r] > CATALOGUE_FEASIBILITY && (lim.kind === "stress-tension" || lim.kind === "stress-compression" || lim.kind === "buckling")) {
          const v = p.memberVar[lim.member];
          if (choice[v] < top(v)) up.add(v);
        }
      }
      if (up.size > 0) {
        choice = Int32Array.from(choice);
        for (const v of up) choice[v]++;
        ev = evaluate(choice);
        continue;
      }
      // a global limit fails: the step with the best cut in violation per objective added
      const before = violation(ev);
      let best = -1, bestScore = 0, bestEv: Evaluation | null = null;
      for (let v = 0; v < nV && budgetLeft(); v++) {
        if (choice[v] >= top(v)) continue;
        const trial = evaluate(moved(choice, v, 1));
        const cut = before - violation(trial);
        if (cut <= 0) continue;
        const score = cut / Math.max(trial.objective - ev.objective, 1e-300);
        if (score > bestScore) { best = v; bestScore = score; bestEv = trial; }
      }
      if (best < 0 || !bestEv) break; // no single step helps: infeasible within the catalogue
      choice = moved(choice, best, 1);
      ev = bestEv;
    }
    return { choice, ev };
  }

  // Starts: round up, and round to the nearest rung (in ratio of areas).
  const roundUp = new Int32Array(nV), nearest = new Int32Array(nV);
  for (let v = 0; v < nV; v++) {
    const A = continuousAreas[v];
    const L = ladders[v];
    let k = L.findIndex((step) => step.area >= A * (1 - 1e-12));
    roundUp[v] = k < 0 ? L.length - 1 : k;
    k = 0;
    for (let j = 1; j < L.length; j++) if (Math.abs(Math.log(L[j].area / A)) < Math.abs(Math.log(L[k].area / A))) k = j;
    nearest[v] = k;
  }
  const floor = repair(roundUp);
  const second = repair(nearest);
  const floorOk = feasible(floor.ev);
  let cur = floor;
  if (feasible(second.ev) && (!floorOk || second.ev.objective < floor.ev.objective)) cur = second;

  // Mass moved by one rung of a variable (mass objective: ranks the moves without an analysis).
  const perArea = new Float64Array(nV);
  for (let e = 0; e < m; e++) {
    const i = 3 * s.start[e], j = 3 * s.end[e];
    perArea[p.memberVar[e]] += s.density[e] * Math.hypot(coords[j] - coords[i], coords[j + 1] - coords[i + 1], coords[j + 2] - coords[i + 2]);
  }
  const stepMass = (choice: Int32Array, v: number, d: number) => perArea[v] * (ladders[v][choice[v] + d].area - ladders[v][choice[v]].area);
  const isMass = p.objective === "mass";

  if (feasible(cur.ev)) {
    let improved = true;
    while (improved && budgetLeft()) {
      improved = false;
      const order = [...Array(nV).keys()].filter((v) => cur.choice[v] > 0).sort((a, b) => stepMass(cur.choice, a, -1) - stepMass(cur.choice, b, -1));
      const blocked: number[] = [];
      for (const v of order) {
        if (!budgetLeft()) break;
        if (cur.choice[v] === 0) continue;
        const c = moved(cur.choice, v, -1);
        const ev = evaluate(c);
        if (feasible(ev) && ev.objective < cur.ev.objective) { cur = { choice: c, ev }; improved = true; }
        else blocked.push(v);
      }
      if (improved) continue;
      // pair moves for the variables held by a limit: down one rung here, up one rung elsewhere
      pairs: for (const v of blocked) {
        for (let w = 0; w < nV; w++) {
          if (w === v || cur.choice[w] >= top(w) || !budgetLeft()) continue;
          if (isMass && stepMass(cur.choice, v, -1) + stepMass(cur.choice, w, 1) >= 0) continue;
          const c = moved(moved(cur.choice, v, -1), w, 1);
          const ev = evaluate(c);
          if (feasible(ev) && ev.objective < cur.ev.objective) { cur = { choice: c, ev }; improved = true; break pairs; }
        }
      }
    }
  }

  // What holds each variable where it is.
  const steppedBy = [...Array(nV).keys()].map((v) => {
    if (cur.choice[v] === 0) return "lightest";
    const ev = evaluate(moved(cur.choice, v, -1));
    return feasible(ev) ? "objective" : p.limits[ev.worstLimit].id;
  });

  const areas = new Float64Array(m);
  fill(cur.choice, areas);
  return {
    choice: cur.choice,
    objective: cur.ev.objective,
    feasible: feasible(cur.ev),
    roundedObjective: floorOk ? floor.ev.objective : Infinity,
    roundedFeasible: floorOk,
    analyses,
    steppedBy,
    areas,
    memberI: Float64Array.from(memberI),
    limitValues: cur.ev.g,
  };
}
