// `npm run -s optimize -- model.truss.json [--formulation nested|simultaneous] [--out result.json] [--starts N] [--time-limit S]`
// Result JSON on stdout (or into --out), progress on stderr.
// Exit codes: 0 optimal, 2 invalid input, 3 infeasible, 4 not converged, 1 anything else.
import fs from "node:fs";

const USAGE = "usage: npm run -s optimize -- model.truss.json [--formulation nested|simultaneous] [--out result.json] [--max-iterations N] [--starts N] [--time-limit S] [--quiet]";
const EXIT = { optimal: 0, failed: 1, infeasible: 3, "not-converged": 4, analysed: 0 } as const;

function fail(code: number, lines: string[]): never {
  for (const l of lines) process.stderr.write(`${l}\n`);
  process.exit(code);
}

function parseArgs(argv: string[]) {
  const out: { file?: string; formulation?: "nested" | "simultaneous"; out?: string; maxIterations?: number; starts?: number; timeLimitS?: number; quiet: boolean } = { quiet: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === "--formulation") {
      const v = argv[++i];
      if (v !== "nested" && v !== "simultaneous") fail(2, [`--formulation must be nested or simultaneous, got "${v ?? ""}"`, USAGE]);
      out.formulation = v;
    } else if (a === "--out") {
      out.out = argv[++i];
      if (!out.out) fail(2, ["--out needs a file name", USAGE]);
    } else if (a === "--max-iterations") {
      const v = Number(argv[++i]);
      if (!Number.isInteger(v) || v < 1) fail(2, [`--max-iterations must be a positive whole number, got "${argv[i] ?? ""}"`, USAGE]);
      out.maxIterations = v;
    } else if (a === "--starts") {
      const v = Number(argv[++i]);
      if (!Number.isInteger(v) || v < 1 || v > 12) fail(2, [`--starts must be a whole number from 1 to 12, got "${argv[i] ?? ""}"`, USAGE]);
      out.starts = v;
    } else if (a === "--time-limit") {
      const v = Number(argv[++i]);
      if (!(v > 0) || !Number.isFinite(v)) fail(2, [`--time-limit must be a positive number of seconds, got "${argv[i] ?? ""}"`, USAGE]);
      out.timeLimitS = v;
    } else if (a === "--quiet") out.quiet = true;
    else if (a === "--help" || a === "-h") fail(0, [USAGE]);
    else if (a.startsWith("--")) fail(2, [`unknown option ${a}`, USAGE]);
    else if (out.file) fail(2, [`only one model file, got "${out.file}" and "${a}"`, USAGE]);
    else out.file = a;
  }
  if (!out.file) fail(2, ["no model file given", USAGE]);
  return out;
}

async function main() {
  const args = parseArgs(process.argv.slice(2));
  // the engine loads only once the arguments are known good: `--help` and a usage error answer
  // without it (the precompiled bundle keeps it in a chunk of its own)
  const { parseModel } = await import("../app/engine/truss");
  const { optimizeModel, plannedStarts, DesignSetupError } = await import("../app/engine/design");
  const { attachLowerBound, boundWithheldWithoutLp, loadHighsSolver, plasticDesignBeforeRun, runUsesLp, withLowerBound } = await import("../app/engine/lp");
  const { formatGap } = await import("../app/lib/lower-bound-words");
  let text: string;
  try {
    text = fs.readFileSync(args.file!, "utf8");
  } catch (e) {
    fail(1, [`cannot read ${args.file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`]);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    fail(2, [`${args.file} is not valid JSON: ${(e as Error).message}`]);
  }
  const parsed = parseModel(json);
  if (!parsed.ok) fail(2, [`${args.file} is not a valid truss model:`, ...parsed.errors.map((e) => `  ${e.path || "(file)"}: ${e.message}`)]);
  for (const w of parsed.warnings) process.stderr.write(`warning ${w.path}: ${w.message}\n`);
  if (!parsed.model.design) fail(2, [`${args.file}: the model has no design block, so there is nothing to optimize (npm run analyze analyses it).`]);

  const units = parsed.model.units;
  const objUnit = (parsed.model.design.objective ?? "mass") === "mass" ? units.mass : `${units.force}·${units.length}`;
  let result;
  const jobOptions = { formulation: args.formulation, maxIterations: args.maxIterations, starts: args.starts };
  // the LP runtime loads only for a run that may solve an LP (a mass run checking no stresses
  // has no bound to take, and it is a tenth of a second of a small model's whole run)
  const lpSolver = runUsesLp(parsed.model, jobOptions) ? await loadHighsSolver() : null;
  // the least-mass LP at the model's geometry, solved once: a start for the solver, then the bound (as in the worker)
  const plastic = lpSolver ? plasticDesignBeforeRun(parsed.model, jobOptions, lpSolver) : null;
  try {
    const timeLimitMs = args.timeLimitS !== undefined ? args.timeLimitS * 1000 : undefined;
    const options = { ...jobOptions, timeLimitMs, plasticStart: plastic?.status === "optimal" ? plastic.memberAreas : undefined };
    const onProgress = args.quiet
      ? undefined
      : (p: { iteration: number; objective: number; maxViolation: number; kktResidual: number }) => process.stderr.write(
          `iteration ${String(p.iteration).padStart(4)}  objective ${p.objective.toPrecision(7)} ${objUnit}  violation ${p.maxViolation.toExponential(2)}  KKT ${p.kktResidual.toExponential(2)}\n`,
        );
    // several starting designs, in parallel solver threads for larger models, as in the worker (multi-start.ts)
    const starts = plannedStarts(parsed.model, options);
    if (starts > 1) {
      if (!args.quiet) process.stderr.write(`running ${starts} starting designs; progress of your start:\n`);
      const { runStarts } = await import("../workers/parallel-starts");
      result = await runStarts(text, parsed.model, options, starts, onProgress);
    } else result = optimizeModel(parsed.model, { ...options, onProgress });
  } catch (e) {
    if (e instanceof DesignSetupError) fail(2, [`${args.file}: ${e.message}`]);
    const err = e as Error;
    fail(1, [`optimization could not run: ${err.message}`]);
  }
  // beside the result, the least-mass certificate (or the reason there is none)
  const withheld = lpSolver ? null : boundWithheldWithoutLp(parsed.model, result, jobOptions);
  result = withheld ? withLowerBound(result, withheld) : attachLowerBound(parsed.model, result, jobOptions, lpSolver ?? (await loadHighsSolver()), plastic);
  const json2 = JSON.stringify(result, null, 2);
  if (args.out) fs.writeFileSync(args.out, json2 + "\n");
  else process.stdout.write(json2 + "\n");
  process.stderr.write(
    `${result.status}: ${result.message}\n` +
      `objective ${result.objective.initial.toPrecision(6)} -> ${result.objective.final.toPrecision(6)} ${objUnit} in ${result.iterations} iterations, ${result.analyses} analyses; ` +
      `re-analysis: max utilization ${result.verification?.maxUtilization.toFixed(3)}, ${result.verification?.allLimitsMet ? "all limits met" : `${result.verification?.failures.length} limit(s) not met`}\n` +
      (result.lowerBound
        ? `lower bound ${result.lowerBound.value.toPrecision(6)} ${objUnit}${result.lowerBound.geometry === "final" ? " (at the final geometry)" : ""}: the design is ${formatGap(result.lowerBound.gap)} above it\n`
        : `no lower bound: ${result.lowerBoundWithheld}\n`) +
      (result.status !== "optimal" && result.hint ? `hint: ${result.hint}\n` : ""),
  );
  process.exitCode = EXIT[result.status] ?? 1;
}

await main();
