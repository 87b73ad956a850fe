// Runs tests/python/lattice_scipy.py with a python3 that has scipy (Debian's python3-scipy).
import { spawnSync } from "node:child_process";
import path from "node:path";
import { findScipy, loudSkip, scipyEnv } from "../../support/scipy";

export function scipyAvailable(): boolean {
  return findScipy() !== null;
}

export function warnNoScipy(what: string): void {
  loudSkip(what);
}

export function scipySolve(model: unknown): { displacements: Record<string, number[][]>; factorSolveSeconds: number; scipy: string } {
  const py = findScipy();
  if (!py) throw new Error("python3 with scipy not found");
  const script = path.join(import.meta.dirname, "../../python/lattice_scipy.py");
  const r = spawnSync(py.python, [script], { input: JSON.stringify(model), encoding: "utf8", maxBuffer: 1 << 30, env: scipyEnv });
  if (r.status !== 0) throw new Error(`lattice_scipy.py failed: ${r.stderr}`);
  return JSON.parse(r.stdout);
}
