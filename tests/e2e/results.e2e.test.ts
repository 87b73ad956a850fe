// Results an engineer reads at a glance (issue 16), one test per defect the issue names, in
// headless chromium against the built app with its worker: "Orbit in 3D" pressed twice on a
// planar model; an infeasible run that never reads "succeeded"; units in every numeric table
// header; rounding noise printed as 0; cancel that asks first and keeps the best design; two
// runs side by side; an approved run whose review form is gone. Then the layout: no sideways
// scrolling at 390 px, no summary figure cut off at 1440 px, screenshots of both widths in
// test-artifacts/screenshots/ (results-*).
import fs from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type RunningApp } from "./harness";
import { launchBrowser, screenshot, signIn, type Browser } from "./support/browser";
import { canvasInk, waitForCanvas } from "./support/canvas";
import { gridRoof } from "./support/models";

const ROOF = path.resolve(import.meta.dirname, "fixtures/kiln-roof.truss.json");
// two-bar bracket whose largest allowed area is far below what the stress limit needs (statics)
const BRACKET = path.resolve(import.meta.dirname, "../fixtures/models/design/infeasible-bracket.truss.json");
// a coordinate the roof file carries as rounding noise (issue 16 saw 1.202e-15 in the node table)
const NOISE = 1.202e-15;
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1440, height: 900 };

let app: RunningApp;
let browser: Browser;
const errors: string[] = [];
const ids: Record<"project" | "roof" | "bracket" | "optimal" | "early" | "infeasible", string> = {} as never;

function account(role: string) {
  const a = app.accounts.find((x) => x.role === role);
  if (!a) throw new Error(`The seed made no ${role} account`);
  return a;
}

async function pageAs(role: string, viewport = DESKTOP): Promise<Page> {
  await browser.context.clearCookies();
  const page = await browser.newPage(viewport);
  page.on("pageerror", (e) => errors.push(`${role}: ${e.message}`));
  page.on("console", (m) => {
    if (m.type() === "error" && !m.text().startsWith("Failed to load resource")) errors.push(`${role} console: ${m.text()}`);
  });
  await signIn(page, account(role).email, account(role).password, app.baseUrl);
  return page;
}

/** The JSON API with the page's session; throws with the answer on anything but 2xx. */
async function api<T>(page: Page, method: "get" | "post", url: string, init: Parameters<Page["request"]["post"]>[1] = {}): Promise<T> {
  const res = await page.request[method](`${app.baseUrl}${url}`, { ...init, headers: { origin: app.baseUrl, ...(init.headers ?? {}) } });
  if (res.status() >= 300) throw new Error(`${method.toUpperCase()} ${url}: ${res.status()} ${await res.text()}`);
  return (await res.json()) as T;
}

async function upload(page: Page, name: string, model: unknown): Promise<string> {
  const file = { name, mimeType: "application/json", buffer: Buffer.from(JSON.stringify(model)) };
  return (await api<{ id: string }>(page, "post", "/api/models", { multipart: { projectId: ids.project, file } })).id;
}

async function queue(page: Page, modelId: string, options: Record<string, unknown> = {}): Promise<string> {
  return (await api<{ id: string }>(page, "post", "/api/jobs", { data: { modelId, options } })).id;
}

async function finished(page: Page, jobId: string, timeoutMs = 180_000): Promise<{ status: string; outcome: string | null }> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const job = await api<{ status: string; outcome: string | null }>(page, "get", `/api/jobs/${jobId}`);
    if (!["queued", "running"].includes(job.status)) return job;
    if (Date.now() > end) throw new Error(`job ${jobId} still ${job.status}\n${app.logs().slice(-2000)}`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

/** How far the page reaches past the viewport sideways (0 when it fits), and what sticks out. */
const sideways = (page: Page) =>
  page.evaluate(() => {
    const width = window.innerWidth;
    // the outermost elements past the right edge, named by tag, test id or class
    const out = [...document.querySelectorAll<HTMLElement>("main *")]
      .filter((e) => e.getBoundingClientRect().right > width + 1)
      .filter((e) => e.parentElement!.getBoundingClientRect().right <= width + 1 && getComputedStyle(e.parentElement!).overflowX === "visible")
      .map((e) => `${e.tagName.toLowerCase()}${e.dataset.testid ? `[${e.dataset.testid}]` : ""}.${String(e.className).slice(0, 60)} → ${Math.round(e.getBoundingClientRect().right)} px`);
    return { over: document.documentElement.scrollWidth - width, out: out.slice(0, 8) };
  });

/** Opens a page and waits until its tables (they fill in after hydration) are there. */
async function openJob(page: Page, jobId: string) {
  await page.goto(`${app.baseUrl}/jobs/${jobId}`);
  await page.getByTestId("outcome").waitFor({ timeout: 30_000 });
  await page.getByRole("region", { name: "Nodes" }).locator("tbody tr").first().waitFor({ timeout: 30_000 });
}

/**
 * Each table header over a column of numbers, with what the column holds. A column holds
 * numbers when most of its filled cells read as one (digits, separators, a sign, a % sign).
 */
async function numericHeaders(page: Page) {
  return page.evaluate(() => {
    const numeric = /^[−+-]?[\d,]*\.?\d+(e[−+-]?\d+)?\s*%?$/i;
    const out: { table: string; header: string; sample: string }[] = [];
    for (const table of document.querySelectorAll("table")) {
      const heads = [...table.querySelectorAll("thead th")];
      const rows = [...table.querySelectorAll("tbody tr")];
      heads.forEach((th, i) => {
        const cells = rows.map((r) => (r.children[i] as HTMLElement | undefined)?.innerText.trim() ?? "").filter((t) => t && t !== "–");
        const nums = cells.filter((t) => numeric.test(t));
        if (cells.length > 0 && nums.length / cells.length > 0.5)
          out.push({ table: table.getAttribute("aria-label") ?? table.closest("section")?.getAttribute("aria-label") ?? "?", header: (th as HTMLElement).innerText.trim(), sample: nums[0]! });
      });
    }
    return out;
  });
}

// the rule: a numeric column's header names its unit in brackets, "(mm²)" or "[kN]", or it is
// a count, a ratio or a percentage (a pure number by nature: iterations, a buckling factor)
const UNIT_IN_BRACKETS = /[([][^)\]]*[A-Za-z%²³°µ·/][^)\]]*[)\]]/;
const PURE_NUMBER = /^(iterations|analyses|members|nodes|loads|starts|version|buckling factor k|.*\bratio\b.*)$/i;

beforeAll(async () => {
  app = await startApp();
  browser = await launchBrowser();
  const page = await pageAs("engineer");
  // the seed queues the demo models' runs for the engineer; this file needs the worker at once
  const { jobs } = await api<{ jobs: { id: string; status: string }[] }>(page, "get", "/api/jobs?limit=50");
  for (const j of jobs.filter((x) => x.status === "queued" || x.status === "running")) {
    // one that finished meanwhile answers 409, which is as good
    const res = await page.request.post(`${app.baseUrl}/api/jobs/${j.id}/cancel`, { headers: { origin: app.baseUrl } });
    expect([200, 409], await res.text()).toContain(res.status());
  }
  const project = await api<{ id?: string; project?: { id: string } }>(page, "post", "/api/projects", {
    data: { code: `RG-${Date.now().toString(36).toUpperCase()}`, name: "Ropewalk gallery, Ellerby Quay" },
  });
  ids.project = (project.id ?? project.project?.id)!;
  for (const role of ["checker", "viewer"]) await api(page, "post", `/api/projects/${ids.project}/members`, { data: { email: account(role).email } });
  const roof = JSON.parse(fs.readFileSync(ROOF, "utf8")) as { nodes: { id: string; y: number }[]; loadCases: { name: string }[] };
  roof.nodes.find((n) => n.id === "B0")!.y = NOISE;
  // a case name as long as the demo roof's: the page-wide case picker once pushed a phone page 95 px wide
  roof.loadCases[0]!.name = "Uniform snow on both slopes of the full roof";
  ids.roof = await upload(page, "kiln-roof.truss.json", roof);
  ids.bracket = await upload(page, "bracket.truss.json", JSON.parse(fs.readFileSync(BRACKET, "utf8")));
  ids.optimal = await queue(page, ids.roof);
  ids.early = await queue(page, ids.roof, { maxIterations: 3, starts: 1 }); // stopped early: a design of its own
  ids.infeasible = await queue(page, ids.bracket);
  expect((await finished(page, ids.optimal)).outcome, app.logs().slice(-2000)).toBe("optimal");
  expect((await finished(page, ids.early)).status).toBe("succeeded");
  expect((await finished(page, ids.infeasible)).outcome).toBe("infeasible");
  await page.close();
}, 360_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("results read at a glance (issue 16)", () => {
  it("(a) Orbit in 3D pressed twice on a planar model: the canvas still draws", async () => {
    const page = await pageAs("engineer");
    await openJob(page, ids.optimal);
    await waitForCanvas(page);
    const viewer = page.getByTestId("truss-viewer");
    for (const name of ["Orbit in 3D", "Flat 2D view", "Orbit in 3D"]) {
      await viewer.getByRole("button", { name }).click();
      await page.waitForTimeout(700);
    }
    expect(await viewer.innerText()).not.toMatch(/graphics context was lost/i);
    const alive = await page.evaluate(() => {
      const c = document.querySelector<HTMLCanvasElement>('[data-testid="truss-viewer"] canvas');
      const gl = c?.getContext("webgl2") ?? c?.getContext("webgl");
      return !!gl && !gl.isContextLost();
    });
    expect(alive, "the WebGL context is alive").toBe(true);
    expect((await canvasInk(page)).ratio, "members are drawn").toBeGreaterThan(0.003);
    await page.close();
  });

  it("(b) an infeasible run never reads 'succeeded', offers no sign-off and no 'Optimized truss'", async () => {
    const page = await pageAs("checker");
    await openJob(page, ids.infeasible);
    const text = await page.locator("main").innerText();
    expect(text).not.toMatch(/succeeded/i);
    expect(text).not.toMatch(/not reviewed yet/i);
    await expect(page.locator("h1").getByTestId("job-state").innerText()).resolves.toContain("no design meets every limit");
    const title = await page.getByTestId("truss-viewer").locator("h2").innerText();
    expect(title).not.toMatch(/optimi[sz]ed truss/i);
    expect(title).toMatch(/does not meet every limit/);
    await page.close();
  });

  it("(c) every table header over numbers carries its unit, or is a count or a ratio (job, model, list, project, desk)", async () => {
    const page = await pageAs("engineer");
    const found: { where: string; table: string; header: string; sample: string }[] = [];
    await openJob(page, ids.optimal);
    await page.getByRole("region", { name: "Members" }).locator("tbody tr").first().waitFor();
    found.push(...(await numericHeaders(page)).map((h) => ({ where: "job page", ...h })));
    await page.goto(`${app.baseUrl}/models/${ids.roof}`);
    await page.locator("table tbody tr").first().waitFor({ timeout: 20_000 });
    found.push(...(await numericHeaders(page)).map((h) => ({ where: "model page", ...h })));
    await page.goto(`${app.baseUrl}/jobs?projectId=${ids.project}`);
    await page.getByTestId("job-row").first().waitFor({ timeout: 20_000 });
    found.push(...(await numericHeaders(page)).map((h) => ({ where: "job list", ...h })));
    for (const [where, url] of [["project page", `/projects/${ids.project}`], ["desk", "/"]]) {
      await page.goto(`${app.baseUrl}${url}`);
      await page.waitForTimeout(1500);
      found.push(...(await numericHeaders(page)).map((h) => ({ where: where!, ...h })));
    }
    // the pages must have shown numbers at all, or the rule below checks nothing
    expect(found.filter((f) => f.where === "job page").length).toBeGreaterThan(8);
    expect(found.filter((f) => f.where === "model page").length).toBeGreaterThan(3);
    expect(found.filter((f) => f.where === "job list").length).toBeGreaterThan(0);
    const bare = found.filter((f) => !UNIT_IN_BRACKETS.test(f.header) && !PURE_NUMBER.test(f.header));
    expect(bare, "headers over numbers without a unit").toEqual([]);
    await page.close();
  });

  it("(d) rounding noise prints as 0 in the node table", async () => {
    const page = await pageAs("viewer");
    await openJob(page, ids.optimal);
    const result = await api<{ nodes: { id: string; y: number }[] }>(page, "get", `/api/jobs/${ids.optimal}/result`);
    expect(result.nodes.find((n) => n.id === "B0")!.y).toBe(NOISE); // the API keeps full precision
    const nodes = page.getByRole("region", { name: "Nodes" });
    const heads = await nodes.locator("thead th").allInnerTexts();
    const yCol = heads.findIndex((h) => /^y\b/.test(h.trim()));
    const row = nodes.locator("tbody tr").filter({ has: page.locator("td", { hasText: /^B0$/ }) });
    await expect(row.locator("td").nth(yCol).innerText()).resolves.toBe("0");
    expect(await nodes.innerText()).not.toMatch(/\de[−+-]?\d/i);
    await page.close();
  });

  it("(e) stopping a run asks first, and the stopped run keeps its best design", async () => {
    const page = await pageAs("engineer");
    // a double-layer grid big enough to be still running when the buttons are pressed
    const model = { ...JSON.parse(fs.readFileSync(ROOF, "utf8")), ...gridRoof(16), name: "Ropewalk gallery roof grid" };
    const jobId = await queue(page, await upload(page, "grid.truss.json", model));
    await page.goto(`${app.baseUrl}/jobs/${jobId}`);
    await page.getByTestId("live-status").getByText(/^iteration \d+/).waitFor({ timeout: 90_000 });
    await page.getByTestId("cancel-job").click();
    const confirm = page.getByTestId("cancel-confirm");
    await confirm.getByText("The best design found so far is kept").waitFor();
    await confirm.getByRole("button", { name: "Keep it running" }).click();
    await page.waitForTimeout(1500);
    expect((await api<{ status: string }>(page, "get", `/api/jobs/${jobId}`)).status, "dismissed: still running").toBe("running");
    await page.getByTestId("cancel-job").click();
    await page.getByTestId("cancel-confirm-yes").click();
    await page.getByTestId("outcome").waitFor({ timeout: 60_000 });
    await expect(page.locator("h1 [data-status]").getAttribute("data-status")).resolves.toBe("cancelled");
    await expect(page.locator("h1").getByTestId("job-state").innerText()).resolves.toMatch(/stopped .*best design so far kept/);
    const summary = page.getByRole("region", { name: "Summary" });
    await expect(summary.getByText(/^mass \(t\)$/).count()).resolves.toBe(1);
    expect(Number((await page.getByTestId("objective-final").innerText()).replace(/,/g, ""))).toBeGreaterThan(0);
    await page.close();
  }, 180_000);

  it("(f) two runs ticked in the job list open side by side with mass and group areas", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${app.baseUrl}/jobs?projectId=${ids.project}`);
    for (const id of [ids.optimal, ids.early]) await page.getByTestId("job-row").filter({ has: page.locator(`a[href="/jobs/${id}"]`) }).getByTestId("compare-pick").check();
    await page.getByTestId("compare-selected").click();
    await page.waitForURL(/\/compare\?jobs=/, { timeout: 20_000 });
    expect(new URL(page.url()).searchParams.get("jobs")!.split(",").sort()).toEqual([ids.optimal, ids.early].sort());
    const masses = await page.getByTestId("compare-mass").locator("td").allInnerTexts();
    expect(masses).toHaveLength(2);
    for (const m of masses) expect(Number(m.replace(/,/g, ""))).toBeGreaterThan(0);
    await expect(page.getByTestId("compare-mass").locator("th").innerText()).resolves.toMatch(/mass \(t\)/);
    const groups = page.getByTestId("compare-group");
    expect(await groups.count()).toBeGreaterThan(1);
    for (const cells of await Promise.all((await groups.all()).map((g) => g.locator("td").allInnerTexts()))) {
      expect(cells).toHaveLength(2);
      expect(cells.every((c) => /^\d[\d,.]*/.test(c))).toBe(true);
    }
    // the view is coloured by the change in area: no load case or deformed shape to choose
    await waitForCanvas(page);
    const viewer = page.getByTestId("truss-viewer");
    expect(await viewer.getByText("Load case").count()).toBe(0);
    expect(await viewer.getByLabel("deformed shape").count()).toBe(0);
    expect((await canvasInk(page)).ratio).toBeGreaterThan(0.003);
    await page.close();
  });

  it("(g) an approved run's review form is gone; only an admin reopens it, with a reason", async () => {
    const checker = await pageAs("checker");
    await openJob(checker, ids.optimal);
    const form = checker.getByTestId("review-form");
    await form.getByLabel("Approve").check();
    await form.getByLabel("Comment").fill("Chord forces checked by the method of sections for the snow case.");
    await form.getByRole("button", { name: "Record decision" }).click();
    await checker.getByTestId("review-closed").waitFor({ timeout: 15_000 });
    await checker.reload();
    await checker.getByTestId("review-closed").waitFor();
    expect(await checker.getByTestId("review-form").count()).toBe(0);
    expect(await checker.getByTestId("reopen-form").count()).toBe(0);
    // nor can the decision be flipped behind the page's back
    const flip = await checker.request.post(`${app.baseUrl}/api/jobs/${ids.optimal}/reviews`, {
      data: { decision: "changes-requested", comment: "Changed my mind." },
      headers: { origin: app.baseUrl },
    });
    expect(flip.status()).toBeGreaterThanOrEqual(400);
    await checker.close();

    const admin = await pageAs("admin");
    await admin.goto(`${app.baseUrl}/jobs/${ids.optimal}`);
    await admin.getByText("Reopen this approved run (admin)").click();
    const reopen = admin.getByTestId("reopen-form");
    await reopen.getByLabel("Why it must be reviewed again").fill("The drift load on the east bay was revised by the client.");
    await reopen.getByRole("button", { name: "Reopen for review" }).click();
    await admin.getByTestId("review-history").getByText("drift load on the east bay").waitFor({ timeout: 15_000 });
    await admin.close();
  });

  it("fits a phone (390 px) without sideways scrolling, and cuts no summary figure at 1440 px", async () => {
    const page = await pageAs("engineer", PHONE);
    const pages: [string, string][] = [
      ["job-optimal", `/jobs/${ids.optimal}`],
      ["job-infeasible", `/jobs/${ids.infeasible}`],
      ["compare", `/compare?jobs=${ids.optimal},${ids.early}`],
      ["model", `/models/${ids.roof}`],
    ];
    for (const [name, url] of pages) {
      for (const viewport of [PHONE, DESKTOP]) {
        await page.setViewportSize(viewport);
        if (name.startsWith("job")) await openJob(page, url.split("/").pop()!);
        else await page.goto(`${app.baseUrl}${url}`);
        await page.locator("table tbody tr:visible").first().waitFor({ timeout: 20_000 });
        await page.waitForTimeout(800);
        await screenshot(page, `results-${name}-${viewport.width}`);
        const wide = await sideways(page);
        expect.soft(wide.over, `${name} at ${viewport.width} px reaches past the edge: ${wide.out.join("; ")}`).toBeLessThanOrEqual(0);
        const cut = await page.evaluate(() =>
          [...document.querySelectorAll('[aria-label="Summary"] dd')].filter((d) => d.scrollWidth > d.clientWidth + 1).map((d) => (d as HTMLElement).innerText),
        );
        expect.soft(cut, `${name} at ${viewport.width} px: summary figures cut off`).toEqual([]);
      }
    }
    await page.close();
  });

  it("no page errors along the way", () => {
    expect(errors).toEqual([]);
  });
});
