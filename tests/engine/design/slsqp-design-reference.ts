// Runs tests/python/slsqp_design.py (scipy.optimize SLSQP, Debian's python3-scipy) on a design
// problem with area and shape variables and stress, Euler buckling, displacement and length
// limits. Only the problem statement crosses over (arrays of geometry, variables and limits);
// the script analyses the truss and differentiates it with its own numpy code.
import { spawn, spawnSync } from "node:child_process";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { findScipy, scipyEnv } from "../../support/scipy";
import type { DesignProblem } from "~/engine/design/problem";

const script = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../../python/slsqp_design.py");

export interface SlsqpDesignOutcome {
  x: number[];
  f: number;
  nit: number;
  success: boolean;
  message: string;
  seconds: number;
  maxViolation: number;
}

export function slsqpDesignData(p: DesignProblem, f0: number, maxiter: number) {
  const s = p.structure;
  if (s.combinations.length > 0 || s.selfWeight.some((w) => w !== 0)) throw new Error("the design reference covers load cases without own weight only");
  if (p.objective !== "mass") throw new Error("the design reference covers the mass objective only");
  if (p.buckling?.memberI) throw new Error("the design reference covers I = a A^b only");
  return {
    coords: Array.from(s.coords),
    fixed: Array.from(s.fixed).flatMap((v, i) => (v ? [i] : [])),
    start: Array.from(s.start), end: Array.from(s.end),
    E: Array.from(s.E), density: Array.from(s.density),
    loads: s.loads.map((f) => Array.from(f)),
    areaVar: Array.from(p.memberVar), areaScale: p.areaVars.map((v) => v.scale),
    shape: p.shapeVars.map((v) => v.moves.map((mv) => [mv.dof, mv.factor * v.scale])),
    buckling: p.buckling ? { a: p.buckling.a, b: p.buckling.b, k: Array.from(p.buckling.k) } : null,
    x0: Array.from(p.x0), lower: Array.from(p.lower), upper: Array.from(p.upper),
    f0,
    limits: p.limits.map((l) => ({ kind: l.kind, member: l.member, dof: l.dof, sign: l.sign, loadCase: l.loadCase, limit: l.limit })),
    maxiter,
    ftol: 1e-10,
  };
}

/**
 * Solves every problem in one python process (scipy's start-up once); null without a python3
 * that imports scipy (callers skip loudly).
 */
export function runSlsqpDesigns(problems: { p: DesignProblem; f0: number }[], opts: { maxiter?: number; timeoutMs?: number } = {}): SlsqpDesignOutcome[] | null {
  const py = findScipy()?.python;
  if (!py) return null;
  const input = JSON.stringify({ problems: problems.map(({ p, f0 }) => slsqpDesignData(p, f0, opts.maxiter ?? 1000)) });
  const r = spawnSync(py, [script], { input, encoding: "utf8", maxBuffer: 1 << 28, timeout: opts.timeoutMs, env: scipyEnv });
  if (r.status !== 0) throw new Error(`slsqp_design.py failed (${r.status ?? r.signal}): ${r.stderr}`);
  const lines = r.stdout.trim().split("\n");
  if (lines.length !== problems.length) throw new Error(`slsqp_design.py answered ${lines.length} of ${problems.length} problems`);
  return lines.map((l) => JSON.parse(l) as SlsqpDesignOutcome);
}

/** runSlsqpDesigns without blocking: the reference solves while the caller solves its own. */
export function startSlsqpDesigns(problems: { p: DesignProblem; f0: number }[], opts: { maxiter?: number } = {}): Promise<SlsqpDesignOutcome[]> | null {
  const py = findScipy()?.python;
  if (!py) return null;
  const input = JSON.stringify({ problems: problems.map(({ p, f0 }) => slsqpDesignData(p, f0, opts.maxiter ?? 1000)) });
  return new Promise((resolve, reject) => {
    const child = spawn(py, [script], { stdio: ["pipe", "pipe", "pipe"] });
    let out = "";
    let err = "";
    child.stdout.setEncoding("utf8").on("data", (c: string) => (out += c));
    child.stderr.setEncoding("utf8").on("data", (c: string) => (err += c));
    child.on("error", reject);
    child.on("close", (code) => {
      if (code !== 0) return reject(new Error(`slsqp_design.py failed (${code}): ${err}`));
      const lines = out.trim().split("\n");
      if (lines.length !== problems.length) return reject(new Error(`slsqp_design.py answered ${lines.length} of ${problems.length} problems`));
      resolve(lines.map((l) => JSON.parse(l) as SlsqpDesignOutcome));
    });
    child.stdin.end(input);
  });
}
