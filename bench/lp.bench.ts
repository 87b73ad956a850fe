// Least-mass bound benchmark (app/engine/lp). Times are CPU time of this process (the machine is
// shared; wall time is printed beside it) and medians of repeated runs.
// 1. a design run without and with the bound, side by side (target: the bound adds under 10 %):
//    the run as the worker makes it, the LP solved once before it (the solver's start, then the
//    bound) and attached after it, on the ten-bar benchmark (one start, and the default several)
//    and ground structures of 109 and 418 members. Measured first, in a thread that has just
//    loaded HiGHS (its code not yet hot: the dearest case); the load and warm-up itself is paid
//    once when a worker thread starts, not per run;
// 2. the bound of planar ground structures of about 2,500 members (target: under 5 s for the
//    issue's 2,458): 18 x 5 nodes with every pair that sees each other joined (2,457 members, the
//    nearest the generator makes) and 21 x 10 nodes within 3 grid steps (2,560), one load case
//    (compact LP form) and two (full form), beside the same LP handed to HiGHS as CPLEX LP text
//    and solved by the simplex method: the reference for the structured path (decision 0012).
import { DEFAULT_STARTS, optimizeModel, optimizeWithStarts, type OptimizeOptions } from "../app/engine/design";
import { attachLowerBound, loadHighsSolver, plasticDesignBeforeRun, plasticInputFromModel, solvePlasticDesign } from "../app/engine/lp";
import { buildLp } from "../app/engine/lp/plastic-lp";
import type { LinearProgram } from "../app/engine/lp/solver";
import { trussModelSchema, type TrussModel } from "../app/engine/truss";
import { groundStructure } from "../tests/engine/design/ground-structure";
import { fixture } from "../tests/engine/design/models";

/** CPU and wall milliseconds of one call. */
function timed<T>(f: () => T): { value: T; cpu: number; wall: number } {
  const c = process.cpuUsage();
  const t = performance.now();
  const value = f();
  const wall = performance.now() - t;
  const u = process.cpuUsage(c);
  return { value, cpu: (u.user + u.system) / 1000, wall };
}
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const msText = (cpu: number, wall: number) => `${cpu.toFixed(0)} ms (wall ${wall.toFixed(0)})`;

const c0 = process.cpuUsage();
const t0 = performance.now();
const solver = await loadHighsSolver();
const load = process.cpuUsage(c0);
console.log(`HiGHS ${solver.version} loaded and warmed in ${msText((load.user + load.system) / 1000, performance.now() - t0)}: once per worker thread, as it starts`);
const highs = await (await import("highs")).default();

/** The same LP as CPLEX LP text: the format's cost, measured. */
function lpText(lp: LinearProgram): string {
  const out: string[] = ["Minimize", " obj: " + Array.from(lp.cost, (c, j) => `${c >= 0 ? "+" : "-"} ${Math.abs(c)} x${j}`).join(" "), "Subject To"];
  const rows: string[][] = Array.from({ length: lp.nRows }, () => []);
  for (let j = 0; j < lp.nCols; j++) {
    for (let k = lp.matrix.starts[j]; k < lp.matrix.starts[j + 1]; k++) {
      const v = lp.matrix.values[k];
      rows[lp.matrix.rows[k]].push(`${v >= 0 ? "+" : "-"} ${Math.abs(v)} x${j}`);
    }
  }
  rows.forEach((terms, r) => {
    if (terms.length === 0) return;
    const lo = lp.rowLower[r], hi = lp.rowUpper[r];
    if (lo === hi) out.push(` r${r}: ${terms.join(" ")} = ${lo}`);
    else {
      if (Number.isFinite(hi)) out.push(` u${r}: ${terms.join(" ")} <= ${hi}`);
      if (Number.isFinite(lo)) out.push(` l${r}: ${terms.join(" ")} >= ${lo}`);
    }
  });
  out.push("Bounds");
  for (let j = 0; j < lp.nCols; j++) {
    const lo = lp.colLower[j], hi = lp.colUpper[j];
    out.push(` ${Number.isFinite(lo) ? lo : "-inf"} <= x${j} <= ${Number.isFinite(hi) ? hi : "+inf"}`);
  }
  out.push("End");
  return out.join("\n");
}

const ground = (nx: number, ny: number, reach: number, loadCases = 1): TrussModel => trussModelSchema.parse(groundStructure({ nx, ny, reach, objective: "mass", loadCases }));

console.log("\n1. A design run without and with the bound, in a thread that just loaded HiGHS (target: the bound adds < 10 %; medians, CPU time)");
console.log("model                          starts  runs   design run      with the bound   added   (gap)");
const runs: [string, TrussModel, number, number][] = [
  ["ten-bar benchmark", fixture("ten-bar.truss.json"), 1, 9],
  ["ten-bar benchmark", fixture("ten-bar.truss.json"), DEFAULT_STARTS, 3],
  ["ground structure, 109 members", ground(6, 4, 2), 1, 3],
  ["ground structure, 418 members", ground(12, 6, 2), 1, 1],
];
for (const [name, model, starts, reps] of runs) {
  // the run as the worker makes it: several starts one after the other here (in threads there)
  const design = (extra: OptimizeOptions = {}) => (starts > 1 ? optimizeWithStarts(model, { starts, ...extra }) : optimizeModel(model, { starts, ...extra }));
  const designMs: number[] = [];
  const boundMs: number[] = [];
  let gap = "";
  design(); // the design code compiled once before timing, as in a worker thread that ran a job before
  for (let k = 0; k < reps; k++) {
    // the bound's two parts (the LP before the run, attached after it) timed apart from the run
    const before = timed(() => plasticDesignBeforeRun(model, {}, solver));
    const plastic = before.value;
    const run = timed(() => design({ plasticStart: plastic?.status === "optimal" ? plastic.memberAreas : undefined }));
    const after = timed(() => attachLowerBound(model, run.value, {}, solver, plastic));
    designMs.push(run.cpu);
    boundMs.push(before.cpu + after.cpu);
    const lb = after.value.lowerBound;
    gap = lb ? `${(100 * lb.gap).toFixed(2)} %${lb.leftOut ? `, leaves out ${lb.leftOut.join(", ")}` : ""}` : "none";
  }
  const a = median(designMs), b = median(boundMs);
  console.log(`${name.padEnd(30)} ${String(starts).padEnd(7)} ${String(reps).padEnd(6)} ${`${a.toFixed(1)} ms`.padEnd(15)} ${`${(a + b).toFixed(1)} ms`.padEnd(16)} ${`${((100 * b) / a).toFixed(1)} %`.padEnd(7)} (${gap})`);
}

console.log("\n2. Bound of a ground structure (target < 5 s for 2,458 members)");
console.log("members  layout                  cases  form     ours: structured (CPU, wall)   reference: LP text + simplex    bound (t)");
for (const [nx, ny, reach, layout] of [[18, 5, 99, "18 x 5, every pair"], [21, 10, 3, "21 x 10, reach 3"]] as const) {
  for (const cases of [1, 2]) {
    const model = ground(nx, ny, reach, cases);
    const ours = timed(() => solvePlasticDesign(plasticInputFromModel(model).input, solver));
    const built = buildLp(plasticInputFromModel(model).input);
    // the reference's simplex needs a minute on the two-case LPs: run once, in the same process
    const ref = timed(() => {
      const text = lpText(built.lp);
      return { size: text.length, status: highs.solve(text, { solver: "simplex" }).Status };
    });
    const r = ours.value;
    console.log(
      `${String(model.members.length).padEnd(8)} ${layout.padEnd(23)} ${String(cases).padEnd(6)} ${built.form.padEnd(8)} ${msText(ours.cpu, ours.wall).padEnd(30)} ` +
        `${`${msText(ref.cpu, ref.wall)}, ${(ref.value.size / 1e6).toFixed(1)} MB`.padEnd(31)} ${r.status === "optimal" ? r.mass.toPrecision(7) : r.status}`,
    );
  }
}

