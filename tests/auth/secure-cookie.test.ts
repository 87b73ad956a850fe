// Behind https (APP_URL https://…) the session cookie is Secure and __Secure- prefixed, on top
// of HttpOnly and SameSite=Lax (common practice; RFC 6265bis cookie prefixes).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeUser, PASSWORD, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
beforeAll(async () => {
  process.env.APP_URL = "https://desk.tarrowkeel.example";
  ctx = await setup();
});
afterAll(async () => {
  delete process.env.APP_URL;
  await ctx?.services.stop();
});

describe("cookies over https", () => {
  it("sets a Secure, HttpOnly, SameSite=Lax, __Secure- prefixed session cookie", async () => {
    const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
    const { getUser } = await import("~/lib/auth/authorize.server");
    await makeUser("secure.one@tarrowkeel-test.example", "viewer");
    const res = await callAuthEndpoint(new Request("https://desk.tarrowkeel.example/sign-in"), "/sign-in/email", { email: "secure.one@tarrowkeel-test.example", password: PASSWORD });
    expect(res.status).toBe(200);
    const session = res.setCookies.find((c) => c.includes("session_token"))!;
    expect(session).toMatch(/^__Secure-strutwise\.session_token=/);
    expect(session).toMatch(/;\s*Secure/i);
    expect(session).toMatch(/HttpOnly/i);
    expect(session).toMatch(/SameSite=Lax/i);
    const cookie = session.split(";")[0]!;
    expect(await getUser(new Request("https://desk.tarrowkeel.example/projects", { headers: { cookie } }))).toMatchObject({ role: "viewer" });
    // the same value under the plain name (as a downgraded http request would send it) is not read
    expect(await getUser(new Request("https://desk.tarrowkeel.example/projects", { headers: { cookie: cookie.replace("__Secure-", "") } }))).toBeNull();
  });
});
