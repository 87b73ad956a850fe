// Sign-in, roles and API keys end to end: the built app over HTTP, with Debian's chromium for
// the pages. Demo accounts come from the real seed command (seedDemoAccounts).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type RunningApp } from "./harness";
import { launchBrowser, screenshot, signIn, type Browser } from "./support/browser";

let app: RunningApp;
let browser: Browser;
const account = (role: string) => {
  const a = app.accounts.find((x) => x.role === role);
  if (!a) throw new Error(`the seed made no ${role} account`);
  return a;
};

beforeAll(async () => {
  app = await startApp({ worker: false });
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

async function apiSignIn(email: string, password: string) {
  return fetch(`${app.baseUrl}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: app.baseUrl },
    body: JSON.stringify({ email, password }),
  });
}

describe("accounts over HTTP", () => {
  it("seeds one account per role, and each signs in with a secure-by-default cookie", async () => {
    expect(app.accounts.map((a) => a.role).sort()).toEqual(["admin", "checker", "engineer", "viewer"]);
    for (const a of app.accounts) {
      const res = await apiSignIn(a.email, a.password);
      expect(res.status, `${a.role} signs in`).toBe(200);
      const cookie = res.headers.get("set-cookie") ?? "";
      expect(cookie).toMatch(/HttpOnly/i);
      expect(cookie).toMatch(/SameSite=Lax/i);
    }
  });

  it("a forged session cookie gets 401 on the API and the sign-in page on a page", async () => {
    const api = await fetch(`${app.baseUrl}/api/projects`, { headers: { cookie: "strutwise.session_token=forged.c2lnbmF0dXJl" } });
    expect(api.status).toBe(401);
    const page = await fetch(`${app.baseUrl}/projects`, { headers: { cookie: "strutwise.session_token=forged.c2lnbmF0dXJl" }, redirect: "manual" });
    expect(page.status).toBe(302);
    expect(page.headers.get("location")).toBe("/sign-in?redirectTo=%2Fprojects");
  });

  it("slows brute force on one account with 429, while others still sign in", async () => {
    const target = account("checker");
    const statuses: number[] = [];
    for (let i = 0; i < 12; i++) statuses.push((await apiSignIn(target.email, `wrong-guess-${i}`)).status);
    expect(statuses).toContain(429);
    expect(statuses.indexOf(429)).toBeGreaterThan(0);
    expect((await apiSignIn(target.email, target.password)).status).toBe(429);
    expect((await apiSignIn(account("viewer").email, account("viewer").password)).status).toBe(200);
  });
});

describe("pages and API keys in the browser", () => {
  it("an engineer signs in, creates a project, makes an API key and uses and revokes it", async () => {
    const page = await browser.newPage();
    await browser.context.clearCookies();
    const eng = account("engineer");
    await signIn(page, eng.email, eng.password, app.baseUrl);
    await page.goto(`${app.baseUrl}/projects`);
    await page.getByLabel("Code", { exact: true }).fill("TK-9001");
    await page.getByLabel("Name", { exact: true }).fill("Brackwater slipway gantry");
    await page.getByLabel("Client", { exact: true }).fill("Brackwater Boatyard");
    await page.getByRole("button", { name: "Create project" }).click();
    await page.getByText("Project TK-9001 created.").waitFor();
    await page.getByRole("cell", { name: "TK-9001" }).waitFor();

    // a field error from the shared schema, shown before the form leaves the browser
    await page.getByLabel("Code", { exact: true }).fill("!!");
    await page.getByRole("button", { name: "Create project" }).click();
    await page.getByText("Use letters, digits, dot, dash or underscore").waitFor();
    await expect(page.getByLabel("Code", { exact: true }).getAttribute("aria-invalid")).resolves.toBe("true");
    await screenshot(page, "auth-projects-1440x900");

    await page.goto(`${app.baseUrl}/account`);
    await page.getByLabel("Key name").fill("slipway study");
    await page.getByRole("button", { name: "Create key" }).click();
    const key = (await page.getByTestId("new-api-key").innerText()).trim();
    expect(key).toMatch(/^swk_/);
    await page.getByRole("cell", { name: "slipway study", exact: true }).waitFor(); // listed, by its prefix only
    await screenshot(page, "auth-account-key-1440x900");

    const bearer = { authorization: `Bearer ${key}` };
    const list = await fetch(`${app.baseUrl}/api/projects`, { headers: bearer });
    expect(list.status).toBe(200);
    expect((await list.json()).projects.map((p: { code: string }) => p.code)).toContain("TK-9001");
    const made = await fetch(`${app.baseUrl}/api/projects`, { method: "POST", headers: { ...bearer, "content-type": "application/json" }, body: JSON.stringify({ code: "TK-9002", name: "Scripted" }) });
    expect(made.status).toBe(201);

    await page.reload();
    await expect(page.getByTestId("new-api-key").count()).resolves.toBe(0); // shown once
    await page.getByRole("button", { name: "Revoke key slipway study" }).click();
    await page.getByText("The key is revoked").waitFor();
    const after = await fetch(`${app.baseUrl}/api/projects`, { headers: bearer });
    expect(after.status).toBe(401);
    expect((await after.json()).error).toMatch(/unknown or revoked/);
    await page.close();
  });

  it("a viewer reaching an admin page sees what was missing, in words", async () => {
    const page = await browser.newPage();
    await browser.context.clearCookies();
    const viewer = account("viewer");
    await signIn(page, viewer.email, viewer.password, app.baseUrl);
    const res = await page.goto(`${app.baseUrl}/admin/users`);
    expect(res?.status()).toBe(403);
    await page.getByText("needs permission manage:users; your role is viewer").waitFor();
    expect(await page.content()).not.toMatch(/at \w+ \(.*:\d+:\d+\)/); // no stack trace
    await screenshot(page, "auth-forbidden-1440x900");
    await page.close();
  });

  it("an admin changes a role and the audit trail shows it", async () => {
    const page = await browser.newPage();
    await browser.context.clearCookies();
    const admin = account("admin");
    await signIn(page, admin.email, admin.password, app.baseUrl);
    await page.goto(`${app.baseUrl}/admin/users`);
    const viewer = account("viewer");
    await page.getByLabel(`Role of ${viewer.email}`).selectOption("checker");
    await page.getByRole("row", { name: new RegExp(viewer.email.replace(/\./g, "\\.")) }).getByRole("button", { name: "Save" }).click();
    await page.getByText(`${viewer.email} is now checker`).waitFor();
    await page.goto(`${app.baseUrl}/admin/audit?action=user.role`);
    await page.getByRole("cell", { name: "user.role-change" }).first().waitFor();
    await screenshot(page, "auth-audit-1440x900");
    await page.close();
  });
});
