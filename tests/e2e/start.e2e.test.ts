// `npm start` as a user runs it (on the build the e2e script made): it serves a green health
// check, a stop leaves no process behind, a second start reuses the data, and a child that
// dies on its own takes the rest down with a non-zero exit that names it.
import { createClient } from "@libsql/client";
import getPort from "get-port";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawnChild, type Child } from "../../scripts/process-group";

const root = path.resolve(import.meta.dirname, "../..");
let dataDir: string;
let env: NodeJS.ProcessEnv;
let port: number;
const started: Child[] = [];

/** Every process descending from pid (from /proc), with the command each runs. */
function descendants(pid: number): { pid: number; cmd: string }[] {
  const parent = new Map<number, number>();
  for (const entry of fs.readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      parent.set(Number(entry), ppid);
    } catch {
      // the process ended while we looked
    }
  }
  const out: { pid: number; cmd: string }[] = [];
  for (const candidate of parent.keys()) {
    for (let p = parent.get(candidate); p && p > 1; p = parent.get(p)) {
      if (p === pid) {
        let cmd = "";
        try {
          cmd = fs.readFileSync(`/proc/${candidate}/cmdline`, "utf8").replace(/\0/g, " ").trim();
        } catch {
          // gone
        }
        out.push({ pid: candidate, cmd });
        break;
      }
    }
  }
  return out;
}

function alive(pid: number): boolean {
  try {
    const state = fs.readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1]?.[0];
    return state !== undefined && state !== "Z";
  } catch {
    return false;
  }
}

async function waitUntilGone(tree: { pid: number }[], ms: number): Promise<void> {
  const deadline = Date.now() + ms;
  while (tree.some((p) => alive(p.pid)) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
}

// exactly the user's command (npm, then the script's `exec tsx`), on the build made beforehand
async function startDesk(): Promise<Child> {
  const child = spawnChild("start", "npm", ["start", "--silent", "--", "--no-build"], {
    env,
    cwd: root,
    echo: Boolean(process.env.E2E_VERBOSE),
  });
  started.push(child);
  const deadline = Date.now() + 90_000;
  while (!child.recentOutput().includes("Ctrl-C stops everything")) {
    if (child.proc.exitCode !== null) throw new Error(`npm start exited early:\n${child.recentOutput()}`);
    if (Date.now() > deadline) throw new Error(`npm start did not come up:\n${child.recentOutput()}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  return child;
}

async function projectCount(): Promise<number> {
  const client = createClient({ url: `file:${path.join(dataDir, "strutwise.db")}` });
  try {
    const r = await client.execute("select count(*) as n from projects");
    return Number(r.rows[0].n);
  } finally {
    client.close();
  }
}

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-start-"));
  port = await getPort();
  env = {
    ...process.env,
    PORT: String(port),
    S3_PORT: String(await getPort()),
    SMTP_PORT: String(await getPort()),
    MAIL_HTTP_PORT: String(await getPort()),
    DATA_DIR: dataDir,
    WORKER_THREADS: "1",
  };
  for (const k of ["VITEST", "VITEST_POOL_ID", "VITEST_WORKER_ID", "NODE_ENV", "DATABASE_URL", "S3_ENDPOINT", "MAIL_CATCHER_URL"])
    delete env[k];
});

afterAll(async () => {
  for (const c of started) await c.stop(2000);
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe("npm start", () => {
  it("serves an all-green health check and stops without leaving a process behind", async () => {
    const desk = await startDesk();
    const res = await fetch(`http://127.0.0.1:${port}/api/health`);
    expect(await res.json()).toEqual({ db: "ok", storage: "ok", mail: "ok" });
    expect(desk.recentOutput()).toMatch(/seeded 3 demo project\(s\)/);
    expect(desk.recentOutput()).toContain(`running at http://localhost:${port}`);

    const tree = descendants(desk.proc.pid!);
    expect(tree.some((p) => p.cmd.includes("react-router-serve"))).toBe(true);

    desk.proc.kill("SIGTERM");
    const exit = await desk.exited;
    // npm itself reports either 0 or 143 (128 + SIGTERM) depending on which of its handlers
    // wins the race; the supervisor's own clean shutdown is what counts
    expect([0, 143]).toContain(exit.code);
    // npm may be gone before the supervisor has finished: allow the stop its grace period
    await waitUntilGone(tree, 20_000);
    expect(tree.filter((p) => alive(p.pid))).toEqual([]);
    expect(desk.recentOutput()).toMatch(/\[start\] stopped$/m);
    await expect(fetch(`http://127.0.0.1:${port}/api/health`)).rejects.toThrow();
  });

  it("reuses the data on a second start and adds nothing twice", async () => {
    expect(await projectCount()).toBe(3);
    const desk = await startDesk();
    expect(desk.recentOutput()).toContain("demo projects already there");
    expect(await projectCount()).toBe(3);
    const tree = descendants(desk.proc.pid!);
    desk.proc.kill("SIGTERM");
    expect([0, 143]).toContain((await desk.exited).code);
    await waitUntilGone(tree, 20_000);
    expect(desk.recentOutput()).toMatch(/\[start\] stopped$/m);
  });

  it("stops everything with a non-zero exit naming the child when the web server dies", async () => {
    const desk = await startDesk();
    const tree = descendants(desk.proc.pid!);
    const web = tree.find((p) => p.cmd.includes("react-router-serve"));
    expect(web).toBeDefined();
    process.kill(web!.pid, "SIGKILL");
    const exit = await desk.exited;
    expect(exit.code).toBe(1);
    expect(desk.recentOutput()).toMatch(/the web process exited unexpectedly \(SIGKILL\); stopping the rest/);
    await waitUntilGone(tree, 20_000);
    expect(tree.filter((p) => alive(p.pid))).toEqual([]);
  });

  it("refuses a wrong variable with a message naming it, and exits 1", async () => {
    const child = spawnChild("start", process.execPath, ["--import", "tsx", "scripts/start.ts", "--no-build"], {
      env: { ...env, PORT: "forty-three-ten" },
      cwd: root,
      echo: false,
    });
    started.push(child);
    expect((await child.exited).code).toBe(1);
    expect(child.recentOutput()).toContain('PORT (got "forty-three-ten"): must be a whole number from 1 to 65535');
    expect(child.recentOutput()).not.toMatch(/\n\s+at /);
  });
});
