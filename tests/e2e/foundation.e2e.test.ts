// The platform end to end: the built app with its own services answers, its health check is
// green, the home page is styled with fonts we ship ourselves, and nothing is fetched from
// another origin.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type RunningApp } from "./harness";
import { launchBrowser, screenshot, type Browser } from "./support/browser";

let app: RunningApp;
let browser: Browser;

beforeAll(async () => {
  app = await startApp();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("foundation", () => {
  it("reports every dependency healthy at /api/health", async () => {
    const res = await fetch(`${app.baseUrl}/api/health`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("application/json");
    expect(await res.json()).toEqual({ db: "ok", storage: "ok", mail: "ok" });
  });

  it("serves the styled home page with our own fonts from our own origin only", async () => {
    const page = await browser.newPage({ width: 1440, height: 900 });
    const requests: { url: string; type: string }[] = [];
    page.on("request", (r) => requests.push({ url: r.url(), type: r.resourceType() }));
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    page.on("console", (m) => {
      if (m.type() === "error") errors.push(m.text());
    });

    const res = await page.goto(app.baseUrl, { waitUntil: "networkidle" });
    expect(res?.status()).toBe(200);
    await page.evaluate(() => document.fonts.ready);

    const origin = new URL(app.baseUrl).origin;
    const foreign = requests.filter((r) => !r.url.startsWith(`${origin}/`) && !r.url.startsWith("data:"));
    expect(foreign, `requests to other origins: ${foreign.map((r) => r.url).join(", ")}`).toEqual([]);
    const assets = requests.filter((r) => ["stylesheet", "font", "script"].includes(r.type));
    expect(assets.some((r) => r.type === "stylesheet")).toBe(true);
    expect(assets.some((r) => r.type === "script")).toBe(true);
    expect(assets.filter((r) => r.type === "font").length).toBeGreaterThanOrEqual(2);

    // document.fonts.check is true only once a matching face has really been loaded
    const fonts = await page.evaluate(() => ({
      text: document.fonts.check('16px "IBM Plex Sans"'),
      mono: document.fonts.check('16px "Roboto Mono"'),
      loaded: [...document.fonts].filter((f) => f.status === "loaded").map((f) => f.family.replace(/"/g, "")),
    }));
    expect(fonts.text).toBe(true);
    expect(fonts.mono).toBe(true);
    expect(fonts.loaded).toEqual(expect.arrayContaining(["IBM Plex Sans", "Roboto Mono"]));

    // the design tokens reached the page: warm paper background, our text face on the body
    const style = await page.evaluate(() => {
      const s = getComputedStyle(document.documentElement);
      return { background: s.backgroundColor, family: getComputedStyle(document.body).fontFamily };
    });
    expect(style.background).toBe("rgb(246, 244, 239)"); // --color-paper #f6f4ef
    expect(style.family).toContain("IBM Plex Sans");
    await expect(page.locator("h1").first().innerText()).resolves.toMatch(/\S/);

    await screenshot(page, "foundation-home-1440x900");
    await page.setViewportSize({ width: 390, height: 844 });
    await page.waitForTimeout(200);
    await screenshot(page, "foundation-home-390x844");
    expect(errors).toEqual([]);
    await page.close();
  });

  it("answers an unknown address with the 404 page, without a stack trace", async () => {
    const page = await browser.newPage();
    const res = await page.goto(`${app.baseUrl}/no-such-page-here`);
    expect(res?.status()).toBe(404);
    await expect(page.getByRole("heading", { name: "Not found" }).isVisible()).resolves.toBe(true);
    expect(await page.content()).not.toMatch(/at .*\.js:\d+/);
    await page.close();
  });
});
