// Sign-in brute force is slowed: past the limit, attempts on one account get 429 (even with
// the right password, from any address, and whichever way the body is encoded: JSON, a form,
// multipart) until the window passes; other accounts are not affected, so nobody can lock the
// whole desk out; an address hammering many accounts is slowed too; nothing is mailed.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeUser, PASSWORD, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
beforeAll(async () => {
  process.env.AUTH_SIGN_IN_ADDRESS_LIMIT = "15/60"; // a low per-address limit keeps the test short
  ctx = await setup();
});
afterAll(async () => ctx?.services.stop());

type Encoding = "json" | "form" | "multipart";

function body(encoding: Encoding, email: string, password: string): { body: BodyInit; type?: string } {
  if (encoding === "json") return { body: JSON.stringify({ email, password }), type: "application/json" };
  if (encoding === "form") return { body: new URLSearchParams({ email, password }).toString(), type: "application/x-www-form-urlencoded" };
  const f = new FormData();
  f.set("email", email);
  f.set("password", password);
  return { body: f }; // fetch sets the multipart boundary itself
}

async function attempt(ip: string, password: string, email = "target@quarry-bridge.example", encoding: Encoding = "json") {
  const { action } = await import("~/routes/api/auth.$");
  const b = body(encoding, email, password);
  // through the /api/auth/* route, as a script hammering /api/auth/sign-in/email would
  const request = new Request("http://localhost:4310/api/auth/sign-in/email", {
    method: "POST",
    headers: { ...(b.type ? { "content-type": b.type } : {}), origin: "http://localhost:4310", "x-forwarded-for": ip },
    body: b.body,
  });
  const res = await action({ params: { "*": "sign-in/email" }, context: {}, request } as never);
  return res.status;
}

describe("sign-in throttle", () => {
  it("answers 429 once an account exceeds the limit, and the page says how long to wait", async () => {
    const { signInLimit } = await import("~/lib/auth/sign-in-throttle.server");
    const { max } = signInLimit();
    await makeUser("target@quarry-bridge.example", "engineer");
    await makeUser("bystander@quarry-bridge.example", "engineer");
    const statuses: number[] = [];
    for (let i = 0; i < max + 3; i++) statuses.push(await attempt(`203.0.113.${i + 1}`, `guess-number-${i}`));
    expect(statuses.slice(0, max).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(max)).toEqual([429, 429, 429]);
    // the right password does not get through while throttled, nor does a change of address
    expect(await attempt("203.0.113.9", PASSWORD)).toBe(429);
    expect(await attempt("198.51.100.20", PASSWORD)).toBe(429);
    // another account signs in from the very same address
    expect(await attempt("203.0.113.9", PASSWORD, "bystander@quarry-bridge.example")).toBe(200);

    // the counter lives in the database (shared by every server process)
    const { signInThrottle } = await import("~/db/schema");
    const rows = await ctx.db.select().from(signInThrottle);
    expect(rows.some((r) => r.key === "account:target@quarry-bridge.example" && r.points >= max)).toBe(true);

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

  it("attack: switching the body to a form or multipart does not escape the account's count", async () => {
    const { signInLimit } = await import("~/lib/auth/sign-in-throttle.server");
    const { max } = signInLimit();
    await makeUser("formtarget@quarry-bridge.example", "engineer");
    const encodings: Encoding[] = ["json", "form", "multipart"];
    const statuses: number[] = [];
    for (let i = 0; i < max + 3; i++) statuses.push(await attempt(`192.0.2.${i + 1}`, `guess-${i}`, "formtarget@quarry-bridge.example", encodings[i % 3]!));
    expect(statuses.slice(max)).toEqual([429, 429, 429]);
    for (const enc of encodings) expect(await attempt("192.0.2.200", PASSWORD, "FormTarget@quarry-bridge.example", enc)).toBe(429);
  });

  it("attack: guessing in form-urlencoded bodies alone, or multipart alone, is counted the same", async () => {
    const { signInLimit } = await import("~/lib/auth/sign-in-throttle.server");
    const { max } = signInLimit();
    for (const [n, enc] of (["form", "multipart"] as const).entries()) {
      const email = `only-${enc}@quarry-bridge.example`;
      await makeUser(email, "engineer");
      const statuses: number[] = [];
      for (let i = 0; i < max + 1; i++) statuses.push(await attempt(`192.0.${3 + n}.${i + 1}`, `guess-${i}`, email, enc));
      // better-auth checks the password of a form body (401) and refuses a multipart one
      // unread (415); either way the attempt counts against the account
      expect(statuses.slice(0, max), enc).toEqual(Array(max).fill(enc === "form" ? 401 : 415));
      expect(statuses[max], enc).toBe(429);
      expect(await attempt(`192.0.${3 + n}.250`, PASSWORD, email, enc), enc).toBe(429);
    }
  });

  it("an address trying many accounts is slowed as well, and no lock-out mail goes out", async () => {
    const { addressLimit } = await import("~/lib/auth/sign-in-throttle.server");
    const { max } = addressLimit();
    ctx.services.mail.clear(); // the sign-up links of the accounts above
    const statuses: number[] = [];
    for (let i = 0; i < max + 2; i++) statuses.push(await attempt("198.18.0.7", "guess", `spray-${i}@quarry-bridge.example`));
    expect(statuses.slice(0, max).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(max)).toEqual([429, 429]);
    const mails = (await (await fetch(`${ctx.services.mail.httpUrl}/messages`)).json()) as { messages: { to: string[] }[] };
    expect(mails.messages).toEqual([]); // the throttled accounts' owners hear nothing
  });
});
