// Runs tests/python/slsqp_truss.py (scipy.optimize SLSQP, Debian's python3-scipy) on the same
// sizing problem the design engine solves, with the same scaled variables and ratio limits.
import { spawnSync } from "node:child_process";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { findScipy, scipyEnv } from "../../support/scipy";
import type { DesignProblem } from "~/engine/design/problem";

const script = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../../python/slsqp_truss.py");

/** A python3 that imports scipy, or null (callers skip loudly). */
export function scipyPython(): string | null {
  return findScipy()?.python ?? null;
}

export interface SlsqpOutcome {
  x: number[];
  f: number;
  nit: number;
  nfev: number;
  njev: number;
  success: boolean;
  message: string;
  seconds: number;
  /** stopped by maxSeconds: nit iterations done in `seconds` */
  capped?: boolean;
  /** the whole python process, spawn to exit (start-up and imports included), measured here */
  processSeconds: number;
  /** the python process's peak resident memory */
  peakKiB?: number;
  /** the python process's CPU time (user and system, imports included) */
  cpuSeconds?: number;
  /** runs made, one per starting design (1 without opts.starts) */
  starts?: number;
  /** runs that ended within 1e-4 of the best */
  reachedBest?: number;
}

export function slsqpProblemData(p: DesignProblem, f0: number, maxiter = 500) {
  if (p.shapeVars.length) throw new Error("the scipy reference covers sizing problems only");
  const s = p.structure;
  return {
    coords: Array.from(s.coords),
    fixed: Array.from(s.fixed).flatMap((v, i) => (v ? [i] : [])),
    start: Array.from(s.start), end: Array.from(s.end),
    E: Array.from(s.E), density: Array.from(s.density),
    loads: s.loads.map((f) => Array.from(f)),
    areaVar: Array.from(p.memberVar), scale: p.areaVars.map((v) => v.scale),
    x0: Array.from(p.x0), lower: Array.from(p.lower), upper: Array.from(p.upper),
    objective: p.objective, f0,
    limits: p.limits.map((l) => {
      if (l.kind === "buckling" || l.kind === "length") throw new Error(`the scipy reference has no ${l.kind} limits`);
      return { kind: l.kind, member: l.member, dof: l.dof, sign: l.sign, loadCase: l.loadCase, limit: l.limit };
    }),
    maxiter,
    ftol: 1e-10,
    selfWeight: Array.from(s.selfWeight),
    combinations: s.combinations.map((c) => Array.from(c.factors)),
    gravityAxis: s.gravityAxis,
    weightPerMass: s.weightPerMass,
  };
}

/**
 * maxSeconds: SLSQP stops itself after that much time and reports the iterations done
 * (capped: true); timeoutMs: a hard kill of the process, which then throws. starts: scaled
 * starting designs, run one after the other, the best kept (default: the problem's x0 alone).
 */
export function runSlsqp(
  p: DesignProblem,
  f0: number,
  opts: { maxiter?: number; timeoutMs?: number; maxSeconds?: number; starts?: ArrayLike<number>[] } = {},
): SlsqpOutcome | null {
  const py = scipyPython();
  if (!py) return null;
  const input = JSON.stringify({
    ...slsqpProblemData(p, f0, opts.maxiter),
    ...(opts.maxSeconds ? { maxSeconds: opts.maxSeconds } : {}),
    ...(opts.starts ? { starts: opts.starts.map((z) => Array.from(z)) } : {}),
  });
  const t0 = performance.now();
  const r = spawnSync(py, [script], { input, encoding: "utf8", maxBuffer: 1 << 28, timeout: opts.timeoutMs, env: scipyEnv });
  const processSeconds = (performance.now() - t0) / 1000;
  if (r.status !== 0) throw new Error(`slsqp_truss.py failed (${r.status ?? r.signal}): ${r.stderr}`);
  return { ...(JSON.parse(r.stdout.trim().split("\n").pop()!) as Omit<SlsqpOutcome, "processSeconds">), processSeconds };
}
