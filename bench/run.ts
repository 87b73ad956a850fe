// `npm run bench`: runs every bench/*.bench.ts in its own process, one after another, so each
// one's wall time and peak memory are its own. Pass names to run a subset: npm run bench -- sqp
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const dir = path.dirname(new URL(import.meta.url).pathname);
const only = process.argv.slice(2);
const files = fs
  .readdirSync(dir)
  .filter((f) => f.endsWith(".bench.ts"))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();

let failed = 0;
for (const f of files) {
  console.log(`\n=== ${f} ===`);
  const r = spawnSync(process.execPath, ["--import", "tsx", "--expose-gc", path.join(dir, f)], { stdio: "inherit" });
  if (r.status !== 0) {
    failed++;
    console.log(`!!! ${f} exited with ${r.status ?? r.signal}`);
  }
}
process.exit(failed ? 1 : 0);
