// The workbench with a 3,200-member space grid (offset layers, 20 x 20 modules, generated):
// time to generate and pass the gate, in this process, beside the time to parse the same
// model from its JSON text (the reference an upload pays); then the editor page in headless
// chromium: time from navigation to the preview's first drawn frame (target under 1 s),
// beside the same figure for a 128-member grid (4 x 4 modules) measured in the same run, with
// where the time goes (server's first byte, page parsed, 3D canvas created, first frame drawn:
// user-timing marks the viewer sets), and how many table rows are in the page for the 3,200
// members (virtualized: a screenful). Needs a build (npm run build).   npm run bench -- workbench
import type { Page } from "playwright-core";
import { startApp } from "../tests/e2e/harness";
import { launchBrowser, signIn } from "../tests/e2e/support/browser";

const MODULES = Number(process.env.BENCH_WORKBENCH_MODULES ?? 20); // 8 n² members: 20 → 3,200
const REFERENCE_MODULES = 4; // 128 members
const TARGET_MS = 1000;
const RUNS = 5;

/** The median of the figures measured (a mark a run did not reach is left out). */
const median = (xs: number[]) => {
  const ok = xs.filter(Number.isFinite).sort((a, b) => a - b);
  return ok.length ? ok[Math.floor(ok.length / 2)]! : NaN;
};

interface Phases {
  total: number;
  firstByte: number;
  domReady: number;
  canvas: number;
  frame: number;
}

/** Navigation to the editor until its preview shows ink, with the page's own timings of the steps on the way. */
async function firstFrame(page: Page, url: string): Promise<Phases> {
  const t0 = Date.now();
  await page.goto(url, { waitUntil: "commit" });
  await page.waitForFunction(
    () => {
      const c = document.querySelector<HTMLCanvasElement>('[data-testid="truss-viewer"] canvas');
      if (!c || !c.width) return false;
      const o = document.createElement("canvas");
      o.width = 64;
      o.height = 64;
      const ctx = o.getContext("2d")!;
      ctx.drawImage(c, 0, 0, 64, 64);
      const d = ctx.getImageData(0, 0, 64, 64).data;
      let ink = 0;
      for (let i = 0; i < d.length; i += 4) if (d[i]! + d[i + 1]! + d[i + 2]! < 600) ink++;
      return ink > 20;
    },
    undefined,
    { timeout: 60_000, polling: 50 },
  );
  const total = Date.now() - t0;
  // a string, not a function: tsx's name helpers do not exist in the page
  const marks = (await page.evaluate(`(() => {
    const nav = performance.getEntriesByType("navigation")[0];
    const mark = (name) => performance.getEntriesByName(name)[0]?.startTime ?? NaN;
    return { firstByte: nav.responseStart, domReady: nav.domContentLoadedEventEnd, canvas: mark("truss-canvas-created"), frame: mark("truss-first-frame") };
  })()`)) as Omit<Phases, "total">;
  return { total, ...marks };
}

async function measure(page: Page, url: string): Promise<Phases[]> {
  await firstFrame(page, url); // warm the server and the browser cache once
  const runs: Phases[] = [];
  for (let i = 0; i < RUNS; i++) runs.push(await firstFrame(page, url));
  return runs;
}

function describeRuns(label: string, runs: Phases[]): string {
  const m = (k: keyof Phases) => median(runs.map((r) => r[k])).toFixed(0);
  return `${label}: median ${m("total")} ms (runs ${runs.map((r) => r.total).join(", ")}) — first byte ${m("firstByte")}, page parsed ${m("domReady")}, canvas ${m("canvas")}, first frame drawn ${m("frame")} ms`;
}

async function main() {
  const { generateCheckedModel } = await import("~/lib/models/generate");
  const { parseModel } = await import("~/engine/truss");
  const grid = (modules: number) => ({ layout: "offset", modulesX: modules, modulesY: modules, supports: "edges" });
  const gen: number[] = [];
  const parse: number[] = [];
  let model: Record<string, unknown> = {};
  for (let i = 0; i < 5; i++) {
    const t0 = performance.now();
    const r = generateCheckedModel("space-grid", grid(MODULES));
    gen.push(performance.now() - t0);
    if (!r.ok) throw new Error(r.error);
    model = r.model as Record<string, unknown>;
    const text = JSON.stringify(model);
    const t1 = performance.now();
    parseModel(JSON.parse(text));
    parse.push(performance.now() - t1);
  }
  const small = generateCheckedModel("space-grid", grid(REFERENCE_MODULES));
  if (!small.ok) throw new Error(small.error);
  const members = (model.members as unknown[]).length;
  const smallMembers = (small.model.members as unknown[]).length;
  console.log(`space grid ${MODULES} x ${MODULES}: ${members} members, ${(model.nodes as unknown[]).length} nodes`);
  console.log(`generate + gate: median ${median(gen).toFixed(0)} ms   | reference, parse + gate of the same JSON: ${median(parse).toFixed(0)} ms`);

  const app = await startApp({ worker: false });
  try {
    Object.assign(process.env, app.env);
    const [{ storeModel }, { db }, schema] = await Promise.all([import("~/lib/models.server"), import("~/db/client.server"), import("~/db/schema")]);
    const [project] = await db().select({ id: schema.projects.id }).from(schema.projects).limit(1);
    if (!project) throw new Error("The seed made no project");
    const store = async (m: unknown, fileName: string) => {
      const stored = await storeModel({ projectId: project.id, fileName, bytes: new TextEncoder().encode(JSON.stringify(m)), user: null });
      if (!stored.ok) throw new Error(stored.error);
      return stored.model.id;
    };
    const bigId = await store(model, "bench-grid.truss.json");
    const smallId = await store(small.model, "bench-grid-small.truss.json");
    const browser = await launchBrowser();
    try {
      const page = await browser.newPage({ width: 1440, height: 900 });
      const admin = app.accounts.find((a) => a.role === "admin")!;
      await signIn(page, admin.email, admin.password, app.baseUrl);
      const smallRuns = await measure(page, `${app.baseUrl}/models/${smallId}/edit`);
      const bigRuns = await measure(page, `${app.baseUrl}/models/${bigId}/edit`);
      await page.getByRole("tab", { name: "Members" }).click();
      const rowsInPage = await page.locator('[data-testid="grid-members"] [role="row"][data-row]').count();
      const big = median(bigRuns.map((r) => r.total));
      console.log(describeRuns(`editor preview, ${members} members, navigation to first drawn frame`, bigRuns));
      console.log(describeRuns(`reference, the same page with ${smallMembers} members`, smallRuns));
      console.log(`${members} members: ${big} ms   | target < ${TARGET_MS} ms ${big < TARGET_MS ? "(met)" : "(NOT met)"}   | ${smallMembers} members: ${median(smallRuns.map((r) => r.total))} ms`);
      console.log(`member table: ${rowsInPage} rows in the page for ${members} members (virtualized)`);
    } finally {
      await browser.close();
    }
  } finally {
    await app.stop();
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
