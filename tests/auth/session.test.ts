// Sessions: a real sign-in gives a cookie that getUser accepts; a forged, tampered or expired
// cookie is refused; sign-ups start as viewer unless invited.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { followVerificationLink, mailTo, makeUser, PASSWORD, req, sessionCookie, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
beforeAll(async () => {
  ctx = await setup();
});
afterAll(async () => ctx?.services.stop());

describe("session cookie", () => {
  it("a real sign-in is accepted, with the account's role", async () => {
    const { getUser } = await import("~/lib/auth/authorize.server");
    await makeUser("ines.varga@kestrelspan.example", "engineer");
    const cookie = await sessionCookie("ines.varga@kestrelspan.example");
    const u = await getUser(req("/projects", { cookie }));
    expect(u).toMatchObject({ email: "ines.varga@kestrelspan.example", role: "engineer", via: "session" });
  });

  it("a wrong password gets no session", async () => {
    await expect(sessionCookie("ines.varga@kestrelspan.example", "not-the-password")).rejects.toThrow(/401/);
  });

  it("a forged cookie (made-up token, or a real token with a tampered signature) is refused", async () => {
    const { getUser } = await import("~/lib/auth/authorize.server");
    const cookie = await sessionCookie("ines.varga@kestrelspan.example");
    const [name, value] = cookie.split("; ")[0]!.split("=");
    const token = decodeURIComponent(value!).split(".")[0];
    expect(await getUser(req("/", { cookie: `${name}=made-up-token.c2lnbmF0dXJl` }))).toBeNull();
    expect(await getUser(req("/", { cookie: `${name}=${encodeURIComponent(`${token}.AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA=`)}` }))).toBeNull();
    // the bare token without any signature is not enough either
    expect(await getUser(req("/", { cookie: `${name}=${token}` }))).toBeNull();
  });

  it("an expired session is refused even with its genuinely signed cookie", async () => {
    const { getUser } = await import("~/lib/auth/authorize.server");
    const { session } = await import("~/db/schema");
    const cookie = await sessionCookie("ines.varga@kestrelspan.example");
    const token = decodeURIComponent(cookie.split("; ")[0]!.split("=")[1]!).split(".")[0]!;
    expect(await getUser(req("/", { cookie }))).not.toBeNull();
    await ctx.db.update(session).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(session.token, token));
    expect(await getUser(req("/", { cookie }))).toBeNull();
  });

  it("a session whose owner was given an unknown role grants nothing (deny by default)", async () => {
    const { getUser } = await import("~/lib/auth/authorize.server");
    const { user } = await import("~/db/schema");
    const u = await makeUser("odd.role@kestrelspan.example", "viewer");
    const cookie = await sessionCookie(u.email);
    await ctx.db.update(user).set({ role: "superuser" }).where(eq(user.id, u.id));
    expect(await getUser(req("/", { cookie }))).toBeNull();
  });
});

describe("sign-up roles", () => {
  it("a new account starts as viewer", async () => {
    const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
    const { user } = await import("~/db/schema");
    const res = await callAuthEndpoint(new Request("http://localhost/"), "/sign-up/email", {
      email: "walk.in@kestrelspan.example",
      password: PASSWORD,
      name: "Walk In",
    });
    expect(res.status).toBe(200);
    const row = await ctx.db.query.user.findFirst({ where: eq(user.email, "walk.in@kestrelspan.example") });
    expect(row?.role).toBe("viewer");
  });

  it("an invitation gives the invited role once the address is confirmed, and is marked accepted", async () => {
    const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
    const { user, invitations } = await import("~/db/schema");
    const { INVITATION_HEADER, invitationToken } = await import("~/lib/auth/sign-up-policy.server");
    const [invited] = await ctx.db.insert(invitations).values({ id: "inv-1", email: "new.checker@kestrelspan.example", role: "checker" }).returning();
    const res = await callAuthEndpoint(
      new Request("http://localhost/"),
      "/sign-up/email",
      { email: "New.Checker@kestrelspan.example", password: PASSWORD, name: "New Checker" },
      { [INVITATION_HEADER]: invitationToken(invited!) },
    );
    expect(res.status).toBe(200);
    expect((await ctx.db.query.user.findFirst({ where: eq(user.email, "new.checker@kestrelspan.example") }))?.role).toBe("viewer");
    const mail = await mailTo(ctx.services, "new.checker@kestrelspan.example", /confirm your e-mail/);
    await followVerificationLink(mail.text);
    const row = await ctx.db.query.user.findFirst({ where: eq(user.email, "new.checker@kestrelspan.example") });
    expect(row?.role).toBe("checker");
    const inv = await ctx.db.query.invitations.findFirst({ where: eq(invitations.id, "inv-1") });
    expect(inv?.acceptedAt).toBeInstanceOf(Date);
  });
});
