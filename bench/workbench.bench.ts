// The workbench with a 3,200-member space grid (offset layers, 20 x 20 modules, generated):
// time to generate and pass the gate, in this process, beside the time to parse the same
// model from its JSON text (the reference an upload pays); then the editor page in headless
// chromium: time from navigation to the preview's first drawn frame (target under 1 s),
// beside the same figure for a 128-member grid (4 x 4 modules) measured in the same run, with
// where the time goes, read from the page's own timeline (navigation entry, the model file's
// resource entry and the user-timing marks the page sets, app/lib/page-timing.ts), and how
// many table rows are in the page for the 3,200 members (virtualized: a screenful).
// "Seen" is when this bench finds the frame's ink in the canvas; it trails "rendered" by the
// time the browser's software GL takes to carry out the frame's draw calls (headless chromium
// here has no GPU). Needs a build (npm run build).   npm run bench -- workbench
import os from "node:os";
import type { Page } from "playwright-core";
import { startApp } from "../tests/e2e/harness";
import { launchBrowser, signIn } from "../tests/e2e/support/browser";
import { PAGE_MARKS } from "~/lib/page-timing";

const MODULES = Number(process.env.BENCH_WORKBENCH_MODULES ?? 20); // 8 n² members: 20 → 3,200
const REFERENCE_MODULES = 4; // 128 members
const TARGET_MS = 1000;
const RUNS = Number(process.env.BENCH_WORKBENCH_RUNS ?? 7);
const COLD_RUNS = 3;
const INK_SEEN = "bench-first-frame-seen";

/** The median of the figures measured (a mark a run did not reach is left out). */
const median = (xs: number[]) => {
  const ok = xs.filter(Number.isFinite).sort((a, b) => a - b);
  return ok.length ? ok[Math.floor(ok.length / 2)]! : NaN;
};

/** One page load, in ms: `total` on this process's clock from asking for the page; the rest on the page's clock from its navigation start. */
interface Phases {
  total: number;
  serverAnswer: number;
  htmlParsed: number;
  modelFile: number;
  hydrated: number;
  editorMounted: number;
  canvas: number;
  rendered: number;
  seen: number;
}

const PHASES: [keyof Phases, string][] = [
  ["serverAnswer", "server answer"],
  ["htmlParsed", "HTML parsed"],
  ["modelFile", "model file in"],
  ["hydrated", "page hydrated"],
  ["editorMounted", "editor built"],
  ["canvas", "canvas created"],
  ["rendered", "first frame rendered"],
  ["seen", "first frame seen"],
  ["total", "total (bench clock)"],
];

/** Navigation to the editor until its preview shows ink, with the page's own timings of the steps on the way. */
async function firstFrame(page: Page, url: string): Promise<Phases> {
  const t0 = Date.now();
  await page.goto(url, { waitUntil: "commit" });
  await page.waitForFunction(
    (seenMark) => {
      const c = document.querySelector<HTMLCanvasElement>('[data-testid="truss-viewer"] canvas');
      if (!c || !c.width) return false;
      const o = document.createElement("canvas");
      o.width = 64;
      o.height = 64;
      const ctx = o.getContext("2d")!;
      ctx.drawImage(c, 0, 0, 64, 64);
      const d = ctx.getImageData(0, 0, 64, 64).data;
      // opaque dark pixels: a canvas not drawn yet reads as transparent black, which is no ink
      let ink = 0;
      for (let i = 0; i < d.length; i += 4) if (d[i + 3]! > 200 && d[i]! + d[i + 1]! + d[i + 2]! < 600) ink++;
      if (ink > 20) performance.mark(seenMark);
      return ink > 20;
    },
    INK_SEEN,
    { timeout: 60_000, polling: 20 },
  );
  const total = Date.now() - t0;
  // a string, not a function: tsx's name helpers do not exist in the page
  const marks = (await page.evaluate(`(() => {
    const nav = performance.getEntriesByType("navigation")[0];
    const mark = (name) => performance.getEntriesByName(name, "mark")[0]?.startTime ?? NaN;
    const file = performance.getEntriesByType("resource").find((r) => r.name.includes("/file?version="));
    return {
      serverAnswer: nav.responseStart,
      htmlParsed: nav.domInteractive,
      modelFile: file ? file.responseEnd : NaN,
      hydrated: mark(${JSON.stringify(PAGE_MARKS.pageHydrated)}),
      editorMounted: mark(${JSON.stringify(PAGE_MARKS.editorMounted)}),
      canvas: mark(${JSON.stringify(PAGE_MARKS.canvasCreated)}),
      rendered: mark(${JSON.stringify(PAGE_MARKS.firstFrame)}),
      seen: mark(${JSON.stringify(INK_SEEN)}),
    };
  })()`)) as Omit<Phases, "total">;
  return { total, ...marks };
}

async function measure(page: Page, url: string): Promise<Phases[]> {
  await firstFrame(page, url); // warm the server and the browser cache once
  const runs: Phases[] = [];
  for (let i = 0; i < RUNS; i++) runs.push(await firstFrame(page, url));
  return runs;
}

/** The same with the browser's cache emptied before each load: a first visit (scripts and the model file fetched anew). */
async function measureCold(page: Page, url: string): Promise<Phases[]> {
  const cdp = await page.context().newCDPSession(page);
  const runs: Phases[] = [];
  for (let i = 0; i < COLD_RUNS; i++) {
    await cdp.send("Network.clearBrowserCache");
    runs.push(await firstFrame(page, url));
  }
  await cdp.detach();
  return runs;
}

/** The phases of both models side by side, medians in ms. */
function phaseTable(big: { label: string; runs: Phases[] }, small: { label: string; runs: Phases[] }): string {
  const cell = (runs: Phases[], k: keyof Phases) => {
    const m = median(runs.map((r) => r[k]));
    return (Number.isFinite(m) ? `${m.toFixed(0)} ms` : "—").padStart(10);
  };
  const rows = PHASES.map(([k, label]) => `  ${label.padEnd(22)}${cell(big.runs, k)}${cell(small.runs, k)}`);
  return [`  ${"median, from navigation".padEnd(22)}${big.label.padStart(10)}${small.label.padStart(10)}`, ...rows].join("\n");
}

function loadNow(): string {
  const [one, five] = os.loadavg();
  return `load average ${one!.toFixed(2)} (1 min), ${five!.toFixed(2)} (5 min) on ${os.cpus().length} cores`;
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
      const page = await browser.newPage({ width: 1440, height: 900 }); page.on("console", (m) => console.log("console:", m.text()));
      const admin = app.accounts.find((a) => a.role === "admin")!;
      await signIn(page, admin.email, admin.password, app.baseUrl);
      console.log(`before the page runs: ${loadNow()}`);
      const smallRuns = await measure(page, `${app.baseUrl}/models/${smallId}/edit`);
      const bigRuns = await measure(page, `${app.baseUrl}/models/${bigId}/edit`);
      const smallCold = await measureCold(page, `${app.baseUrl}/models/${smallId}/edit`);
      const bigCold = await measureCold(page, `${app.baseUrl}/models/${bigId}/edit`);
      console.log(`after the page runs: ${loadNow()}`);
      await page.getByRole("tab", { name: "Members" }).click();
      const rowsInPage = await page.locator('[data-testid="grid-members"] [role="row"][data-row]').count();
      const big = median(bigRuns.map((r) => r.total));
      const small = median(smallRuns.map((r) => r.total));
      console.log(`editor preview, navigation to first drawn frame (${RUNS} runs each after one warm-up, the reference in the same run):`);
      console.log(phaseTable({ label: `${members} m.`, runs: bigRuns }, { label: `${smallMembers} m.`, runs: smallRuns }));
      console.log(`  runs, ${members} members: ${bigRuns.map((r) => r.total).join(", ")} ms;  ${smallMembers} members: ${smallRuns.map((r) => r.total).join(", ")} ms`);
      console.log(`${members} members: ${big} ms   | target < ${TARGET_MS} ms ${big < TARGET_MS ? "(met)" : "(NOT met)"}   | reference, ${smallMembers} members: ${small} ms (the ${members}-member page costs ${(big - small).toFixed(0)} ms more)`);
      console.log(`first visit (browser cache emptied before each of ${COLD_RUNS} loads): ${members} members median ${median(bigCold.map((r) => r.total))} ms (runs ${bigCold.map((r) => r.total).join(", ")})   | reference, ${smallMembers} members: ${median(smallCold.map((r) => r.total))} ms (runs ${smallCold.map((r) => r.total).join(", ")})`);
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
