// The product's pages end to end, in headless chromium against the built app with a worker:
// each role sees only what it may do; an engineer uploads a good and a broken truss (the
// broken one's errors are listed with the items they name), queues a run and watches it
// finish without a page reload; the 3D view draws (its pixels are sampled) and "Fit to view"
// leaves a margin round the tall demo mast; the numbers on the page match the API's; a
// checker returns the run, then approves it, and the review form and PDF link follow; the
// admin's list of people reads on a phone; the downloads arrive. Screenshots at
// 1440×900 and 390×844 go to test-artifacts/screenshots/.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type RunningApp } from "./harness";
import { launchBrowser, screenshot, signIn, type Browser } from "./support/browser";
import { canvasInk, waitForCanvas } from "./support/canvas";

const fixtures = path.resolve(import.meta.dirname, "fixtures");
const GOOD = path.join(fixtures, "kiln-roof.truss.json");
const BROKEN = path.join(fixtures, "kiln-roof-broken.truss.json");

let app: RunningApp;
let browser: Browser;
const errors: string[] = [];
const state: { projectId?: string; modelId?: string; jobId?: string } = {};

function account(role: string) {
  const a = app.accounts.find((x) => x.role === role);
  if (!a) throw new Error(`The seed made no ${role} account (accounts: ${app.accounts.map((x) => x.role).join(", ") || "none"})`);
  return a;
}

async function pageAs(role: string, viewport = { width: 1440, height: 900 }): Promise<Page> {
  await browser.context.clearCookies();
  const page = await browser.newPage(viewport);
  page.on("pageerror", (e) => errors.push(`${role}: ${e.message}`));
  // hydration mismatches and failed fetches show up as console errors
  // (a refused upload answers 400 on purpose; the browser logs every 4xx, so statuses are checked apart)
  page.on("console", (m) => {
    if (m.type() === "error" && !m.text().startsWith("Failed to load resource")) errors.push(`${role} console: ${m.text()}`);
  });
  page.on("response", (r) => {
    if (r.status() >= 500) errors.push(`${role}: ${r.status()} from ${r.url()}`);
  });
  const a = account(role);
  await signIn(page, a.email, a.password, app.baseUrl);
  return page;
}

beforeAll(async () => {
  app = await startApp();
  browser = await launchBrowser();
  // the project the engineer works in, through the API with the engineer's session
  const page = await pageAs("engineer");
  const code = `KS-${Date.now().toString(36).toUpperCase()}`;
  const res = await page.request.post(`${app.baseUrl}/api/projects`, { data: { code, name: "Kiln shed, Marlow Ridge brickworks", client: "Marlow Ridge Brick Co." }, headers: { origin: app.baseUrl } });
  expect(res.status(), await res.text()).toBe(201);
  const body = (await res.json()) as { id?: string; project?: { id: string } };
  state.projectId = body.id ?? body.project?.id;
  expect(state.projectId).toBeTruthy();
  // only members see a project (api.md, Additions): its creator brings in the checker and viewer
  for (const role of ["checker", "viewer"]) {
    const added = await page.request.post(`${app.baseUrl}/api/projects/${state.projectId}/members`, { data: { email: account(role).email }, headers: { origin: app.baseUrl } });
    expect(added.status(), await added.text()).toBe(201);
  }
  await page.close();
});

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("pages", () => {
  it("shows each role only what it may do", async () => {
    for (const role of ["admin", "engineer", "checker", "viewer"]) {
      const page = await pageAs(role);
      await page.goto(`${app.baseUrl}/`);
      await expect(page.getByTestId("nav-role").innerText()).resolves.toMatch(new RegExp(role, "i"));
      expect(await page.getByTestId("nav-admin-users").count(), `${role}: admin links`).toBe(role === "admin" ? 1 : 0);
      expect(await page.getByRole("region", { name: "Waiting for review" }).count(), `${role}: review queue`).toBe(role === "checker" || role === "admin" ? 1 : 0);
      await page.goto(`${app.baseUrl}/projects/${state.projectId}`);
      expect(await page.getByTestId("upload").count(), `${role}: upload box`).toBe(role === "admin" || role === "engineer" ? 1 : 0);
      if (role === "engineer") {
        await screenshot(page, "pages-desk-project-engineer-1440x900");
      }
      await page.close();
    }
  });

  it("lists every problem of a broken file with the item it names, and stores nothing", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${app.baseUrl}/projects/${state.projectId}`);
    await page.locator('[data-testid="upload"] input[type="file"]').setInputFiles(BROKEN);
    const issues = page.getByTestId("issues-bad");
    await issues.waitFor({ timeout: 20_000 });
    const text = await issues.innerText();
    expect(text).toContain("members[3].end"); // the member ending at the unknown node B9
    expect(text).toContain("B9");
    expect(text).toContain("materials[0].E");
    expect(text).toMatch(/same node/);
    expect(page.url()).toContain(`/projects/${state.projectId}`);
    expect(await page.getByTestId("model-row").count()).toBe(0);
    await screenshot(page, "pages-upload-errors-1440x900");
    await page.close();
  });

  it("uploads a good file and previews it: summary, stability, 3D view, SHA-256", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${app.baseUrl}/projects/${state.projectId}`);
    await page.locator('[data-testid="upload"] input[type="file"]').setInputFiles(GOOD);
    await page.waitForURL(/\/models\/[^/]+$/, { timeout: 20_000 });
    state.modelId = new URL(page.url()).pathname.split("/").pop();
    const sha = crypto.createHash("sha256").update(fs.readFileSync(GOOD)).digest("hex");
    await expect(page.getByTestId("model-sha256").innerText()).resolves.toContain(sha);
    await expect(page.getByTestId("stability").innerText()).resolves.toMatch(/^Stable/);
    await expect(page.locator("h1").innerText()).resolves.toBe("Kiln shed roof truss KR-12");
    await waitForCanvas(page);
    const ink = await canvasInk(page);
    expect(ink.ratio, "the initial geometry is drawn").toBeGreaterThan(0.003);
    await screenshot(page, "pages-model-1440x900");
    await page.setViewportSize({ width: 390, height: 844 });
    await page.waitForTimeout(600);
    await screenshot(page, "pages-model-390x844");
    expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(1);
    await page.close();
  });

  it("says so instead of drawing a blank box when the browser has no WebGL", async () => {
    const page = await pageAs("viewer");
    await page.addInitScript(`(() => {
      const orig = HTMLCanvasElement.prototype.getContext;
      HTMLCanvasElement.prototype.getContext = function (kind, ...rest) {
        return /webgl/.test(String(kind)) ? null : orig.call(this, kind, ...rest);
      };
    })()`);
    await page.goto(`${app.baseUrl}/models/${state.modelId}`);
    await page.getByTestId("truss-viewer").getByText(/cannot draw 3D graphics here/).waitFor({ timeout: 15_000 });
    expect(await page.locator('[data-testid="truss-viewer"] canvas').count()).toBe(0);
    await page.close();
  });

  it("refuses a bad queue form in the browser before sending it, naming the field", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${app.baseUrl}/models/${state.modelId}`);
    let posted = false;
    page.on("request", (r) => {
      if (r.method() === "POST") posted = true;
    });
    await page.getByLabel("Iteration cap").fill("0");
    await page.getByRole("button", { name: "Queue job" }).click();
    await expect(page.locator("#maxIterations-error").innerText()).resolves.toMatch(/Iteration cap/);
    expect(posted).toBe(false);
    await page.close();
  });

  it("queues a job and follows its progress to the end without reloading the page", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${app.baseUrl}/models/${state.modelId}`);
    await page.getByLabel("Iteration cap").fill("120");
    // listen from before the submit: a small job can finish before the job page has hydrated,
    // and its first requests to the API must still be seen
    const requests: string[] = [];
    page.on("request", (r) => {
      if (r.url().includes("/api/jobs/")) requests.push(r.url());
    });
    await page.getByRole("button", { name: "Queue job" }).click();
    await page.waitForURL(/\/jobs\/[^/]+$/, { timeout: 20_000 });
    state.jobId = new URL(page.url()).pathname.split("/").pop();
    await page.evaluate(() => ((window as unknown as { __stillHere: boolean }).__stillHere = true));
    // the outcome panel replaces the live panel when the job ends
    await page.getByTestId("outcome").waitFor({ timeout: 150_000 });
    const status = await page.locator("h1 [data-status]").getAttribute("data-status");
    expect(status, app.logs().slice(-2000)).toBe("succeeded");
    expect(await page.evaluate(() => (window as unknown as { __stillHere?: boolean }).__stillHere)).toBe(true);
    const polls = requests.filter((u) => u.includes(`/api/jobs/${state.jobId}`));
    expect(polls.length, "progress came from the API by fetch").toBeGreaterThan(0);
    await page.close();
  });

  it("shows the result: numbers match the API, the 3D view draws, cautions are there", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${app.baseUrl}/jobs/${state.jobId}`);
    const api = await page.request.get(`${app.baseUrl}/api/jobs/${state.jobId}/result`);
    expect(api.status()).toBe(200);
    const result = (await api.json()) as { format: string; objective: { final: number }; members: unknown[] };
    expect(result.format).toBe("strutwise.result");
    const shown = (await page.getByTestId("objective-final").innerText()).replace(/,/g, "");
    expect(Number(shown)).toBeCloseTo(result.objective.final, 3 - Math.floor(Math.log10(Math.abs(result.objective.final))));
    await expect(page.getByTestId("cautions").innerText()).resolves.toMatch(/licensed or chartered structural engineer/);
    // the tables fill in from the same API route once the page has hydrated
    await page.getByTestId("member-row").first().waitFor({ timeout: 20_000 });
    expect(await page.getByTestId("member-row").count()).toBe(Math.min(25, result.members.length));
    // keyboard: a column header sorts with Enter, and says so to screen readers
    const areaHeader = page.getByRole("columnheader", { name: /^area/ }).first();
    await areaHeader.getByRole("button").focus();
    await page.keyboard.press("Enter");
    await expect(areaHeader.getAttribute("aria-sort")).resolves.toMatch(/^(ascending|descending)$/);
    await page.getByTestId("convergence-plot").waitFor();
    await waitForCanvas(page);
    const ink = await canvasInk(page);
    expect(ink.ratio, "members are drawn").toBeGreaterThan(0.003);
    expect(ink.colours, "more than one colour: utilization bands, supports, loads").toBeGreaterThan(3);
    // the deformed shape and the force-sense colouring switch on without errors
    await page.getByLabel("deformed shape").check();
    await page.getByLabel("Colour").selectOption("force");
    await page.waitForTimeout(500);
    expect((await canvasInk(page)).ratio).toBeGreaterThan(0.003);
    await screenshot(page, "pages-job-1440x900");
    await page.setViewportSize({ width: 390, height: 844 });
    await page.waitForTimeout(800);
    await screenshot(page, "pages-job-390x844");
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow, "no sideways scrolling of the whole page on a phone").toBeLessThanOrEqual(1);
    // the submitter gets no review form on their own job (four-eyes rule)
    expect(await page.getByTestId("review-form").count()).toBe(0);
    await page.close();
  });

  it("delivers the member CSV, the result JSON and the PDF report", async () => {
    const page = await pageAs("viewer");
    await page.goto(`${app.baseUrl}/jobs/${state.jobId}`);
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("members-csv").click()]);
    const csv = fs.readFileSync((await download.path())!, "utf8");
    expect(csv.split("\r\n")[0]).toMatch(/^member,start,end,group,area_mm2,length_mm,force_SNOW_N,stress_SNOW_MPa,force_DRIFT_N,stress_DRIFT_MPa,utilization,governing_check,governing_case$/);
    expect(csv.trim().split("\r\n").length).toBe(1 + 21);
    const json = await page.request.get(`${app.baseUrl}/api/jobs/${state.jobId}/result`);
    expect(json.status()).toBe(200);
    const pdf = await page.request.get(`${app.baseUrl}/api/jobs/${state.jobId}/report`);
    expect(pdf.status()).toBe(200);
    expect(pdf.headers()["content-type"]).toContain("application/pdf");
    expect((await pdf.body()).subarray(0, 5).toString()).toBe("%PDF-");
    // a viewer may read but not cancel, review or queue
    expect(await page.getByTestId("review-form").count()).toBe(0);
    await page.goto(`${app.baseUrl}/models/${state.modelId}`);
    expect(await page.getByTestId("queue-form").count()).toBe(0);
    await page.close();
  });

  it("lets a checker approve, and records who and when", async () => {
    const page = await pageAs("checker");
    await page.goto(`${app.baseUrl}/`);
    await expect(page.getByRole("region", { name: "Waiting for review" }).innerText()).resolves.toContain(state.jobId!.slice(0, 8));
    await screenshot(page, "pages-desk-checker-1440x900");
    await page.setViewportSize({ width: 390, height: 844 });
    await screenshot(page, "pages-desk-checker-390x844");
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.goto(`${app.baseUrl}/jobs/${state.jobId}`);
    const form = page.getByTestId("review-form");
    const report = page.getByTestId("download-report");
    await expect(report.innerText()).resolves.toBe("Calculation report (PDF) — not reviewed yet");
    // a return without a comment is refused by the server: the choice stays, the error shows
    await form.getByLabel("Return with changes").check();
    await form.getByRole("button", { name: "Record decision" }).click();
    await form.getByText("a comment is required when returning a job").waitFor({ timeout: 15_000 });
    expect(await form.getByLabel("Return with changes").isChecked()).toBe(true);
    // with a comment it is recorded: the form starts empty, the list and the PDF link follow
    await form.getByLabel("Comment").fill("Add the drift case on the east bay.");
    await form.getByRole("button", { name: "Record decision" }).click();
    await page.getByText("Decision recorded.").waitFor({ timeout: 15_000 });
    await expect(page.getByTestId("review-history").innerText()).resolves.toContain("Add the drift case on the east bay.");
    expect(await form.getByLabel("Comment").inputValue()).toBe("");
    expect(await form.getByLabel("Return with changes").isChecked()).toBe(false);
    expect(await form.getByLabel("Approve").isChecked()).toBe(false);
    await expect(report.innerText()).resolves.toBe("Calculation report (PDF) — changes requested, not approved");
    await form.getByLabel("Approve").check();
    await form.getByLabel("Comment").fill("Checked member forces against a hand calculation of the snow case.");
    await form.getByRole("button", { name: "Record decision" }).click();
    await page.getByTestId("review-history").getByText("hand calculation of the snow case").waitFor({ timeout: 15_000 });
    await expect(report.innerText()).resolves.toBe("Calculation report (PDF) — approved");
    // an approved run is closed: the form is gone (issue 16)
    await page.getByTestId("review-closed").waitFor({ timeout: 15_000 });
    expect(await page.getByTestId("review-form").count()).toBe(0);
    const history = await page.getByTestId("review-history").innerText();
    expect(history).toMatch(/approved/i);
    const checkerName = (account("checker") as { name?: string }).name;
    if (checkerName) expect(history).toContain(checkerName);
    expect(history).toContain("hand calculation of the snow case");
    await screenshot(page, "pages-review-1440x900");
    await page.close();
  });

  it("fits the tall demo mast to the view with a margin, on a desktop and on a phone", async () => {
    const page = await pageAs("engineer");
    const MAST = path.resolve(import.meta.dirname, "../../demo/models/halvard-point-relay-mast.truss.json");
    await page.goto(`${app.baseUrl}/projects/${state.projectId}`);
    await page.locator('[data-testid="upload"] input[type="file"]').setInputFiles(MAST);
    await page.waitForURL(/\/models\/[^/]+$/, { timeout: 20_000 });
    for (const viewport of [{ width: 1440, height: 900 }, { width: 390, height: 844 }]) {
      await page.setViewportSize(viewport);
      await waitForCanvas(page);
      await page.getByRole("button", { name: "Fit to view" }).click();
      await page.waitForTimeout(800);
      const edges = await canvasInk(page);
      expect(edges.ratio, `${viewport.width}: the mast is drawn`).toBeGreaterThan(0.003);
      // nothing drawn in a band of 4 % along each edge: arrows and supports included
      expect(edges.border, `${viewport.width}: ink at the canvas edge`).toBe(0);
      await screenshot(page, `pages-mast-fit-${viewport.width}x${viewport.height}`);
    }
    await page.close();
  });

  it("shows the people and roles list on a phone without sideways scrolling", async () => {
    const page = await pageAs("admin", { width: 390, height: 844 });
    await page.goto(`${app.baseUrl}/admin/users`);
    await page.getByTestId("account-row").first().waitFor();
    const sideways = await page.evaluate(() => {
      const card = document.querySelector('[data-testid="accounts"]')!;
      return { page: document.documentElement.scrollWidth - document.documentElement.clientWidth, list: card.scrollWidth - card.clientWidth };
    });
    expect(sideways.page, "the page").toBeLessThanOrEqual(1);
    expect(sideways.list, "the list inside its card").toBeLessThanOrEqual(1);
    // every account's role control and e-mail are on screen
    for (const row of await page.getByTestId("account-row").all()) {
      const box = (await row.boundingBox())!;
      expect(box.x + box.width).toBeLessThanOrEqual(390);
    }
    await screenshot(page, "pages-admin-users-390x844");
    await page.setViewportSize({ width: 1440, height: 900 });
    await expect(page.getByRole("columnheader", { name: "Role" }).isVisible()).resolves.toBe(true);
    await page.close();
  });

  it("lists jobs with filters from the address, on a phone too", async () => {
    const page = await pageAs("viewer", { width: 390, height: 844 });
    await page.goto(`${app.baseUrl}/jobs?status=succeeded&projectId=${state.projectId}`);
    await expect(page.getByTestId("job-row").count()).resolves.toBeGreaterThan(0);
    await page.goto(`${app.baseUrl}/jobs?status=failed&projectId=${state.projectId}`);
    await expect(page.getByText("No jobs match these filters").count()).resolves.toBe(1);
    await page.goto(`${app.baseUrl}/jobs`);
    await screenshot(page, "pages-jobs-390x844");
    await page.close();
    expect(errors).toEqual([]);
  });
});
