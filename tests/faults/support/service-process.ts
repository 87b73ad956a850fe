// A stand-in service (service-child.ts) in a child process the test controls: stop it with
// SIGKILL, start it again on the same port over the same data, freeze and thaw it.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";

const childFile = path.join(import.meta.dirname, "service-child.ts");

export class ServiceProcess {
  private proc: ChildProcess | null = null;
  private output: string[] = [];

  constructor(
    readonly name: string,
    private readonly args: string[],
  ) {}

  get running(): boolean {
    return this.proc !== null;
  }

  /** Start, and resolve once it listens (a port just freed may take a moment to rebind). */
  async start(timeoutMs = 20_000): Promise<void> {
    if (this.proc) return;
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const proc = spawn(process.execPath, ["--import", "tsx", childFile, ...this.args], { stdio: ["ignore", "pipe", "pipe"] });
      const ready = await new Promise<boolean>((resolve) => {
        let buf = "";
        const take = (chunk: Buffer) => {
          buf += chunk.toString();
          this.output.push(chunk.toString());
          if (buf.includes("ready")) resolve(true);
        };
        proc.stdout!.on("data", take);
        proc.stderr!.on("data", (chunk: Buffer) => this.output.push(chunk.toString()));
        proc.once("exit", () => resolve(false));
      });
      if (ready) {
        this.proc = proc;
        proc.once("exit", () => {
          if (this.proc === proc) this.proc = null;
        });
        return;
      }
      if (Date.now() > deadline) throw new Error(`${this.name} did not start: ${this.output.slice(-5).join("")}`);
      await new Promise((r) => setTimeout(r, 250));
    }
  }

  /** Kill it outright: every open connection drops, nothing is flushed. */
  async kill(): Promise<void> {
    const proc = this.proc;
    if (!proc) return;
    const exited = new Promise((r) => proc.once("exit", r));
    proc.kill("SIGCONT"); // a frozen process must be able to die
    proc.kill("SIGKILL");
    await exited;
    this.proc = null;
  }

  /** Freeze it: connections are accepted by the kernel but nothing answers. */
  pause(): void {
    this.proc?.kill("SIGSTOP");
  }

  resume(): void {
    this.proc?.kill("SIGCONT");
  }
}
