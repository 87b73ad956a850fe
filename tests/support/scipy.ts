// The outside reference for numerical cross-checks: a python3 that imports scipy and numpy.
// Debian's /usr/bin/python3 with python3-scipy (what .ci/run installs) is tried first, then
// whatever python3 is on PATH. Without one, callers skip loudly, never silently.
import { spawnSync } from "node:child_process";

let found: { python: string; version: string } | null | undefined;

export function findScipy(): { python: string; version: string } | null {
  if (found !== undefined) return found;
  found = null;
  for (const python of ["/usr/bin/python3", "python3"]) {
    const r = spawnSync(python, ["-c", "import numpy, scipy; print(scipy.__version__)"], { encoding: "utf8" });
    if (r.status === 0) {
      found = { python, version: r.stdout.trim() };
      break;
    }
  }
  return found;
}

/**
 * The environment of a scipy process: numpy's BLAS on one thread. By default it starts a
 * thread per core that spin-waits for work; on a machine busy with other work those threads
 * made an SLSQP solve of a 109-member truss 3-10 times slower (0.27 s alone, 0.9-2.7 s beside
 * a test run on 2 cores). The solvers it is compared with run on one thread too.
 */
export const scipyEnv: NodeJS.ProcessEnv = { ...process.env, OPENBLAS_NUM_THREADS: "1", OMP_NUM_THREADS: "1" };

export function loudSkip(what: string): void {
  const line = "!".repeat(78);
  console.warn(
    `\n${line}\n!!! SKIPPED: ${what}\n!!! no python3 with scipy (tried /usr/bin/python3 and python3 on PATH);` +
      `\n!!! install Debian's python3-scipy (apt-get install -y python3-scipy; .ci/run does)\n${line}\n`,
  );
}
