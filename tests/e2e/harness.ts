// End-to-end harness: the built app (build/ — `npm run test:e2e` builds first) with its own
// S3 fake, mail catcher and database in a temp folder, on free loopback ports. Migrates and
// seeds through the real seed command, starts react-router-serve (and the queue worker when
// that exists), waits for an all-green /api/health, and stops the whole process tree.
import getPort from "get-port";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import type { MailCatcher } from "../../local-services/mail-catcher";
import { runStep, spawnChild, type Child } from "../../scripts/process-group";
import type { DemoAccount, SeedReport } from "../../scripts/seed";
import { startTestServices, type TestServices } from "../support/services";

const root = path.resolve(import.meta.dirname, "../..");
const serverBuild = path.join(root, "build/server/index.js");
const workerFile = path.join(root, "workers/queue-worker.ts");

export interface StartAppOptions {
  /** Start the queue worker process when workers/queue-worker.ts exists (default true). */
  worker?: boolean;
  /** Extra or overriding env variables for the server and worker. */
  env?: Record<string, string>;
  /** Run the demo seed (default true); migrations always run. */
  seed?: boolean;
  /** Echo the children's output with a prefix (default: only when E2E_VERBOSE is set). */
  echo?: boolean;
  /** Services started by the caller (the fault tests run them as processes they control); stopped with the app. */
  services?: TestServices;
}

export interface RunningApp {
  baseUrl: string;
  /** The env the server and worker run with (DATABASE_URL, S3_*, SMTP_*, ...). */
  env: Record<string, string>;
  /** The temp folder holding the database, bucket and caught mail. */
  dir: string;
  mail: MailCatcher;
  /** The demo accounts the seed created (empty until the sign-in part provides them). */
  accounts: DemoAccount[];
  seed: SeedReport | null;
  /** Whether a worker process was started. */
  worker: boolean;
  /** Recent output of the server ("web") and worker, for diagnosing a failure. */
  logs(): string;
  /** The web server and worker processes as started (the fault tests kill workers). */
  processes: { web: Child; worker: Child | null };
  /** Start one more queue worker process with the app's env (and these overrides); stopped with the app. */
  startWorker(name: string, env?: Record<string, string>): Child;
  stop(): Promise<void>;
}

async function waitForBuild(timeoutMs = 60_000): Promise<void> {
  // Another suite may be rebuilding the shared build/ right now; wait for it to reappear.
  const deadline = Date.now() + timeoutMs;
  while (!fs.existsSync(serverBuild)) {
    if (Date.now() > deadline)
      throw new Error(`No server build at ${path.relative(root, serverBuild)}: run \`npm run build\` (npm run test:e2e does).`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

async function waitForHealth(baseUrl: string, children: Child[], timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let last = "no answer yet";
  for (;;) {
    for (const c of children) {
      if (c.proc.exitCode !== null || c.proc.signalCode !== null)
        throw new Error(`The ${c.name} process exited before the app was up:\n${c.recentOutput()}`);
    }
    try {
      const res = await fetch(`${baseUrl}/api/health`, { signal: AbortSignal.timeout(5000) });
      if (res.status === 200) return;
      last = `${res.status} ${await res.text()}`;
    } catch (e) {
      last = e instanceof Error ? e.message : String(e);
    }
    if (Date.now() > deadline) {
      const output = children.map((c) => `--- ${c.name} ---\n${c.recentOutput()}`).join("\n");
      throw new Error(`/api/health did not answer 200 within ${timeoutMs / 1000} s (last: ${last})\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
}

export async function startApp(opts: StartAppOptions = {}): Promise<RunningApp> {
  await waitForBuild();
  const echo = opts.echo ?? Boolean(process.env.E2E_VERBOSE);
  const services = opts.services ?? (await startTestServices({ applyEnv: false }));
  const children: Child[] = [];
  const stopAll = async () => {
    await Promise.all(children.map((c) => c.stop()));
    await services.stop();
  };

  try {
    const port = await getPort();
    const baseUrl = `http://127.0.0.1:${port}`;
    const env: Record<string, string> = {
      ...services.env,
      NODE_ENV: "production",
      PORT: String(port),
      HOST: "127.0.0.1",
      APP_URL: baseUrl,
      BETTER_AUTH_SECRET: crypto.randomBytes(32).toString("hex"),
      WORKER_THREADS: "1",
      AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
      ...opts.env,
    };
    const childEnv = { ...process.env, ...env };
    // vitest marks its own workers; the app must not think it runs under a test runner
    delete childEnv.VITEST;
    delete childEnv.VITEST_POOL_ID;
    delete childEnv.VITEST_WORKER_ID;
    // node with tsx as a loader (not the tsx CLI, which may SIGKILL a child slow to take a signal)
    const node = process.execPath;
    const ts = (file: string) => ["--import", "tsx", file];

    let seed: SeedReport | null = null;
    if (opts.seed === false) {
      await runStep("migrate", node, ts("scripts/migrate.ts"), { env: childEnv, cwd: root, echo });
    } else {
      const child = spawnChild("seed", node, [...ts("scripts/seed.ts"), "--json"], { env: childEnv, cwd: root, echo });
      const { code } = await child.exited;
      await child.stop();
      if (code !== 0) throw new Error(`Seeding the e2e database failed:\n${child.recentOutput()}`);
      const jsonLine = child.recentOutput().split("\n").reverse().find((l) => l.startsWith("{"));
      seed = jsonLine ? (JSON.parse(jsonLine) as SeedReport) : null;
    }

    const web = spawnChild("web", path.join(root, "node_modules/.bin/react-router-serve"), [serverBuild], {
      env: childEnv,
      cwd: root,
      echo,
    });
    children.push(web);
    const withWorker = opts.worker !== false && fs.existsSync(workerFile);
    const startWorker = (name: string, extra: Record<string, string> = {}) => {
      const child = spawnChild(name, node, ts(workerFile), { env: { ...childEnv, ...extra }, cwd: root, echo, repeatTermAfterMs: 3000 });
      children.push(child);
      return child;
    };
    const worker = withWorker ? startWorker("worker") : null;

    await waitForHealth(baseUrl, children, 60_000);

    return {
      baseUrl,
      env,
      dir: services.dir,
      mail: services.mail,
      accounts: seed?.accounts ?? [],
      seed,
      worker: withWorker,
      logs: () => children.map((c) => `--- ${c.name} ---\n${c.recentOutput()}`).join("\n"),
      processes: { web, worker },
      startWorker,
      stop: stopAll,
    };
  } catch (e) {
    await stopAll();
    throw e;
  }
}
