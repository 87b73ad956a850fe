// Design benchmark: time, iterations and analyses to the optimum for the ten-bar benchmark and
// generated planar ground structures of about 100, 400, 1,000 and 2,500 members (minimum mass
// under a tip deflection limit, minimum compliance under a volume limit), nested beside
// simultaneous, beside scipy SLSQP (tests/python/slsqp_truss.py, same scaled variables, same
// ratio limits, same analytic gradients) when python3-scipy is present, with the time ratio.
// Peak memory (RSS, sampled every iteration) is printed per run. Models under 200 members are
// solved once untimed before the timed run (JIT warm-up; scipy's time is taken after its imports).
//
// Then the stress-limited layout studies (minimum mass under stress limits and a tip deflection
// of span/250) on the 1,041- and 2,560-member ground structures, nested, beside scipy, with the
// targets: optimal in under 60 s (about 1,000 members) and under 600 s (about 2,500).
//
// Each run is capped so the benchmark ends in reasonable time; a capped run prints its status
// (not-converged) and a scipy run stopped by its cap prints "> cap" (the ratio is then a bound).
//   DESIGN_BENCH_LIMIT_S        cap per Strutwise run, default 90
//   DESIGN_BENCH_STRESS_LIMIT_S cap per Strutwise run on the stress-limited layouts, default 600
//   DESIGN_BENCH_SCIPY_LIMIT_S  cap per scipy run, default 120
//   DESIGN_BENCH_MAX_MEMBERS    largest ground structure to run, default 3000
//   DESIGN_BENCH_SIMULTANEOUS_MAX  largest member count for the simultaneous runs, default 3000
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { buildStructure, trussModelSchema, type TrussModel } from "../app/engine/truss";
import { optimizeModel } from "../app/engine/design";
import { buildDesignProblem } from "../app/engine/design/problem";
import { nestedFormulation } from "../app/engine/design/nested";
import { groundStructure } from "../tests/engine/design/ground-structure";
import { runSlsqp, scipyPython } from "../tests/engine/design/slsqp-reference";

const here = path.dirname(fileURLToPath(import.meta.url));
const limitS = Number(process.env.DESIGN_BENCH_LIMIT_S ?? 90);
const scipyLimitS = Number(process.env.DESIGN_BENCH_SCIPY_LIMIT_S ?? 120);
const stressLimitS = Number(process.env.DESIGN_BENCH_STRESS_LIMIT_S ?? 600);
const maxMembers = Number(process.env.DESIGN_BENCH_MAX_MEMBERS ?? 3000);
const simMax = Number(process.env.DESIGN_BENCH_SIMULTANEOUS_MAX ?? 3000);
const hasScipy = scipyPython() !== null;
if (!hasScipy) console.log("!!! python3-scipy not found: the SLSQP columns are left empty (apt-get install -y python3-scipy) !!!");

interface Row {
  problem: string;
  members: number;
  run: string;
  status: string;
  seconds: number;
  iterations: number;
  analyses: number;
  objective: number;
  peakMiB: number;
}

function mib(bytes: number) {
  return bytes / (1 << 20);
}

/** Models this small run once untimed first: otherwise the JIT's warm-up is most of the time. */
const WARM_UP_BELOW = 200;

function ours(model: TrussModel, formulation: "nested" | "simultaneous", capS = limitS): Row {
  if (model.members.length < WARM_UP_BELOW) optimizeModel(model, { formulation });
  (globalThis as { gc?: () => void }).gc?.();
  let peak = process.memoryUsage().rss;
  const t = performance.now();
  const r = optimizeModel(model, {
    formulation,
    timeLimitMs: capS * 1000,
    onProgress: () => {
      peak = Math.max(peak, process.memoryUsage().rss);
    },
  });
  const seconds = (performance.now() - t) / 1000;
  peak = Math.max(peak, process.memoryUsage().rss);
  return {
    problem: model.name, members: model.members.length, run: formulation, status: r.status, seconds,
    iterations: r.iterations, analyses: r.analyses, objective: r.objective.final, peakMiB: mib(peak),
  };
}

function scipy(model: TrussModel): Row | null {
  if (!hasScipy) return null;
  const p = buildDesignProblem(model, buildStructure(model), {});
  const f0 = nestedFormulation(p).objectiveScale;
  const t = performance.now();
  try {
    // SLSQP stops itself at the cap and reports the iterations it did; the kill is a backstop
    const r = runSlsqp(p, f0, { maxiter: 3000, maxSeconds: scipyLimitS, timeoutMs: (scipyLimitS + 120) * 1000 })!;
    return {
      problem: model.name, members: model.members.length, run: "scipy SLSQP", status: r.success ? "optimal" : r.message,
      seconds: r.seconds, iterations: r.nit, analyses: r.capped ? NaN : r.nfev, objective: r.capped ? NaN : r.f, peakMiB: NaN,
    };
  } catch {
    return {
      problem: model.name, members: model.members.length, run: "scipy SLSQP", status: `stopped at the ${scipyLimitS} s cap`,
      seconds: (performance.now() - t) / 1000, iterations: NaN, analyses: NaN, objective: NaN, peakMiB: NaN,
    };
  }
}

function print(rows: Row[], ref: Row | null) {
  for (const r of rows) {
    const ratio = ref ? ref.seconds / r.seconds : NaN;
    const gap = ref && Number.isFinite(ref.objective) ? (r.objective - ref.objective) / ref.objective : NaN;
    const capped = ref && !Number.isFinite(ref.objective) ? ">" : "";
    console.log(
      [
        String(r.members).padStart(5), r.run.padEnd(13), r.status.padEnd(14).slice(0, 30),
        `${r.seconds.toFixed(2)} s`.padStart(10), String(r.iterations).padStart(5), String(r.analyses).padStart(6),
        r.objective.toPrecision(8).padStart(14),
        Number.isFinite(r.peakMiB) ? `${r.peakMiB.toFixed(0)} MiB`.padStart(9) : "".padStart(9),
        r.iterations > 0 ? `${((1000 * r.seconds) / r.iterations).toFixed(1)} ms/iter`.padStart(14) : "".padStart(14),
        Number.isFinite(ratio) && r.run !== "scipy SLSQP" ? `scipy/ours ${capped}${ratio.toFixed(2)}x` : "",
        Number.isFinite(gap) && r.run !== "scipy SLSQP" ? `objective vs scipy ${(100 * gap).toExponential(1)}%` : "",
      ].join("  "),
    );
  }
}

console.log("members  run            status               time  iters  analyses      objective      peak     per iteration");
const tenBar = trussModelSchema.parse(JSON.parse(fs.readFileSync(path.join(here, "../tests/fixtures/models/design/ten-bar.truss.json"), "utf8")));
console.log(`\n-- ${tenBar.name}`);
{
  const rows = [ours(tenBar, "nested"), ours(tenBar, "simultaneous")];
  const ref = scipy(tenBar);
  print(ref ? [...rows, ref] : rows, ref);
}

const grids = [
  { nx: 6, ny: 4, reach: 2 }, // ~110 members
  { nx: 12, ny: 6, reach: 2 }, // ~420
  { nx: 14, ny: 7, reach: 3 }, // ~1,040
  { nx: 21, ny: 10, reach: 3 }, // ~2,560
];
for (const g of grids) {
  for (const objective of ["mass", "compliance"] as const) {
    const model = trussModelSchema.parse(groundStructure({ ...g, objective, stress: false, deflection: 8 }));
    if (model.members.length > maxMembers) continue;
    console.log(`\n-- ${model.name}, ${objective === "mass" ? "minimum mass, tip deflection limit" : "minimum compliance, volume limit"}`);
    const rows = [ours(model, "nested")];
    if (model.members.length <= simMax) rows.push(ours(model, "simultaneous"));
    const ref = scipy(model);
    print(ref ? [...rows, ref] : rows, ref);
  }
}

// stress-limited layout studies: the targets are time to "optimal"
const stressTargets = [
  { nx: 14, ny: 7, reach: 3, targetS: 60 }, // 1,041 members
  { nx: 21, ny: 10, reach: 3, targetS: 600 }, // 2,560 members
];
for (const g of stressTargets) {
  const model = trussModelSchema.parse(groundStructure({ ...g, objective: "mass", stress: true }));
  if (model.members.length > maxMembers) continue;
  console.log(`\n-- ${model.name}, minimum mass, stress limits and tip deflection span/250 (target: optimal in under ${g.targetS} s)`);
  const rows = [ours(model, "nested", stressLimitS)];
  const ref = scipy(model);
  print(ref ? [...rows, ref] : rows, ref);
  const r = rows[0];
  console.log(`   target ${r.status === "optimal" && r.seconds < g.targetS ? "met" : "NOT met"}: ${r.status} in ${r.seconds.toFixed(1)} s (target < ${g.targetS} s), peak ${r.peakMiB.toFixed(0)} MiB`);
}
