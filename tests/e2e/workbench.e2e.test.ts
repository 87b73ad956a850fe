// The workbench end to end in headless chromium against the built app with a worker: an
// engineer builds a Pratt girder from the generator form (no file), opens the editor, changes
// a load in the loads table, saves a second version, reads what changed in words, runs an
// analysis and a design of that version, and compares the two versions. Screenshots go to
// test-artifacts/screenshots/.
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type RunningApp } from "./harness";
import { launchBrowser, screenshot, signIn, type Browser } from "./support/browser";

let app: RunningApp;
let browser: Browser;
let page: Page;
const errors: string[] = [];
const state: { projectId?: string; modelId?: string } = {};

beforeAll(async () => {
  app = await startApp();
  browser = await launchBrowser();
  page = await browser.newPage({ width: 1440, height: 900 });
  page.on("pageerror", (e) => errors.push(e.message));
  page.on("response", (r) => {
    if (r.status() >= 500) errors.push(`${r.status()} from ${r.url()}`);
  });
  const engineer = app.accounts.find((a) => a.role === "engineer")!;
  await signIn(page, engineer.email, engineer.password, app.baseUrl);
  const res = await page.request.post(`${app.baseUrl}/api/projects`, { data: { code: `WB-${Date.now().toString(36).toUpperCase()}`, name: "Brackenford depot girders" }, headers: { origin: app.baseUrl } });
  expect(res.status(), await res.text()).toBe(201);
  const body = (await res.json()) as { id?: string; project?: { id: string } };
  state.projectId = body.id ?? body.project?.id;
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

async function waitForJob(): Promise<string> {
  await page.waitForURL(/\/jobs\//, { timeout: 30_000 });
  const jobId = page.url().split("/jobs/")[1]!.split(/[?#]/)[0]!;
  for (let i = 0; i < 120; i++) {
    const r = await page.request.get(`${app.baseUrl}/api/jobs/${jobId}`);
    const j = (await r.json()) as { status: string; outcome: string | null };
    if (j.status !== "queued" && j.status !== "running") return `${j.status}/${j.outcome}`;
    await page.waitForTimeout(500);
  }
  throw new Error("the job did not finish");
}

describe("workbench", () => {
  it("builds a girder from the generator form, without a file", async () => {
    await page.goto(`${app.baseUrl}/projects/${state.projectId}`);
    await page.getByTestId("new-model-link").click();
    await page.waitForURL(/new-model/);
    await page.getByLabel("span (m)").fill("12");
    await page.getByLabel("panels").fill("6");
    await screenshot(page, "workbench-generator");
    await page.getByRole("button", { name: "Build the model" }).click();
    await page.waitForURL(/\/models\/[^/]+$/);
    state.modelId = page.url().split("/models/")[1];
    // the address changes as the navigation commits; the new page's heading may follow a frame later
    await page.locator("h1", { hasText: "Pratt truss, 12 m span, 6 panels" }).waitFor({ timeout: 15_000 });
    expect(await page.locator("h1").innerText()).toBe("Pratt truss, 12 m span, 6 panels");
    await screenshot(page, "workbench-model");
  }, 60_000);

  it("edits a load in the editor and saves version 2, whose page says what changed", async () => {
    await page.getByTestId("edit-model").click();
    await page.waitForURL(/\/edit/);
    await page.getByRole("tab", { name: "Loads" }).click();
    const cell = page.getByLabel("loads row 2 fy (N)");
    const before = await cell.inputValue();
    await cell.fill("-30000");
    await expect(page.getByTestId("validation").innerText()).resolves.toMatch(/Valid and stable/);
    await page.getByLabel(/What changed/).fill("heavier plant load at the second panel point");
    await screenshot(page, "workbench-editor");
    await page.getByRole("button", { name: "Save as a new version" }).click();
    await page.waitForURL(/\/versions\/2$/);
    const changes = await page.getByTestId("version-changes").innerText();
    const node = changes.match(/load on node (\w+) changed/)?.[1];
    expect(node).toBeTruthy();
    expect(changes).toContain(`(0, ${before}, 0) N to (0, -30000, 0) N`);
    await screenshot(page, "workbench-version-2");
  }, 60_000);

  it("runs an analysis and a design of version 2; the job pages name the version and offer edit and run again", async () => {
    await page.getByRole("button", { name: "Analyse version 2" }).click();
    expect(await waitForJob()).toBe("succeeded/analysed");
    await page.reload();
    await expect(page.getByText("version 2").first().isVisible()).resolves.toBe(true);
    await expect(page.getByTestId("edit-and-run-again").getAttribute("href")).resolves.toContain("version=2");
    await screenshot(page, "workbench-analysis-job");
    await page.goto(`${app.baseUrl}/models/${state.modelId}/versions/2`);
    await page.getByRole("button", { name: "Optimize version 2" }).click();
    expect(await waitForJob()).toMatch(/^succeeded\/(optimal|not-converged)$/);
  }, 120_000);

  it("compares the versions: version 1's file is unchanged, version 2 differs only in that load", async () => {
    const v1 = (await (await page.request.get(`${app.baseUrl}/api/models/${state.modelId}/file?version=1`)).json()) as { loadCases: { loads: { fy: number }[] }[] };
    const v2 = (await (await page.request.get(`${app.baseUrl}/api/models/${state.modelId}/file?version=2`)).json()) as typeof v1;
    expect(v2.loadCases[0]!.loads[1]!.fy).toBe(-30000);
    expect(v1.loadCases[0]!.loads[1]!.fy).not.toBe(-30000);
    v2.loadCases[0]!.loads[1]!.fy = v1.loadCases[0]!.loads[1]!.fy;
    expect(v2).toEqual(v1);
    const meta = (await (await page.request.get(`${app.baseUrl}/api/models/${state.modelId}`)).json()) as { version: number; versions: { note: string | null }[] };
    expect(meta.version).toBe(2);
    expect(meta.versions[1]!.note).toBe("heavier plant load at the second panel point");
    expect(errors).toEqual([]);
  }, 60_000);
});
