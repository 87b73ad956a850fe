// API key life cycle: created once (only its sha256 kept), used as Bearer with the owner's
// current role, revoked, and refused after.
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeUser, req, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
beforeAll(async () => {
  ctx = await setup();
});
afterAll(async () => ctx?.services.stop());

async function call(mod: { loader?: Function; action?: Function }, kind: "loader" | "action", request: Request) {
  try {
    return (await mod[kind]!({ request, params: {}, context: {} })) as Response;
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

describe("API key life cycle", () => {
  it("create, use, demote, revoke, refused after", async () => {
    const { createApiKey, listApiKeys, revokeApiKey } = await import("~/lib/auth/api-keys.server");
    const { getUser } = await import("~/lib/auth/authorize.server");
    const { apiKeys, user } = await import("~/db/schema");
    const projectsApi = await import("~/routes/api/projects");
    const owner = await makeUser("tomas.reyes@fernhill-design.example", "engineer", "Tomás Reyes");

    const { key, info } = await createApiKey({ userId: owner.id, email: owner.email, name: "span study" });
    expect(key).toMatch(/^swk_[A-Za-z0-9_-]{43}$/);

    // stored as the sha256 of the key (FIPS 180-4 digest via node:crypto), never the key itself
    const row = await ctx.db.query.apiKeys.findFirst({ where: eq(apiKeys.id, info.id) });
    expect(row!.hash).toBe(createHash("sha256").update(key).digest("hex"));
    expect(JSON.stringify(row)).not.toContain(key);
    expect(JSON.stringify(await listApiKeys(owner.id))).not.toContain(row!.hash);

    // acts as its owner with the owner's role
    expect(await getUser(req("/api/projects", { key }))).toMatchObject({ id: owner.id, role: "engineer", via: "api-key" });
    const created = await call(projectsApi, "action", req("/api/projects", { method: "POST", key, body: JSON.stringify({ code: "BRK-1", name: "Brook crossing" }) }));
    expect(created.status).toBe(201);

    // the CURRENT role counts: a demoted owner's key loses the right at once
    await ctx.db.update(user).set({ role: "viewer" }).where(eq(user.id, owner.id));
    const denied = await call(projectsApi, "action", req("/api/projects", { method: "POST", key, body: JSON.stringify({ code: "BRK-2", name: "Brook crossing 2" }) }));
    expect(denied.status).toBe(403);
    expect((await denied.json()).error).toBe(
      "Opening a project is for the admin or engineer roles (this needs permission create:project; your role is viewer)",
    );
    expect((await call(projectsApi, "loader", req("/api/projects", { key }))).status).toBe(200);

    // someone else cannot revoke it; the owner can
    const other = await makeUser("someone.else@fernhill-design.example", "engineer");
    expect(await revokeApiKey({ id: info.id, actor: { id: other.id } })).toBe(false);
    expect(await revokeApiKey({ id: info.id, actor: { id: owner.id, email: owner.email } })).toBe(true);
    expect(await revokeApiKey({ id: info.id, actor: { id: owner.id } })).toBe(false); // once

    // refused after revocation, with a 401 that says why
    expect(await getUser(req("/api/projects", { key }))).toBeNull();
    const refused = await call(projectsApi, "loader", req("/api/projects", { key }));
    expect(refused.status).toBe(401);
    expect((await refused.json()).error).toMatch(/unknown or revoked/);

    // creation and revocation are audited
    const { listAudit } = await import("~/lib/auth/audit.server");
    const actions = (await listAudit({ action: "apikey." })).map((r) => r.action).sort();
    expect(actions).toEqual(["apikey.create", "apikey.revoke"]);
  });

  it("a forged or malformed key is refused", async () => {
    const { getUser } = await import("~/lib/auth/authorize.server");
    for (const k of ["swk_" + "A".repeat(43), "not-a-key", ""]) {
      expect(await getUser(req("/api/projects", { headers: { authorization: `Bearer ${k}` } }))).toBeNull();
    }
  });

  it("a suspended owner's keys stop working", async () => {
    const { createApiKey } = await import("~/lib/auth/api-keys.server");
    const { getUser } = await import("~/lib/auth/authorize.server");
    const { user } = await import("~/db/schema");
    const owner = await makeUser("paused@fernhill-design.example", "checker");
    const { key } = await createApiKey({ userId: owner.id, name: "ci" });
    expect(await getUser(req("/api/projects", { key }))).not.toBeNull();
    await ctx.db.update(user).set({ banned: true }).where(eq(user.id, owner.id));
    expect(await getUser(req("/api/projects", { key }))).toBeNull();
  });
});
