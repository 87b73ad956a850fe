// Sign-in brute force is slowed: past the limit, attempts on one account get 429 (even with
// the right password, and from any address) until the window passes; other accounts are not
// affected, so nobody can lock the whole desk out.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeUser, PASSWORD, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
beforeAll(async () => {
  ctx = await setup();
});
afterAll(async () => ctx?.services.stop());

async function attempt(ip: string, password: string, email = "target@quarry-bridge.example") {
  const { action } = await import("~/routes/api/auth.$");
  // through the /api/auth/* route, as a script hammering /api/auth/sign-in/email would
  const res = await action({
    params: { "*": "sign-in/email" },
    context: {},
    request: new Request("http://localhost:4310/api/auth/sign-in/email", {
      method: "POST",
      headers: { "content-type": "application/json", origin: "http://localhost:4310", "x-forwarded-for": ip },
      body: JSON.stringify({ email, password }),
    }),
  } as never);
  return res.status;
}

describe("sign-in throttle", () => {
  it("answers 429 once an account exceeds the limit, and the page says how long to wait", async () => {
    const { signInLimit, throttleAddressFor } = await import("~/lib/auth/auth.server");
    const { max } = signInLimit();
    await makeUser("target@quarry-bridge.example", "engineer");
    await makeUser("bystander@quarry-bridge.example", "engineer");
    const statuses: number[] = [];
    for (let i = 0; i < max + 3; i++) statuses.push(await attempt("203.0.113.9", `guess-number-${i}`));
    expect(statuses.slice(0, max).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(max)).toEqual([429, 429, 429]);
    // the right password does not get through while throttled, nor does a change of address
    expect(await attempt("203.0.113.9", PASSWORD)).toBe(429);
    expect(await attempt("198.51.100.20", PASSWORD)).toBe(429);
    // another account signs in from the very same address
    expect(await attempt("203.0.113.9", PASSWORD, "bystander@quarry-bridge.example")).toBe(200);

    // the counter lives in the database (shared by every server process)
    const { rateLimit } = await import("~/db/schema");
    const rows = await ctx.db.select().from(rateLimit);
    const stand = throttleAddressFor("target@quarry-bridge.example");
    expect(rows.some((r) => r.key.startsWith(stand.slice(0, 10)) && r.count >= max)).toBe(true);

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
