// The workbench with a 3,200-member space grid (offset layers, 20 x 20 modules, generated):
// time to generate and pass the gate, in this process, beside the time to parse the same
// model from its JSON text (the reference an upload pays); then the editor page in headless
// chromium: time from navigation to the preview's first drawn frame (target under 1 s) and
// how many table rows are in the page for the 3,200 members (virtualized: a screenful).
// Needs a build (npm run build).   npm run bench -- workbench
import { startApp } from "../tests/e2e/harness";
import { launchBrowser, signIn } from "../tests/e2e/support/browser";

const MODULES = Number(process.env.BENCH_WORKBENCH_MODULES ?? 20); // 8 n² members: 20 → 3,200
const TARGET_MS = 1000;

const median = (xs: number[]) => xs.slice().sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

async function main() {
  const { generateCheckedModel } = await import("~/lib/models/generate");
  const { parseModel } = await import("~/engine/truss");
  const params = { layout: "offset", modulesX: MODULES, modulesY: MODULES, supports: "edges" };
  const gen: number[] = [];
  const parse: number[] = [];
  let model: Record<string, unknown> = {};
  for (let i = 0; i < 5; i++) {
    const t0 = performance.now();
    const r = generateCheckedModel("space-grid", params);
    gen.push(performance.now() - t0);
    if (!r.ok) throw new Error(r.error);
    model = r.model as Record<string, unknown>;
    const text = JSON.stringify(model);
    const t1 = performance.now();
    parseModel(JSON.parse(text));
    parse.push(performance.now() - t1);
  }
  const members = (model.members as unknown[]).length;
  console.log(`space grid ${MODULES} x ${MODULES}: ${members} members, ${(model.nodes as unknown[]).length} nodes`);
  console.log(`generate + gate: median ${median(gen).toFixed(0)} ms   | reference, parse + gate of the same JSON: ${median(parse).toFixed(0)} ms`);

  const app = await startApp({ worker: false });
  try {
    Object.assign(process.env, app.env);
    const [{ storeModel }, { db }, schema] = await Promise.all([import("~/lib/models.server"), import("~/db/client.server"), import("~/db/schema")]);
    const [project] = await db().select({ id: schema.projects.id }).from(schema.projects).limit(1);
    if (!project) throw new Error("The seed made no project");
    const stored = await storeModel({ projectId: project.id, fileName: "bench-grid.truss.json", bytes: new TextEncoder().encode(JSON.stringify(model)), user: null });
    if (!stored.ok) throw new Error(stored.error);
    const browser = await launchBrowser();
    try {
      const page = await browser.newPage({ width: 1440, height: 900 });
      const admin = app.accounts.find((a) => a.role === "admin")!;
      await signIn(page, admin.email, admin.password, app.baseUrl);
      const url = `${app.baseUrl}/models/${stored.model.id}/edit`;
      const firstFrame = async () => {
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
          { timeout: 30_000, polling: 50 },
        );
        return Date.now() - t0;
      };
      await firstFrame(); // warm the server and the browser cache once
      const frames: number[] = [];
      for (let i = 0; i < 5; i++) frames.push(await firstFrame());
      await page.getByRole("tab", { name: "Members" }).click();
      const rowsInPage = await page.locator('[data-testid="grid-members"] [role="row"][data-row]').count();
      console.log(`editor preview, navigation to first drawn frame: median ${median(frames)} ms, runs ${frames.join(", ")} ms   | target < ${TARGET_MS} ms ${median(frames) < TARGET_MS ? "(met)" : "(NOT met)"}`);
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
