// Whole-process runs for the design benchmark: every run is a process of its own, timed in
// this process from spawn to exit, so start-up counts on both sides as a user meets it —
// `node scripts/run-tool.mjs optimize` (what `npm run optimize` runs, without npm's own
// wrapper, which adds the same 0.2 s to any command) and python3 tests/python/slsqp_truss.py
// (scipy SLSQP; its imports of numpy and scipy included). Each process's CPU time (user and
// system, solver threads included) is printed beside its wall time: on a shared machine the
// wall time carries the other users' load, the CPU time much less of it. Peak memory is each
// process's own maximum resident set (solver threads included).
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { buildStructure, type TrussModel } from "../app/engine/truss";
import { buildDesignProblem } from "../app/engine/design/problem";
import { nestedFormulation } from "../app/engine/design/nested";
import { startingDesigns } from "../app/engine/design/multi-start";
import { plasticDesignBeforeRun, type LpSolver } from "../app/engine/lp";
import { runSlsqp, scipyPython } from "../tests/engine/design/slsqp-reference";

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, "..");
const work = fs.mkdtempSync(path.join(os.tmpdir(), "sw-design-bench-"));
process.on("exit", () => fs.rmSync(work, { recursive: true, force: true }));

export interface Run {
  /** what ran, e.g. "nested, 6 starts" or "scipy SLSQP, 1 start" */
  label: string;
  /** starting designs run */
  starts: number;
  status: string;
  /** the whole process, spawn to exit */
  processS: number;
  /** the whole process's CPU time, user and system, all its threads */
  cpuS: number;
  /** the solve alone, as the process reports it (ours: the result's elapsed time; scipy: after its imports) */
  solveS: number;
  iterations: number;
  analyses: number;
  objective: number;
  peakMiB: number;
  /** scipy stopped at its cap: its time is a lower bound */
  capped?: boolean;
}

export interface OursSetup {
  formulation: "nested" | "simultaneous";
  /** undefined: the command's default (several starts on small models) */
  starts?: number;
  capS: number;
}

/** One `optimize` process on the model (written to a file first, as a user would have it). */
export function oursWholeProcess(model: TrussModel, setup: OursSetup): Run {
  const modelFile = path.join(work, "model.truss.json");
  const outFile = path.join(work, "result.json");
  const usageFile = path.join(work, "process-usage.json");
  fs.writeFileSync(modelFile, JSON.stringify(model));
  fs.rmSync(outFile, { force: true });
  const args = [modelFile, "--quiet", "--out", outFile, "--formulation", setup.formulation, "--time-limit", String(setup.capS)];
  if (setup.starts !== undefined) args.push("--starts", String(setup.starts));
  const t0 = performance.now();
  const r = spawnSync(process.execPath, ["--require", path.join(here, "process-usage.cjs"), path.join(root, "scripts/run-tool.mjs"), "optimize", ...args], {
    cwd: root,
    encoding: "utf8",
    env: { ...process.env, BENCH_PROCESS_USAGE_FILE: usageFile, STRUTWISE_QUIET_BUNDLE: "1" },
  });
  const processS = (performance.now() - t0) / 1000;
  if (!fs.existsSync(outFile)) throw new Error(`optimize wrote no result (exit ${r.status ?? r.signal}): ${r.stderr}`);
  const res = JSON.parse(fs.readFileSync(outFile, "utf8"));
  const starts: number = res.starts?.tried ?? 1;
  const usage = JSON.parse(fs.readFileSync(usageFile, "utf8")) as { peakKiB: number; cpuSeconds: number };
  return {
    label: `${setup.formulation}, ${starts} start${starts === 1 ? "" : "s"}`,
    starts,
    status: res.status,
    processS,
    cpuS: usage.cpuSeconds,
    solveS: res.solver.elapsedMs / 1000,
    iterations: res.iterations,
    analyses: res.analyses,
    objective: res.objective.final,
    peakMiB: usage.peakKiB / 1024,
  };
}

export const hasScipy = scipyPython() !== null;

/**
 * The starting designs our several-starts run makes on this model (multi-start.ts, the
 * least-mass LP's among them when the run solves it), for scipy to run from the same ones.
 */
export function ourStartingDesigns(model: TrussModel, count: number, lp: LpSolver): Float64Array[] {
  const p = buildDesignProblem(model, buildStructure(model), {});
  const plastic = plasticDesignBeforeRun(model, {}, lp);
  return startingDesigns(p, count, plastic?.status === "optimal" ? plastic.memberAreas : undefined).map((s) => s.z);
}

/**
 * One scipy SLSQP process on the same scaled sizing problem: from the model's own start, or
 * from each of `starts` one after the other, keeping the best (like against like for our
 * several-starts runs).
 */
export function scipyWholeProcess(model: TrussModel, capS: number, starts?: Float64Array[]): Run | null {
  if (!hasScipy) return null;
  const p = buildDesignProblem(model, buildStructure(model), {});
  const f0 = nestedFormulation(p).objectiveScale;
  const count = starts?.length ?? 1;
  const label = `scipy SLSQP, ${count} start${count === 1 ? "" : "s"}`;
  try {
    // SLSQP stops itself at the cap and reports the iterations it did; the kill is a backstop
    const r = runSlsqp(p, f0, { maxiter: 3000, maxSeconds: capS, timeoutMs: (capS + 120) * 1000, starts })!;
    return {
      label, starts: count, status: r.success ? "optimal" : r.message, processS: r.processSeconds, cpuS: r.cpuSeconds ?? NaN, solveS: r.seconds, iterations: r.nit,
      analyses: r.capped ? NaN : r.nfev, objective: r.capped ? NaN : r.f, peakMiB: (r.peakKiB ?? NaN) / 1024, capped: r.capped,
    };
  } catch {
    return { label, starts: count, status: `killed after the ${capS} s cap`, processS: NaN, cpuS: NaN, solveS: NaN, iterations: NaN, analyses: NaN, objective: NaN, peakMiB: NaN, capped: true };
  }
}

/** The faster of two runs of the same setup (same results; their times differ by the machine's load). */
export function faster(a: Run | null, b: Run | null): Run | null {
  if (!a || !b) return a ?? b;
  return b.processS < a.processS ? b : a;
}
