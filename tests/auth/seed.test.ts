// The demo accounts: one per role, idempotent, and each signs in with its listed password.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { req, sessionCookie, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
beforeAll(async () => {
  ctx = await setup();
});
afterAll(async () => ctx?.services.stop());

describe("seedDemoAccounts", () => {
  it("creates one account per role, twice without duplicates, and each can sign in", async () => {
    const { seedDemoAccounts } = await import("~/lib/auth/seed.server");
    const { getUser } = await import("~/lib/auth/authorize.server");
    const { user } = await import("~/db/schema");
    const first = await seedDemoAccounts(ctx.db);
    const second = await seedDemoAccounts(ctx.db);
    expect(first.map((a) => a.role).sort()).toEqual(["admin", "checker", "engineer", "viewer"]);
    expect(second).toEqual(first);
    expect((await ctx.db.select().from(user)).length).toBe(4);
    for (const a of first) {
      const cookie = await sessionCookie(a.email, a.password);
      expect(await getUser(req("/", { cookie }))).toMatchObject({ email: a.email, role: a.role });
    }
  });

  it("the README lists exactly these accounts", async () => {
    const fs = await import("node:fs");
    const { DEMO_ACCOUNTS } = await import("~/lib/auth/seed.server");
    const readme = fs.readFileSync("README.md", "utf8");
    for (const a of DEMO_ACCOUNTS) expect(readme).toContain(`| ${a.role} | ${a.email} | ${a.password} |`);
  });
});
