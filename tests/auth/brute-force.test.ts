// Sign-in brute force is slowed: past the limit, attempts from one address get 429 (even
// with the right password) until the window passes; other addresses are not affected.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeUser, PASSWORD, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
beforeAll(async () => {
  ctx = await setup();
});
afterAll(async () => ctx?.services.stop());

async function attempt(ip: string, password: string) {
  const { auth } = await import("~/lib/auth/auth.server");
  // straight at the HTTP handler, as a script hammering /api/auth/sign-in/email would
  const res = await auth().handler(
    new Request("http://localhost:4310/api/auth/sign-in/email", {
      method: "POST",
      headers: { "content-type": "application/json", origin: "http://localhost:4310", "x-forwarded-for": ip },
      body: JSON.stringify({ email: "target@quarry-bridge.example", password }),
    }),
  );
  return res.status;
}

describe("sign-in throttle", () => {
  it("answers 429 once an address exceeds the limit, and the page says how long to wait", async () => {
    const { signInLimit } = await import("~/lib/auth/auth.server");
    const { max } = signInLimit();
    await makeUser("target@quarry-bridge.example", "engineer");
    const statuses: number[] = [];
    for (let i = 0; i < max + 3; i++) statuses.push(await attempt("203.0.113.9", `guess-number-${i}`));
    expect(statuses.slice(0, max).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(max)).toEqual([429, 429, 429]);
    // the right password does not get through while throttled
    expect(await attempt("203.0.113.9", PASSWORD)).toBe(429);
    // another address still signs in
    expect(await attempt("198.51.100.20", PASSWORD)).toBe(200);

    // the counter lives in the database (shared by every server process)
    const { rateLimit } = await import("~/db/schema");
    const rows = await ctx.db.select().from(rateLimit);
    expect(rows.some((r) => r.key.startsWith("203.0.113.9") && r.count >= max)).toBe(true);

    // through the sign-in page: a worded message, not a stack
    const { action } = await import("~/routes/sign-in");
    const form = new FormData();
    form.set("email", "target@quarry-bridge.example");
    form.set("password", PASSWORD);
    const res = (await action({
      request: new Request("http://localhost:4310/sign-in", { method: "POST", body: form, headers: { "x-forwarded-for": "203.0.113.9" } }),
      params: {},
      context: {},
    } as never)) as unknown as { init: { status: number }; data: { errors: { form: string } } };
    expect(res.init.status).toBe(429);
    expect(res.data.errors.form).toMatch(/Too many sign-in attempts.*Wait \d+ seconds/);
  });
});
