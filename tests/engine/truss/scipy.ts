// Runs tests/python/lattice_scipy.py when python3 with scipy is present (Debian's python3-scipy).
import { spawnSync } from "node:child_process";
import path from "node:path";

export function scipyAvailable(): boolean {
  const r = spawnSync("python3", ["-c", "import scipy, numpy"], { encoding: "utf8" });
  return r.status === 0;
}

export function warnNoScipy(what: string): void {
  const line = "!".repeat(78);
  console.warn(`\n${line}\n!!! SKIPPED: ${what}\n!!! python3 with scipy is missing (install Debian's python3-scipy; .ci/run does).\n${line}\n`);
}

export function scipySolve(model: unknown): { displacements: Record<string, number[][]>; factorSolveSeconds: number; scipy: string } {
  const script = path.join(import.meta.dirname, "../../python/lattice_scipy.py");
  const r = spawnSync("python3", [script], { input: JSON.stringify(model), encoding: "utf8", maxBuffer: 1 << 30 });
  if (r.status !== 0) throw new Error(`lattice_scipy.py failed: ${r.stderr}`);
  return JSON.parse(r.stdout);
}
