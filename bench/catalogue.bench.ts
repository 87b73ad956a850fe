// Own weight, combinations and catalogue sizing: figures beside their targets (issue 13).
//
// 1. Cost of own weight and four combinations: a 3D lattice tower (400 members, 40 groups) with
//    own weight in its G case and four combinations (three strength, one service) against the
//    same tower with the same three load cases of point loads and no combinations (every limit
//    on every case). Timed: one evaluation plus the derivatives of every limit at the start
//    (the work of an iteration), averaged over repeats, for both formulations; and the whole
//    nested optimization with its time per iteration. Target: under 1.3x.
// 2. Catalogue sizing of that tower with a 60-section catalogue, from the continuous optimum to
//    the checked catalogue design. Target: under 60 s on the 2-core machine.
import { analyze, buildStructure, parseModel, type TrussModel, type TrussModelInput } from "../app/engine/truss";
import { optimizeModel } from "../app/engine/design";
import { buildDesignProblem } from "../app/engine/design/problem";
import { nestedFormulation } from "../app/engine/design/nested";
import { simultaneousFormulation } from "../app/engine/design/simultaneous";
import { latticeTower } from "../tests/support/lattice-tower";

const LEVELS = 25, BANDS = 10, SECTIONS = 60;

function parsed(m: TrussModelInput): TrussModel {
  const r = parseModel(m);
  if (!r.ok) throw new Error(JSON.stringify(r.errors.slice(0, 3)));
  return r.model;
}

function towerPair(): { withLoads: TrussModel; without: TrussModel } {
  const m = latticeTower({ levels: LEVELS, bands: BANDS, sections: SECTIONS, sizing: "continuous" });
  m.combinations = [
    ...m.combinations!,
    { id: "STR-3", name: "Strength: instruments leading", use: "strength", factors: { G: 1.35, Q: 1.5, W: 0.9 } },
  ];
  const without: TrussModelInput = { ...m, combinations: undefined, loadCases: m.loadCases.map((lc) => ({ ...lc, selfWeight: undefined, loads: lc.loads.length ? lc.loads : [{ node: `N${LEVELS}-2`, fz: -4000 }] })) };
  return { withLoads: parsed(m), without: parsed(without) };
}

function analysisTime(model: TrussModel, repeats: number): number {
  const st = buildStructure(model);
  const areas = Float64Array.from(st.areas);
  for (let k = 0; k < 3; k++) analyze(st, { areas });
  const t = performance.now();
  for (let k = 0; k < repeats; k++) { areas[0] *= 1.0001; analyze(st, { areas }); }
  return (performance.now() - t) / repeats;
}

function iterationWork(model: TrussModel, formulation: "nested" | "simultaneous", repeats: number): { ms: number; rows: number } {
  const p = buildDesignProblem(model, buildStructure(model), { formulation });
  const f = formulation === "nested" ? nestedFormulation(p) : simultaneousFormulation(p);
  const rows = Int32Array.from({ length: p.limits.length }, (_, i) => i);
  const x = Float64Array.from(f.problem.x0);
  for (let k = 0; k < 3; k++) { x[0] *= 1.0001; f.problem.evaluate(x); f.problem.derivatives(x, rows); }
  const t = performance.now();
  for (let k = 0; k < repeats; k++) {
    x[0] *= 1.0001; // a new point each time: no cached analysis
    f.problem.evaluate(x);
    f.problem.derivatives(x, rows);
  }
  return { ms: (performance.now() - t) / repeats, rows: p.limits.length };
}

const pad = (s: string, n: number) => s.padEnd(n);
const { withLoads, without } = towerPair();
console.log(`tower: ${withLoads.members.length} members, ${new Set(withLoads.members.map((m) => m.group)).size} groups; with: own weight + ${withLoads.combinations!.length} combinations; without: 3 point-load cases`);
console.log(`${pad("measure", 52)}${pad("without", 12)}${pad("with", 12)}${pad("ratio", 8)}target`);
{
  const a = analysisTime(without, 50), b = analysisTime(withLoads, 50);
  console.log(`${pad("analysis: factorization, every case and combination (ms)", 52)}${pad(a.toFixed(2), 12)}${pad(b.toFixed(2), 12)}${pad((b / a).toFixed(2), 8)}< 1.30`);
}
// the two models check different numbers of limits (without combinations every limit is on
// every case), so the derivative work is compared per limit row as well as in total
for (const formulation of ["nested", "simultaneous"] as const) {
  const a = iterationWork(without, formulation, 20);
  const b = iterationWork(withLoads, formulation, 20);
  console.log(`${pad(`evaluation + all derivatives, ${formulation} (ms)`, 52)}${pad(a.ms.toFixed(2), 12)}${pad(b.ms.toFixed(2), 12)}${pad((b.ms / a.ms).toFixed(2), 8)}< 1.30`);
  const pa = (1000 * a.ms) / a.rows, pb = (1000 * b.ms) / b.rows;
  console.log(`${pad(`  per limit row, ${formulation} (us; ${a.rows} / ${b.rows} rows)`, 52)}${pad(pa.toFixed(1), 12)}${pad(pb.toFixed(1), 12)}${pad((pb / pa).toFixed(2), 8)}< 1.30`);
}
const runs = [without, withLoads].map((m) => {
  const t = performance.now();
  const r = optimizeModel(m, { formulation: "nested" });
  const ms = performance.now() - t;
  return { ms, it: r.iterations, status: r.status };
});
console.log(`${pad("nested optimization, time per iteration (ms)", 52)}${pad((runs[0].ms / runs[0].it).toFixed(1), 12)}${pad((runs[1].ms / runs[1].it).toFixed(1), 12)}${pad((runs[1].ms / runs[1].it / (runs[0].ms / runs[0].it)).toFixed(2), 8)}(for information: different active sets and subproblems)`);
console.log(`${pad("nested optimization, whole run (s, iterations)", 52)}${pad(`${(runs[0].ms / 1000).toFixed(1)} (${runs[0].it})`, 12)}${pad(`${(runs[1].ms / 1000).toFixed(1)} (${runs[1].it})`, 12)}${pad((runs[1].ms / runs[0].ms).toFixed(2), 8)}(different problems: for information) ${runs[0].status}/${runs[1].status}`);

const cat = parsed(latticeTower({ levels: LEVELS, bands: BANDS, sections: SECTIONS, sizing: "catalogue" }));
const t = performance.now();
const r = optimizeModel(cat);
const s = (performance.now() - t) / 1000;
console.log(`\ncatalogue sizing: ${cat.members.length} members, ${r.catalogue?.choices.length} groups, ${cat.sections!.length} sections, own weight + ${cat.combinations!.length} combinations`);
console.log(`${pad("wall time (s)", 52)}${pad(s.toFixed(1), 24)}target < 60`);
console.log(`${pad("status", 52)}${r.status}: ${r.message}`);
console.log(`${pad("mass: continuous / round-up-and-repair / catalogue (t)", 52)}${r.continuousObjective?.toFixed(3)} / ${r.catalogue?.roundedObjective.toFixed(3)} / ${r.objective.final.toFixed(3)}`);
console.log(`${pad("discrete search: full analyses", 52)}${r.catalogue?.analyses}`);
console.log(`${pad("every limit met by re-analysis", 52)}${r.verification?.allLimitsMet}`);
