// Browser helpers for the e2e tests: Debian's chromium driven by playwright-core, with the
// flags that work headless on this kind of machine (docs: stack.md, pitfall 9).
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";

export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
const screenshotDir = path.resolve(import.meta.dirname, "../../../test-artifacts/screenshots");

export interface Browser {
  context: BrowserContext;
  newPage(viewport?: { width: number; height: number }): Promise<Page>;
  close(): Promise<void>;
}

export async function launchBrowser(opts: { viewport?: { width: number; height: number } } = {}): Promise<Browser> {
  if (!fs.existsSync(CHROMIUM))
    throw new Error(`No chromium at ${CHROMIUM}: install Debian's chromium package (.ci/run does) or set CHROMIUM_PATH.`);
  // Playwright refuses --user-data-dir in args; a persistent context takes the folder instead.
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: opts.viewport ?? { width: 1440, height: 900 },
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
  return {
    context,
    async newPage(viewport) {
      const page = await context.newPage();
      if (viewport) await page.setViewportSize(viewport);
      return page;
    },
    async close() {
      await context.close();
      fs.rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Signs in through the /sign-in form (fields "E-mail" and "Password", button "Sign in").
 *  Pass baseUrl unless the page is already on the app. Throws with the form's message on failure. */
export async function signIn(page: Page, email: string, password: string, baseUrl?: string): Promise<void> {
  const current = page.url();
  const origin = baseUrl ?? (current.startsWith("http") ? new URL(current).origin : null);
  if (!origin) throw new Error("signIn: the page is not on the app yet; pass the app's baseUrl");
  await page.goto(`${origin}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  try {
    await page.waitForURL((url) => url.pathname !== "/sign-in", { timeout: 15_000 });
  } catch {
    const alert = await page.locator('[role="alert"]').allInnerTexts().catch(() => []);
    throw new Error(`Signing in as ${email} did not leave /sign-in${alert.length ? `: ${alert.join(" ")}` : ""}`);
  }
}

/** Saves a full-page PNG to test-artifacts/screenshots/<name>.png and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(screenshotDir, { recursive: true });
  const file = path.join(screenshotDir, `${name.replace(/[^\w.-]+/g, "-")}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}
