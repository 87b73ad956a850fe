// The demo seed runs on every `npm start`: a second run must reuse what is there and add
// nothing twice (issue 2: "a second start reuses the data").
import { count } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startTestServices, type TestServices } from "../support/services";

let svc: TestServices;
beforeAll(async () => {
  svc = await startTestServices();
});
afterAll(async () => svc?.stop());

describe("seed", () => {
  it("creates the demo projects and one account per role once, and nothing more on a second run", async () => {
    const { db } = await import("~/db/client.server");
    const { migrateDb } = await import("~/db/migrate.server");
    const schema = await import("~/db/schema");
    const { seed, DEMO_PROJECTS } = await import("../../scripts/seed");
    await migrateDb(db());

    const tally = async () => {
      const rows = await Promise.all(
        [schema.projects, schema.user, schema.models, schema.jobs].map((t) => db().select({ n: count() }).from(t).get()),
      );
      return rows.map((r) => r?.n ?? 0);
    };

    const first = await seed(db());
    expect(first.projects.map((p) => p.code)).toEqual(DEMO_PROJECTS.map((p) => p.code));
    expect(first.projects.every((p) => p.created)).toBe(true);
    expect(first.accounts.map((a) => a.role).sort()).toEqual(["admin", "checker", "engineer", "viewer"]);
    const afterFirst = await tally();
    expect(afterFirst[0]).toBe(DEMO_PROJECTS.length);
    expect(afterFirst[1]).toBe(4);

    const second = await seed(db());
    expect(second.projects.every((p) => !p.created)).toBe(true);
    expect(second.accounts).toEqual(first.accounts);
    expect(await tally()).toEqual(afterFirst);
  });
});
