// Finds a python3 that has scipy (Debian's /usr/bin/python3 with python3-scipy first, then
// whatever python3 is on PATH) and runs tests/python/slsqp_hs.py on table problems.
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import type { HsProblem } from "./hock-schittkowski";

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

let cached: { python: string; version: string } | null | undefined;

export function findScipy(): { python: string; version: string } | null {
  if (cached !== undefined) return cached;
  cached = null;
  for (const python of ["/usr/bin/python3", "python3"]) {
    const r = spawnSync(python, ["-c", "import scipy; print(scipy.__version__)"], { encoding: "utf8" });
    if (r.status === 0) {
      cached = { python, version: r.stdout.trim() };
      break;
    }
  }
  return cached;
}

export function loudSkip(what: string): void {
  console.warn(
    `\n!!!!!!!! SKIPPED: ${what} — no python3 with scipy found (tried /usr/bin/python3 and python3 on PATH).` +
      `\n!!!!!!!! Install Debian's python3-scipy (apt-get install -y python3-scipy) to run this reference check.\n`,
  );
}

export function runSlsqp(problems: HsProblem[]): SlsqpRun[] {
  const py = findScipy();
  if (!py) throw new Error("python3 with scipy not found");
  const script = fileURLToPath(new URL("../../python/slsqp_hs.py", import.meta.url));
  const r = spawnSync(py.python, [script], { input: JSON.stringify(problems), encoding: "utf8", maxBuffer: 64 << 20 });
  if (r.status !== 0) throw new Error(`slsqp_hs.py failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as SlsqpRun[];
}
