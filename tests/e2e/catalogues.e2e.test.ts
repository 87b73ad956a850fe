// Section catalogues and reactions end to end, in headless chromium against the built app with
// its worker: an engineer uploads a broken catalogue CSV (every bad row listed with its row and
// column, nothing stored), then a good one; a viewer reads it but gets no upload form; the
// engineer uploads a truss taking its sections from that catalogue, runs an analysis, and the
// job page shows the support reactions, which match the method of joints: the two-bar bracket
// (feet 4 m apart, apex 1.5 m up, 180 kN at the apex) has N = −P / (2 sin θ) = −150 kN in each
// bar and reactions (±120, 90) kN at the feet. Screenshots go to test-artifacts/screenshots/.
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type RunningApp } from "./harness";
import { launchBrowser, screenshot, signIn, type Browser } from "./support/browser";

let app: RunningApp;
let browser: Browser;
const errors: string[] = [];
const state: { catalogueId?: string; modelId?: string; jobId?: string } = {};

const GOOD_CSV = ["id,family,area (mm²),I (mm⁴),D_mm,t_mm", "T 60x3,tube,537.2,218780,60,3", "T 76x4,tube,904.8,588110,76,4", "T 114x5,tube,1712,2.571e6,114.3,5"].join("\n") + "\n";
const BROKEN_CSV = ["id,family,area_mm2,I_mm4", "T 60x3,tube,537.2,218780", "T 76x4,tube,904.8,-1", "T 60x3,tube,700", ""].join("\n");

function bracket() {
  return {
    format: "strutwise.truss",
    version: 1,
    name: "Wharf crane bracket WB-2",
    units: { length: "mm", force: "N", mass: "t" },
    dimension: 2,
    materials: [{ id: "steel", E: 210000, density: 7.85e-9, allowableTension: 235, allowableCompression: 235 }],
    nodes: [
      { id: "A", x: 0, y: 0, fixed: ["x", "y"] },
      { id: "B", x: 4000, y: 0, fixed: ["x", "y"] },
      { id: "C", x: 2000, y: 1500 },
    ],
    members: [
      { id: "AC", start: "A", end: "C", material: "steel", section: "T 114x5" },
      { id: "BC", start: "B", end: "C", material: "steel", section: "T 114x5" },
    ],
    loadCases: [{ id: "HOIST", name: "Hoist at the apex", loads: [{ node: "C", fy: -180000 }] }],
  };
}

function account(role: string) {
  const a = app.accounts.find((x) => x.role === role);
  if (!a) throw new Error(`The seed made no ${role} account`);
  return a;
}

async function pageAs(role: string): Promise<Page> {
  await browser.context.clearCookies();
  const page = await browser.newPage({ width: 1440, height: 900 });
  page.on("pageerror", (e) => errors.push(`${role}: ${e.message}`));
  page.on("console", (m) => {
    if (m.type() === "error" && !m.text().startsWith("Failed to load resource")) errors.push(`${role} console: ${m.text()}`);
  });
  page.on("response", (r) => {
    if (r.status() >= 500) errors.push(`${role}: ${r.status()} from ${r.url()}`);
  });
  await signIn(page, account(role).email, account(role).password, app.baseUrl);
  return page;
}

/** fetch() from inside the page: same origin, the session cookie, as the app's own scripts send it. */
async function inPage<T>(page: Page, url: string, init?: { method: string; body: unknown }): Promise<{ status: number; body: T }> {
  return page.evaluate(
    async ([u, i]) => {
      const res = await fetch(u as string, i ? { method: (i as { method: string }).method, headers: { "content-type": "application/json" }, body: JSON.stringify((i as { body: unknown }).body) } : undefined);
      return { status: res.status, body: await res.json().catch(() => null) };
    },
    [url, init ?? null] as const,
  ) as Promise<{ status: number; body: T }>;
}

beforeAll(async () => {
  app = await startApp();
  browser = await launchBrowser();
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("section catalogues and reactions", () => {
  it("refuses a broken catalogue naming each row and column, then stores a good one", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${app.baseUrl}/catalogues`);
    const form = page.locator('[data-testid="catalogue-upload"]');
    await form.getByLabel("Name").fill("Harbour yard tubes 2027");
    await form.locator('input[type="file"]').setInputFiles({ name: "yard-tubes.csv", mimeType: "text/csv", buffer: Buffer.from(BROKEN_CSV) });
    await form.getByRole("button", { name: "Upload catalogue" }).click();
    const issues = page.locator('[data-testid="issues-bad"]');
    await issues.waitFor({ timeout: 15_000 });
    const text = await issues.innerText();
    expect(text).toContain("yard-tubes.csv row 3 I_mm4");
    expect(text).toContain("column D: the second moment of area must be greater than zero");
    expect(text).toContain("yard-tubes.csv row 4 id");
    expect(text).toContain("yard-tubes.csv row 4 I_mm4");
    await screenshot(page, "catalogue-upload-refused");
    // only the built-in catalogue is listed: nothing of the refused file was stored
    expect(await page.locator('[data-testid="catalogue-row"]').allInnerTexts()).toEqual([expect.stringContaining("Strutwise generic sections")]);

    await form.locator('input[type="file"]').setInputFiles({ name: "yard-tubes.csv", mimeType: "text/csv", buffer: Buffer.from(GOOD_CSV) });
    await form.getByRole("button", { name: "Upload catalogue" }).click();
    await page.waitForURL(/\/catalogues\/[0-9a-f-]{36}$/, { timeout: 15_000 });
    state.catalogueId = page.url().split("/").pop();
    await page.locator('[data-testid="section-row"]').first().waitFor();
    expect(await page.locator('[data-testid="section-row"]').count()).toBe(3);
    expect(await page.locator("h1").innerText()).toBe("Harbour yard tubes 2027");
    await screenshot(page, "catalogue-view");
    await page.close();
  }, 60_000);

  it("a viewer reads the catalogue but has no upload form and no retire button", async () => {
    const page = await pageAs("viewer");
    await page.goto(`${app.baseUrl}/catalogues`);
    expect(await page.locator('[data-testid="catalogue-upload"]').count()).toBe(0);
    expect(await page.locator('[data-testid="catalogue-row"]').count()).toBeGreaterThanOrEqual(1);
    await page.goto(`${app.baseUrl}/catalogues/${state.catalogueId}`);
    expect(await page.locator('[data-testid="section-row"]').count()).toBe(3);
    expect(await page.locator('[data-testid="retire-catalogue"]').count()).toBe(0);
    await page.close();
  }, 60_000);

  it("uploads a truss with the catalogue's sections, runs an analysis and shows the reactions of the method of joints", async () => {
    const page = await pageAs("engineer");
    const projects = await inPage<{ projects: { id: string; code: string }[] }>(page, "/api/projects");
    const projectId = projects.body.projects[0]!.id;
    await page.goto(`${app.baseUrl}/projects/${projectId}`);
    await page.locator('[data-testid="upload-catalogue"]').selectOption(state.catalogueId!);
    await page.locator('[data-testid="upload"] input[type="file"]').setInputFiles({ name: "wharf-bracket.truss.json", mimeType: "application/json", buffer: Buffer.from(JSON.stringify(bracket())) });
    await page.waitForURL(/\/models\/[0-9a-f-]{36}/, { timeout: 20_000 });
    state.modelId = new URL(page.url()).pathname.split("/")[2];

    const file = await inPage<{ sections: { id: string; area: number }[] }>(page, `/api/models/${state.modelId}/file`);
    expect(file.body.sections.map((s) => s.id)).toEqual(["T 60x3", "T 76x4", "T 114x5"]);

    const queued = await inPage<{ id: string }>(page, "/api/jobs", { method: "POST", body: { modelId: state.modelId, kind: "analysis" } });
    expect(queued.status).toBe(202);
    state.jobId = queued.body.id;
    const deadline = Date.now() + 90_000;
    for (;;) {
      const j = await inPage<{ status: string }>(page, `/api/jobs/${state.jobId}`);
      if (j.body.status === "succeeded") break;
      if (j.body.status === "failed" || j.body.status === "cancelled" || Date.now() > deadline) throw new Error(`analysis job ended ${j.body.status}\n${app.logs()}`);
      await page.waitForTimeout(500);
    }

    await page.goto(`${app.baseUrl}/jobs/${state.jobId}`);
    const panel = page.locator('[data-testid="reactions"]');
    await panel.waitFor({ timeout: 20_000 });
    const rows = panel.locator('[data-testid="reaction-row"]');
    expect(await rows.count()).toBe(2);
    // method of joints: N = −180 kN / (2 · 0.6) = −150 kN; foot A: R = 150 kN · (0.8, 0.6)
    expect((await rows.nth(0).innerText()).replace(/\s+/g, " ")).toContain("A 120,000 90,000 150,000");
    expect((await rows.nth(1).innerText()).replace(/\s+/g, " ")).toMatch(/B [−-]120,000 90,000 150,000/);
    // the 3D view offers the reaction arrows and names them in its legend
    await page.locator('[data-testid="truss-viewer"]').getByText("reactions", { exact: true }).waitFor();
    expect(await page.locator('[data-testid="viewer-legend"]').innerText()).toContain("support reaction");
    await page.waitForTimeout(1500); // the scene draws after its lazy chunk
    await screenshot(page, "job-reactions");
    const csvButton = panel.locator('[data-testid="reactions-csv"]');
    const [download] = await Promise.all([page.waitForEvent("download"), csvButton.click()]);
    const csv = await download.createReadStream().then(async (s) => {
      const chunks: Buffer[] = [];
      for await (const c of s) chunks.push(c as Buffer);
      return Buffer.concat(chunks).toString("utf8");
    });
    expect(csv.split("\r\n")[0]).toBe("node,Rx_HOIST_N,Ry_HOIST_N,Rz_HOIST_N");
    await page.close();
    expect(errors).toEqual([]);
  }, 180_000);
});
