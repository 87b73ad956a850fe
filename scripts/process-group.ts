// Child processes that can be stopped as a whole tree. Each child leads its own process group
// (detached), so one signal to the group also reaches what it spawned (a wrapper's real
// process, a worker's helpers). Used by `npm start` and the e2e harness, which must both
// leave nothing behind. docs/decisions/0001.
import { spawn, type ChildProcess } from "node:child_process";

export interface Exit {
  code: number | null;
  signal: NodeJS.Signals | null;
}

export interface Child {
  name: string;
  proc: ChildProcess;
  /** Resolves when the group leader has exited. */
  exited: Promise<Exit>;
  /** The last lines the child wrote (stdout and stderr interleaved), for error messages. */
  recentOutput(): string;
  stop(graceMs?: number): Promise<void>;
}

export interface SpawnOptions {
  env?: NodeJS.ProcessEnv;
  cwd?: string;
  /** Echo each output line prefixed with "[name] " (default true); lines are always kept. */
  echo?: boolean;
  keepLines?: number;
  /** On stop, send SIGTERM once more after this long if the process is still running. */
  repeatTermAfterMs?: number;
}

const live = new Set<Child>();

// A last resort if the parent exits without stopping its children (an uncaught error, a
// test runner that tears down abruptly): kill every group still known to be running.
process.once("exit", () => {
  for (const child of live) killGroup(child.proc.pid, "SIGKILL");
});

function killGroup(pid: number | undefined, signal: NodeJS.Signals): boolean {
  if (!pid) return false;
  try {
    process.kill(-pid, signal);
    return true;
  } catch {
    return false; // ESRCH: the group is gone
  }
}

function groupAlive(pid: number | undefined): boolean {
  return killGroup(pid, 0 as unknown as NodeJS.Signals);
}

const COLOURS = [36, 35, 33, 32, 34, 31];
let colourIndex = 0;

export function spawnChild(name: string, command: string, args: string[], opts: SpawnOptions = {}): Child {
  const proc = spawn(command, args, {
    cwd: opts.cwd ?? process.cwd(),
    env: opts.env ?? process.env,
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
  });
  const keep = opts.keepLines ?? 200;
  const lines: string[] = [];
  const colour = COLOURS[colourIndex++ % COLOURS.length];
  const tag = process.stdout.isTTY ? `\x1b[${colour}m[${name}]\x1b[0m` : `[${name}]`;

  const onData = (stream: NodeJS.WritableStream) => {
    let partial = "";
    return (chunk: Buffer) => {
      const text = partial + chunk.toString("utf8");
      const parts = text.split("\n");
      partial = parts.pop() ?? "";
      for (const line of parts) {
        lines.push(line);
        if (lines.length > keep) lines.shift();
        if (opts.echo !== false) stream.write(`${tag} ${line}\n`);
      }
    };
  };
  proc.stdout?.on("data", onData(process.stdout));
  proc.stderr?.on("data", onData(process.stderr));

  const exited = new Promise<Exit>((resolve) => {
    proc.once("exit", (code, signal) => resolve({ code, signal }));
    proc.once("error", (e) => {
      lines.push(`could not start ${command}: ${e.message}`);
      resolve({ code: 127, signal: null });
    });
  });

  const child: Child = {
    name,
    proc,
    exited,
    recentOutput: () => lines.join("\n"),
    async stop(graceMs = 8000) {
      const pid = proc.pid;
      const leaderAlive = proc.exitCode === null && proc.signalCode === null;
      if (leaderAlive || groupAlive(pid)) {
        // The leader alone gets SIGTERM while it lives: wrappers (npm, the tsx command) pass
        // signals on, so a signal to the whole group would reach their child twice.
        const term = () => (leaderAlive && proc.exitCode === null && proc.signalCode === null ? proc.kill("SIGTERM") : killGroup(pid, "SIGTERM"));
        term();
        const started = Date.now();
        let repeated = false;
        while (groupAlive(pid) && Date.now() - started < graceMs) {
          // a second SIGTERM after a while asks a graceful process to hurry (the queue worker
          // then hands its running jobs back instead of finishing them)
          if (opts.repeatTermAfterMs !== undefined && !repeated && Date.now() - started >= opts.repeatTermAfterMs) {
            repeated = true;
            term();
          }
          await new Promise((r) => setTimeout(r, 50));
        }
        if (groupAlive(pid)) killGroup(pid, "SIGKILL");
      }
      await Promise.race([exited, new Promise((r) => setTimeout(r, 2000))]);
      // wait for the group's stragglers to be reaped (SIGKILL is not instant)
      const reapBy = Date.now() + 2000;
      while (groupAlive(pid) && Date.now() < reapBy) await new Promise((r) => setTimeout(r, 20));
      live.delete(child);
    },
  };
  live.add(child);
  void exited.then(() => {
    if (!groupAlive(proc.pid)) live.delete(child);
  });
  return child;
}

/** Runs a command to completion with prefixed output; rejects naming the step on failure. */
export async function runStep(name: string, command: string, args: string[], opts: SpawnOptions = {}): Promise<void> {
  const child = spawnChild(name, command, args, opts);
  const { code, signal } = await child.exited;
  await child.stop();
  if (code !== 0) {
    const why = signal ? `was stopped by ${signal}` : `exited with code ${code}`;
    const tail = opts.echo === false ? `\n${child.recentOutput().split("\n").slice(-40).join("\n")}` : "";
    throw new Error(`${name} ${why}${tail}`);
  }
}
