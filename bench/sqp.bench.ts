// SQP solver benchmark (`npm run bench -- sqp`): per Hock-Schittkowski problem (Hock &
// Schittkowski 1981) our iterations, function/gradient evaluations and wall time beside scipy
// SLSQP's (when a python3 with scipy is present), then large synthetic sizing problems to show
// how the time grows with variables and rows (limited-memory Hessian, screening).
import { minimize } from "../app/engine/sqp";
import { hockSchittkowski, toSqpProblem } from "../tests/engine/sqp/hock-schittkowski";
import { findScipy, runSlsqp } from "../tests/engine/sqp/scipy-reference";
import { barChain } from "./sqp-bar-chain";
import { syntheticSizing } from "./sqp-synthetic";

function timeIt(run: () => void, minMs = 150): number {
  let reps = 0;
  const t0 = performance.now();
  do {
    run();
    reps++;
  } while (performance.now() - t0 < minMs && reps < 500);
  return (performance.now() - t0) / reps;
}

const pad = (v: unknown, w: number) => String(v).padStart(w);
const scipy = findScipy();
const ref = scipy ? new Map(runSlsqp(hockSchittkowski).map((r) => [r.id, r])) : null;
console.log(scipy ? `scipy ${scipy.version} via ${scipy.python}` : "scipy not found: SLSQP columns left empty (install python3-scipy)");
console.log(`${"problem".padEnd(8)} ${pad("status", 9)} ${pad("f", 14)} ${pad("it", 4)} ${pad("nf", 4)} ${pad("ng", 4)} ${pad("ms", 8)} | ${pad("slsqp f", 14)} ${pad("it", 4)} ${pad("nf", 4)} ${pad("ng", 4)} ${pad("ms", 8)}`);
let sumOurs = 0;
let sumRef = 0;
for (const p of hockSchittkowski) {
  const problem = toSqpProblem(p);
  const r = minimize(problem);
  const ms = timeIt(() => minimize(problem));
  const s = ref?.get(p.id);
  sumOurs += r.iterations;
  if (s) sumRef += s.nit;
  console.log(
    `${p.id.padEnd(8)} ${pad(r.status, 9)} ${pad(r.f.toPrecision(9), 14)} ${pad(r.iterations, 4)} ${pad(r.evaluations, 4)} ${pad(r.derivativeEvaluations, 4)} ${pad(ms.toFixed(3), 8)} | ` +
      (s ? `${pad(s.fun.toPrecision(9), 14)} ${pad(s.nit, 4)} ${pad(s.nfev, 4)} ${pad(s.njev, 4)} ${pad((s.seconds * 1000).toFixed(3), 8)}${s.success ? "" : "  (" + s.message + ")"}` : ""),
  );
}
console.log(`total iterations: ours ${sumOurs}${ref ? `, SLSQP ${sumRef}` : ""}`);

console.log("\nsynthetic sizing problems (invented; reciprocal utilization rows, bounds 0.05..10), hessian lbfgs:");
console.log(`${pad("n", 6)} ${pad("rows", 6)} ${pad("screen", 7)} ${pad("status", 14)} ${pad("f", 14)} ${pad("it", 4)} ${pad("nf", 5)} ${pad("active", 7)} ${pad("s", 8)} ${pad("s/it", 7)} ${pad("rss MB", 7)}`);
const sizes: [number, number, number][] = [
  [250, 500, Infinity],
  [500, 1000, Infinity],
  [1000, 2000, 0.5],
  [2000, 4000, 0.5],
];
for (const [n, m, screening] of sizes) {
  const problem = syntheticSizing(n, m);
  let active = 0;
  const t0 = performance.now();
  const r = minimize(problem, { hessian: "lbfgs", screening, maxIterations: 150, onProgress: (q) => (active = q.active) });
  const s = (performance.now() - t0) / 1000;
  const rss = process.memoryUsage().rss / 2 ** 20;
  console.log(
    `${pad(n, 6)} ${pad(m, 6)} ${pad(screening, 7)} ${pad(r.status, 14)} ${pad(r.f.toPrecision(9), 14)} ${pad(r.iterations, 4)} ${pad(r.evaluations, 5)} ${pad(active, 7)} ${pad(s.toFixed(2), 8)} ${pad((s / Math.max(1, r.iterations)).toFixed(3), 7)} ${pad(rss.toFixed(0), 7)}`,
  );
}

console.log("\nbar chain, simultaneous formulation (areas and displacements, equilibrium as equalities; closed-form volume):");
for (const N of [5, 20, 50]) {
  for (const [hessian, withStates] of [["bfgs", false], ["lbfgs", false], ["bfgs", true]] as const) {
    const { problem, volume } = barChain(N, 1, 0.01, withStates);
    const t0 = performance.now();
    const r = minimize(problem, { hessian, maxIterations: 200 });
    const s = (performance.now() - t0) / 1000;
    console.log(`N=${N} ${hessian.padEnd(5)} ${(withStates ? "null-space" : "full").padEnd(10)} ${r.status.padEnd(13)} volume ${r.f.toPrecision(8)} (closed form ${volume}) rel.err ${(Math.abs(r.f - volume) / volume).toExponential(1)} it ${r.iterations} ${s.toFixed(2)} s`);
  }
}
