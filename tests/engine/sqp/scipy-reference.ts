// Runs tests/python/slsqp_hs.py on table problems.
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { findScipy, scipyEnv } from "../../support/scipy";
import type { HsProblem } from "./hock-schittkowski";

export { findScipy, loudSkip } from "../../support/scipy";

export interface SlsqpRun {
  id: string;
  x: number[];
  fun: number;
  nit: number;
  nfev: number;
  njev: number;
  success: boolean;
  message: string;
  seconds: number;
}


export function runSlsqp(problems: HsProblem[]): SlsqpRun[] {
  const py = findScipy();
  if (!py) throw new Error("python3 with scipy not found");
  const script = fileURLToPath(new URL("../../python/slsqp_hs.py", import.meta.url));
  const r = spawnSync(py.python, [script], { input: JSON.stringify(problems), encoding: "utf8", maxBuffer: 64 << 20, env: scipyEnv });
  if (r.status !== 0) throw new Error(`slsqp_hs.py failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as SlsqpRun[];
}
