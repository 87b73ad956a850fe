// Security headers over HTTP, against the built app (issue 14, "Requests"): React Router runs
// the root route's middleware on every response, so pages, page data, the JSON API, the PDF
// report, CSV and model file downloads and error answers (4xx and a 503) all carry them; the
// pages carry the nonce policy, and the app and its 3D viewer run under it without a single
// policy violation in the browser. What each header is for: tests/auth/security-headers.test.ts.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type RunningApp } from "./harness";
import { launchBrowser, screenshot, signIn, type Browser } from "./support/browser";

let app: RunningApp;
let browser: Browser;
let cookie = "";

beforeAll(async () => {
  app = await startApp({ worker: true }); // the worker runs the demo jobs: the report needs one done
  browser = await launchBrowser();
  const engineer = app.accounts.find((a) => a.role === "engineer")!;
  const res = await fetch(`${app.baseUrl}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: app.baseUrl },
    body: JSON.stringify({ email: engineer.email, password: engineer.password }),
  });
  expect(res.status).toBe(200);
  cookie = res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
});
afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

function expectHeaders(res: Response, what: string, page = false) {
  expect(res.headers.get("x-content-type-options"), what).toBe("nosniff");
  expect(res.headers.get("x-frame-options"), what).toBe("DENY");
  expect(res.headers.get("referrer-policy"), what).toBe("same-origin");
  const csp = res.headers.get("content-security-policy") ?? "";
  expect(csp, what).toContain("frame-ancestors 'none'");
  if (page) expect(csp, what).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+'/);
  else expect(csp, what).toContain("default-src 'none'");
}

const get = (path: string, withCookie = true) => fetch(`${app.baseUrl}${path}`, { headers: withCookie ? { cookie } : {}, redirect: "manual" });

describe("security headers on every response", () => {
  it("pages, a page redirect and page data", async () => {
    expectHeaders(await get("/sign-in", false), "sign-in page", true);
    const projects = await get("/projects");
    expect(projects.status).toBe(200);
    expectHeaders(projects, "projects page", true);
    const redirect = await get("/projects", false);
    expect(redirect.status).toBe(302);
    expectHeaders(redirect, "redirect to sign-in");
    const data = await get("/projects.data");
    expect(data.status).toBe(200);
    expectHeaders(data, "page data");
    const missing = await get("/no-such-page");
    expect(missing.status).toBe(404);
    expectHeaders(missing, "404 page", true);
  });

  it("the JSON API, CSV and model file downloads, and the PDF report", async () => {
    const health = await get("/api/health", false);
    expect(health.status).toBe(200);
    expectHeaders(health, "health JSON");
    const csv = await get("/api/models/templates/members.csv");
    expect(csv.headers.get("content-type")).toContain("text/csv");
    expectHeaders(csv, "CSV template");
    const models = (await (await get("/api/models")).json()) as { models: { id: string }[] };
    const file = await get(`/api/models/${models.models[0]!.id}/file`);
    expect(file.status).toBe(200);
    expect(file.headers.get("content-disposition")).toMatch(/^attachment/);
    expectHeaders(file, "model file");

    // the worker solves the demo jobs; the first one done gives a report
    let jobId: string | undefined;
    for (let i = 0; i < 180 && !jobId; i++) {
      const done = (await (await get("/api/jobs?status=succeeded")).json()) as { jobs: { id: string }[] };
      jobId = done.jobs[0]?.id;
      if (!jobId) await new Promise((r) => setTimeout(r, 1000));
    }
    expect(jobId, "a demo job succeeded within 3 minutes").toBeDefined();
    const pdf = await get(`/api/jobs/${jobId}/report`);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    expectHeaders(pdf, "PDF report");
  });

  it("error answers: 400, 401, 403, 404 from the API", async () => {
    const cases: [number, Promise<Response>][] = [
      [400, get("/api/jobs?limit=many")],
      [401, get("/api/projects", false)],
      [403, fetch(`${app.baseUrl}/api/projects`, { method: "POST", headers: { cookie, origin: "http://127.0.0.1:1", "content-type": "application/json" }, body: "{}" })],
      [404, get("/api/jobs/no-such-job")],
    ];
    for (const [status, pending] of cases) {
      const res = await pending;
      expect(res.status).toBe(status);
      expectHeaders(res, String(status));
    }
  });

  it("pages run under their policy without a violation, the 3D viewer included", async () => {
    const page = await browser.newPage();
    await browser.context.clearCookies();
    const violations: string[] = [];
    page.on("console", (m) => {
      if (/Content Security Policy|Refused to/i.test(m.text())) violations.push(m.text());
    });
    await page.addInitScript(() => {
      document.addEventListener("securitypolicyviolation", (e) => console.error(`Refused to load: ${e.violatedDirective} ${e.blockedURI} at ${e.sourceFile}:${e.lineNumber}:${e.columnNumber} on ${location.pathname}`));
    });
    const engineer = app.accounts.find((a) => a.role === "engineer")!;
    await signIn(page, engineer.email, engineer.password, app.baseUrl);
    const models = (await (await get("/api/models")).json()) as { models: { id: string }[] };
    await page.goto(`${app.baseUrl}/models/${models.models[0]!.id}`);
    await page.locator("canvas").first().waitFor({ timeout: 30_000 });
    await page.waitForTimeout(1500); // the viewer's first frames
    await screenshot(page, "security-model-page-1440x900");
    await page.goto(`${app.baseUrl}/projects`);
    await page.getByRole("heading").first().waitFor();
    expect(violations).toEqual([]);
    await page.close();
  });

  it("a 503 when a service is down (last: it stops the mail catcher)", async () => {
    await app.mail.stop();
    const res = await get("/api/health", false);
    expect(res.status).toBe(503);
    expectHeaders(res, "503");
  });
});
