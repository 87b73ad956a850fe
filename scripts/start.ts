// `npm start`: the whole desk on one machine. Validates the configuration, builds when the
// build is missing or older than the sources, starts the local S3 fake and mail catcher
// (unless LOCAL_SERVICES=off), migrates, seeds the demo scenario (idempotent), then runs the
// web server and the queue worker as child process groups with prefixed output.
// Ctrl-C / SIGTERM stops everything; a child that dies on its own stops the rest (exit 1).
// `npm run dev` (--dev): the same, with `react-router dev` (hot reload) as the web server.
// `--no-build`: serve the existing build/ without checking whether it is stale.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { spawnChild, type Child } from "./process-group";
import { ConfigError, parseConfig, type Config } from "~/lib/config.server";
import type { DemoAccount } from "./seed";

const root = path.resolve(import.meta.dirname, "..");
const bin = (name: string) => path.join(root, "node_modules/.bin", name);
const dev = process.argv.includes("--dev");
// --no-build: serve build/ as it is (the tests use it; they build once beforehand)
const skipBuild = process.argv.includes("--no-build");

function log(message: string) {
  console.log(`[start] ${message}`);
}

function newestMtime(target: string): number {
  if (!fs.existsSync(target)) return 0;
  const stat = fs.statSync(target);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of fs.readdirSync(target)) {
    if (entry === "node_modules" || entry.startsWith(".")) continue;
    newest = Math.max(newest, newestMtime(path.join(target, entry)));
  }
  return newest;
}

/** Why a build is needed, or null when build/ is newer than every source it is made from. */
export function buildNeeded(dir = root): string | null {
  const server = path.join(dir, "build/server/index.js");
  if (!fs.existsSync(server) || !fs.existsSync(path.join(dir, "build/client"))) return "there is no build yet";
  const built = fs.statSync(server).mtimeMs;
  const sources = ["app", "public", "vite.config.ts", "react-router.config.ts", "tsconfig.json", "package.json"];
  const changed = sources.find((s) => newestMtime(path.join(dir, s)) > built);
  return changed ? `${changed} changed since the last build` : null;
}

// Sessions are signed with BETTER_AUTH_SECRET. On a machine running its own local services
// and no secret given, one is made on the first start and kept beside the data (so sign-ins
// survive a restart); a deployment with real services must set its own.
function ensureLocalSecret(): void {
  if (process.env.BETTER_AUTH_SECRET || process.env.LOCAL_SERVICES === "off") return;
  const dataDir = path.resolve(root, process.env.DATA_DIR || ".data");
  const file = path.join(dataDir, "auth-secret");
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataDir, { recursive: true });
    fs.writeFileSync(file, crypto.randomBytes(32).toString("hex"), { mode: 0o600 });
  }
  process.env.BETTER_AUTH_SECRET = fs.readFileSync(file, "utf8").trim();
}

function loadConfig(): Config {
  // validate what the children will see: react-router-serve runs in production mode
  process.env.NODE_ENV = dev ? "development" : process.env.NODE_ENV || "production";
  ensureLocalSecret();
  try {
    return parseConfig(process.env);
  } catch (e) {
    if (e instanceof ConfigError) {
      console.error(e.message);
      console.error("Fix the variable(s) above and start again.");
      process.exit(1);
    }
    throw e;
  }
}

async function waitForHealth(url: string, children: Child[], timeoutMs: number): Promise<string> {
  const deadline = Date.now() + timeoutMs;
  let last = "no answer";
  while (Date.now() < deadline) {
    if (children.some((c) => c.proc.exitCode !== null || c.proc.signalCode !== null)) return "a process exited";
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(5000) });
      const body = await res.text();
      if (res.status === 200) return "ok";
      last = `${res.status} ${body}`;
    } catch (e) {
      last = e instanceof Error ? e.message : String(e);
    }
    await new Promise((r) => setTimeout(r, 1000));
  }
  return last;
}

async function main() {
  const c = loadConfig();
  // Resolved defaults go into the environment, so that this process and every child agree.
  process.env.DATABASE_URL = c.DATABASE_URL;
  process.env.S3_ENDPOINT = c.S3_ENDPOINT;
  if (c.MAIL_CATCHER_URL) process.env.MAIL_CATCHER_URL = c.MAIL_CATCHER_URL;
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true";

  let services: import("../local-services/run").LocalServices | null = null;
  const children: Child[] = [];
  let stopping = false;

  const stopEverything = async (exitCode: number) => {
    if (stopping) return;
    stopping = true;
    log("stopping…");
    await Promise.all(children.map((ch) => ch.stop(12_000)));
    await services?.stop().catch(() => undefined);
    log("stopped");
    process.exit(exitCode);
  };
  let firstSignalAt = 0;
  for (const sig of ["SIGINT", "SIGTERM", "SIGHUP"] as const) {
    process.on(sig, () => {
      // Ctrl-C reaches us twice at once (from the terminal, and from npm passing it on): only a repeat
      // after a moment means "do not wait"
      if (firstSignalAt && Date.now() - firstSignalAt > 1500) {
        // a second Ctrl-C: do not wait for a graceful shutdown
        log("forced stop");
        for (const ch of children) ch.stop(0);
        process.exit(130);
      }
      firstSignalAt ||= Date.now();
      void stopEverything(0);
    });
  }

  // If whatever started us dies without a signal (kill -9 of npm), we are re-parented:
  // take the children down with us rather than leave them running unattended.
  const parent = process.ppid;
  setInterval(() => {
    if (process.ppid !== parent && !stopping) {
      console.error("[start] the parent process went away; stopping everything");
      void stopEverything(1);
    }
  }, 1000).unref();

  try {
    if (!dev && skipBuild && !fs.existsSync(path.join(root, "build/server/index.js"))) {
      throw new Error("--no-build was given but there is no build/ yet: run `npm run build` first");
    }
    if (!dev && !skipBuild) {
      const why = buildNeeded();
      if (why) {
        log(`building (${why})…`);
        const started = Date.now();
        // quiet unless it fails: the asset listing is long and says nothing new
        const build = spawnChild("build", bin("react-router"), ["build"], { cwd: root, echo: false });
        children.push(build);
        const { code, signal } = await build.exited;
        children.splice(children.indexOf(build), 1);
        if (stopping) return;
        if (code !== 0) {
          const tail = build.recentOutput().split("\n").slice(-40).join("\n");
          throw new Error(`the build ${signal ? `was stopped by ${signal}` : "failed"}, nothing was started:\n${tail}`);
        }
        log(`built in ${((Date.now() - started) / 1000).toFixed(1)} s`);
      } else log("build is up to date");
    }

    if (c.LOCAL_SERVICES === "on") {
      const { startLocalServices, describeLocalServices } = await import("../local-services/run");
      services = await startLocalServices(c);
      for (const line of describeLocalServices(services, c)) log(line);
    } else log(`LOCAL_SERVICES=off: using S3 at ${c.S3_ENDPOINT} and SMTP at ${c.SMTP_HOST}:${c.SMTP_PORT}`);

    // Migrate and seed in this process, before any child reads the database.
    const { db } = await import("~/db/client.server");
    const { migrateDb } = await import("~/db/migrate.server");
    const { ensureBucket } = await import("~/lib/storage.server");
    const { seed, accountsTable } = await import("./seed");
    await migrateDb(db());
    log(`database ${c.DATABASE_URL} migrated`);
    await ensureBucket().catch((e: Error) => {
      throw new Error(`the bucket "${c.S3_BUCKET}" at ${c.S3_ENDPOINT} cannot be reached or created: ${e.message}`);
    });
    let accounts: DemoAccount[] | null = null;
    if (c.SEED_DEMO === "on") {
      const report = await seed(db());
      accounts = report.accounts;
      const created = report.projects.filter((p) => p.created).length;
      log(created ? `seeded ${created} demo project(s)` : "demo projects already there: reusing the data");

    } else log("SEED_DEMO=off: no demo accounts or projects");
    db().$client.close();

    const host = process.env.HOST || "127.0.0.1";
    const web = dev
      ? spawnChild("web", bin("react-router"), ["dev", "--host", host, "--port", String(c.PORT), "--strictPort"], { cwd: root })
      : spawnChild("web", bin("react-router-serve"), [path.join(root, "build/server/index.js")], { cwd: root });
    children.push(web);
    const workerFile = path.join(root, "workers/queue-worker.ts");
    // tsx as a loader, not its CLI: the CLI would sit between us and the worker and, when the
    // worker is slow to acknowledge a signal (a busy machine), SIGKILL it instead
    if (fs.existsSync(workerFile))
      children.push(spawnChild("worker", process.execPath, ["--import", "tsx", workerFile], { cwd: root, repeatTermAfterMs: 5000 }));
    else log("no workers/queue-worker.ts in this checkout: queued jobs wait until a worker runs");

    for (const ch of children) {
      void ch.exited.then(({ code, signal }) => {
        if (stopping) return;
        console.error(`[start] the ${ch.name} process exited unexpectedly (${signal ?? `code ${code}`}); stopping the rest`);
        void stopEverything(1);
      });
    }

    const health = await waitForHealth(`http://${host.includes(":") ? `[${host}]` : host}:${c.PORT}/api/health`, children, 90_000);
    if (stopping) return;
    if (health !== "ok") log(`/api/health is not green yet: ${health}`);
    console.log("");
    log(`Strutwise is running at ${c.APP_URL}${dev ? " (development, hot reload)" : ""}`);
    if (accounts) log(`demo accounts:\n${accountsTable(accounts)}`);
    log("Ctrl-C stops everything.");
  } catch (e) {
    console.error(`[start] ${e instanceof Error ? e.message : String(e)}`);
    await stopEverything(1);
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.join(root, "scripts/start.ts")) void main();
