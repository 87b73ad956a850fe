// The page and API flows around accounts, in-process against real services: cookie settings,
// the sign-in page, password reset by e-mail (read back from the mail catcher), projects
// (page form and API), admin invitations and role changes, and the audit trail they leave.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { followVerificationLink, mailTo, makeUser, PASSWORD, req, sessionCookie, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
const cookies: Record<string, string> = {};
const ids: Record<string, string> = {};

beforeAll(async () => {
  ctx = await setup();
  for (const r of ["admin", "engineer", "viewer"]) {
    const u = await makeUser(`${r}.pages@tarrowkeel-test.example`, r);
    ids[r] = u.id;
    cookies[r] = await sessionCookie(u.email);
  }
});
afterAll(async () => ctx?.services.stop());

async function run<T = unknown>(fn: () => Promise<T>): Promise<T | Response> {
  try {
    return await fn();
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

function form(fields: Record<string, string>, extra: { cookie?: string; path?: string } = {}) {
  const body = new URLSearchParams(fields);
  return req(extra.path ?? "/", { method: "POST", body, cookie: extra.cookie, headers: { "content-type": "application/x-www-form-urlencoded" } });
}

describe("sign-in page", () => {
  it("sets an httpOnly, SameSite=Lax session cookie and redirects to the asked page only on this site", async () => {
    const { action } = await import("~/routes/sign-in");
    const ok = (await run(() => action({ request: form({ email: "Engineer.Pages@tarrowkeel-test.example", password: PASSWORD, redirectTo: "/projects?q=hall" }), params: {}, context: {} } as never))) as Response;
    expect(ok.status).toBe(302);
    expect(ok.headers.get("location")).toBe("/projects?q=hall");
    const cookie = ok.headers.get("set-cookie") ?? "";
    expect(cookie).toMatch(/strutwise\.session_token=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // APP_URL is http in tests, so no Secure flag (it would be dropped by the browser)
    expect(cookie).not.toMatch(/;\s*Secure/i);

    const offsite = (await run(() => action({ request: form({ email: "engineer.pages@tarrowkeel-test.example", password: PASSWORD, redirectTo: "//evil.example/x" }), params: {}, context: {} } as never))) as Response;
    expect(offsite.headers.get("location")).toBe("/projects");
  });

  it("a wrong password answers with a worded error and no cookie", async () => {
    const { action } = await import("~/routes/sign-in");
    const res = (await action({ request: form({ email: "engineer.pages@tarrowkeel-test.example", password: "wrong-password-here" }), params: {}, context: {} } as never)) as unknown as {
      init: { status: number; headers?: unknown };
      data: { errors: Record<string, string> };
    };
    expect(res.init.status).toBe(400);
    expect(res.data.errors.form).toBe("That e-mail and password do not match an account.");
    const { listAudit } = await import("~/lib/auth/audit.server");
    const [refused] = await listAudit({ action: "auth.sign-in-refused" });
    expect(refused).toMatchObject({ actorId: ids.engineer, detail: { email: "engineer.pages@tarrowkeel-test.example" } });
  });

  it("every sign-in is in the audit trail", async () => {
    const { listAudit } = await import("~/lib/auth/audit.server");
    const rows = await listAudit({ action: "auth.sign-in", actor: "engineer.pages@" });
    expect(rows.length).toBeGreaterThanOrEqual(2);
    expect(rows[0]!.actorId).toBe(ids.engineer);
  });

  it("a page refuses a role without permission with a 403 naming it", async () => {
    const { loader } = await import("~/routes/admin.users");
    const res = (await run(() => loader({ request: req("/admin/users", { cookie: cookies.viewer }), params: {}, context: {} } as never))) as Response;
    expect(res.status).toBe(403);
    expect((await res.json()).error).toMatch(/needs permission manage:users; your role is viewer/);
    const anon = (await run(() => loader({ request: req("/admin/users"), params: {}, context: {} } as never))) as Response;
    expect(anon.status).toBe(302);
    expect(anon.headers.get("location")).toBe("/sign-in?redirectTo=%2Fadmin%2Fusers");
  });
});

describe("password reset by e-mail", () => {
  it("mails a link; the link's token sets a new password and ends the old sessions", async () => {
    const { action: ask } = await import("~/routes/forgot-password");
    const { action: reset } = await import("~/routes/reset-password");
    const { getUser } = await import("~/lib/auth/authorize.server");
    const u = await makeUser("forgetful@tarrowkeel-test.example", "viewer");
    const before = await sessionCookie(u.email);
    ctx.services.mail.clear();
    const res = (await ask({ request: form({ email: u.email }), params: {}, context: {} } as never)) as { sent: boolean };
    expect(res.sent).toBe(true);
    // the link waits in the outbox; the queue worker's sender delivers it
    const { MailSender } = await import("~/lib/mail/sender.server");
    const { db } = await import("~/db/client.server");
    await new MailSender({ db: db(), senderId: "pages-test", log: () => undefined }).deliverDue();
    let mail;
    for (let i = 0; i < 50 && !mail; i++) {
      mail = ctx.services.mail.messages().find((m) => m.to.includes(u.email));
      if (!mail) await new Promise((r) => setTimeout(r, 100));
    }
    expect(mail?.subject).toMatch(/new password/);
    const link = /(http\S+\/api\/auth\/reset-password\/(\S+?)\?\S*)/.exec(mail!.text);
    expect(link).not.toBeNull();
    // the link goes through better-auth, which sends the browser to our page with the token
    const { loader: authLoader } = await import("~/routes/api/auth.$");
    const hop = (await authLoader({ request: new Request(link![1]!), params: {}, context: {} } as never)) as Response;
    const to = new URL(hop.headers.get("location")!, "http://localhost");
    expect(to.pathname).toBe("/reset-password");
    const token = to.searchParams.get("token")!;
    expect(token).toBe(link![2]);

    const mismatch = (await reset({ request: form({ token, password: "brand-new-secret-1", confirm: "something-else" }), params: {}, context: {} } as never)) as unknown as { data: { errors: Record<string, string> } };
    expect(mismatch.data.errors.confirm).toBe("The two passwords differ");
    const done = (await reset({ request: form({ token, password: "brand-new-secret-1", confirm: "brand-new-secret-1" }), params: {}, context: {} } as never)) as { done: boolean };
    expect(done.done).toBe(true);
    expect(await getUser(req("/", { cookie: before }))).toBeNull();
    await expect(sessionCookie(u.email)).rejects.toThrow();
    expect(await getUser(req("/", { cookie: await sessionCookie(u.email, "brand-new-secret-1") }))).not.toBeNull();
    // a used token is refused
    const again = (await reset({ request: form({ token, password: "another-secret-22", confirm: "another-secret-22" }), params: {}, context: {} } as never)) as unknown as { data: { errors: Record<string, string> } };
    expect(again.data.errors.form).toMatch(/used up or has expired/);
  });
});

describe("projects", () => {
  const post = async (who: string, body: unknown) => {
    const { action } = await import("~/routes/api/projects");
    return (await run(() => action({ request: req("/api/projects", { method: "POST", cookie: cookies[who], body: JSON.stringify(body) }), params: {}, context: {} } as never))) as Response;
  };

  it("POST /api/projects: 201 for an engineer, 403 for a viewer, 400 with field details, 409 for a taken code", async () => {
    const created = await post("engineer", { code: "tk-3001", name: "Ellerby Quay cold store", client: "Harbour Trust" });
    expect(created.status).toBe(201);
    expect(await created.json()).toMatchObject({ code: "TK-3001", name: "Ellerby Quay cold store", client: "Harbour Trust" });
    expect((await post("viewer", { code: "TK-3002", name: "x" })).status).toBe(403);
    const bad = await post("engineer", { code: "", name: "" });
    expect(bad.status).toBe(400);
    expect(new Set((await bad.json()).details.map((d: { path: string }) => d.path))).toEqual(new Set(["code", "name"]));
    const dup = await post("admin", { code: "TK-3001", name: "Another" });
    expect(dup.status).toBe(409);
    expect((await dup.json()).error).toContain("TK-3001");
  });

  it("GET /api/projects lists { id, code, name } of the caller's projects; the page filters by text", async () => {
    const { loader } = await import("~/routes/api/projects");
    const none = (await loader({ request: req("/api/projects", { cookie: cookies.viewer }), params: {}, context: {} } as never)) as Response;
    expect((await none.json()).projects).toEqual([]); // not a member yet
    const mine = (await loader({ request: req("/api/projects", { cookie: cookies.engineer }), params: {}, context: {} } as never)) as Response;
    const [p] = (await mine.json()).projects;
    const members = await import("~/routes/api/projects.$projectId.members");
    const added = (await members.action({ request: req(`/api/projects/${p.id}/members`, { method: "POST", cookie: cookies.engineer, body: JSON.stringify({ email: "viewer.pages@tarrowkeel-test.example" }) }), params: { projectId: p.id }, context: {} } as never)) as Response;
    expect(added.status).toBe(201);
    const res = (await loader({ request: req("/api/projects", { cookie: cookies.viewer }), params: {}, context: {} } as never)) as Response;
    const body = await res.json();
    expect(body.projects).toEqual([expect.objectContaining({ id: expect.any(String), code: "TK-3001", name: "Ellerby Quay cold store" })]);
    const page = await import("~/routes/projects._index");
    const hit = (await page.loader({ request: req("/projects?q=cold", { cookie: cookies.viewer }), params: {}, context: {} } as never)) as { projects: unknown[]; canCreate: boolean };
    const miss = (await page.loader({ request: req("/projects?q=bridge", { cookie: cookies.viewer }), params: {}, context: {} } as never)) as { projects: unknown[] };
    expect(hit.projects).toHaveLength(1);
    expect(hit.canCreate).toBe(false);
    expect(miss.projects).toHaveLength(0);
  });

  it("the page's create form answers field errors from the shared schema", async () => {
    const page = await import("~/routes/projects._index");
    const res = (await page.action({ request: form({ code: "x", name: "" }, { cookie: cookies.engineer, path: "/projects" }), params: {}, context: {} } as never)) as unknown as { init: { status: number }; data: { errors: Record<string, string> } };
    expect(res.init.status).toBe(400);
    expect(res.data.errors).toEqual({ code: "A code has 2 to 24 characters", name: "Give the project a name" });
  });
});

describe("admin: invitations and role changes", () => {
  const act = async (fields: Record<string, string>, who = "admin") => {
    const { action } = await import("~/routes/admin.users");
    return run(() => action({ request: form(fields, { cookie: cookies[who], path: "/admin/users" }), params: {}, context: {} } as never)) as Promise<unknown>;
  };

  it("an invited address gets its role once confirmed by the mailed link; a role change takes effect on the next request and is audited", async () => {
    const { user } = await import("~/db/schema");
    const { getUser } = await import("~/lib/auth/authorize.server");
    const { listAudit } = await import("~/lib/auth/audit.server");
    await act({ intent: "invite", email: "new.engineer@tarrowkeel-test.example", role: "engineer" });
    const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
    const { INVITATION_HEADER, invitationToken, openInvitation } = await import("~/lib/auth/sign-up-policy.server");
    const inv = (await openInvitation("new.engineer@tarrowkeel-test.example"))!;
    const signUp = await callAuthEndpoint(new Request("http://localhost/"), "/sign-up/email", { email: "new.engineer@tarrowkeel-test.example", password: PASSWORD, name: "New Engineer" }, { [INVITATION_HEADER]: invitationToken(inv) });
    expect(signUp.status).toBe(200);
    // not yet: an unconfirmed account is a viewer that can do nothing
    expect((await ctx.db.query.user.findFirst({ where: eq(user.email, "new.engineer@tarrowkeel-test.example") }))?.role).toBe("viewer");
    const mail = await mailTo(ctx.services, "new.engineer@tarrowkeel-test.example", /confirm your e-mail/);
    const hop = await followVerificationLink(mail.text);
    expect(hop.status).toBe(302);
    const u = (await ctx.db.query.user.findFirst({ where: eq(user.email, "new.engineer@tarrowkeel-test.example") }))!;
    expect(u.role).toBe("engineer");
    expect(u.emailVerified).toBe(true);
    const cookie = await sessionCookie(u.email);
    await act({ intent: "role", userId: u.id, role: "checker" });
    expect((await getUser(req("/", { cookie })))?.role).toBe("checker");
    const row = await ctx.db.query.user.findFirst({ where: eq(user.id, u.id) });
    expect(row?.role).toBe("checker");
    const changes = await listAudit({ action: "user.role-change" });
    expect(changes[0]).toMatchObject({ actorId: ids.admin, entityId: u.id, detail: { from: "engineer", to: "checker" } });
    expect((await listAudit({ action: "user.invite" }))[0]).toMatchObject({ entityId: "new.engineer@tarrowkeel-test.example" });
  });

  it("an admin cannot change their own role, and an engineer cannot change anyone's", async () => {
    const own = (await act({ intent: "role", userId: ids.admin!, role: "viewer" })) as { data: { ok: boolean; message: string } };
    expect(own.data.ok).toBe(false);
    const res = (await act({ intent: "role", userId: ids.viewer!, role: "admin" }, "engineer")) as Response;
    expect(res.status).toBe(403);
  });

  it("suspending an account ends its sessions at once", async () => {
    const { getUser } = await import("~/lib/auth/authorize.server");
    const u = await makeUser("leaving@tarrowkeel-test.example", "engineer");
    const cookie = await sessionCookie(u.email);
    await act({ intent: "suspend", userId: u.id });
    expect(await getUser(req("/", { cookie }))).toBeNull();
    await expect(sessionCookie(u.email)).rejects.toThrow(/403/);
  });

  it("the audit page lists and filters entries; only admins see it; entries cannot be altered", async () => {
    const { loader } = await import("~/routes/admin.audit");
    const { auditLog } = await import("~/db/schema");
    const all = (await loader({ request: req("/admin/audit", { cookie: cookies.admin }), params: {}, context: {} } as never)) as { rows: { action: string; actorEmail: string | null }[] };
    expect(all.rows.length).toBeGreaterThan(5);
    const roleChanges = (await loader({ request: req("/admin/audit?action=user.role", { cookie: cookies.admin }), params: {}, context: {} } as never)) as { rows: { action: string }[] };
    expect(roleChanges.rows.length).toBeGreaterThan(0);
    expect(roleChanges.rows.every((r) => r.action === "user.role-change")).toBe(true);
    const byActor = (await loader({ request: req("/admin/audit?actor=viewer.pages", { cookie: cookies.admin }), params: {}, context: {} } as never)) as { rows: { actorEmail: string | null }[] };
    expect(byActor.rows.length).toBeGreaterThan(0);
    expect(byActor.rows.every((r) => r.actorEmail?.includes("viewer.pages"))).toBe(true);
    const future = (await loader({ request: req("/admin/audit?from=2999-01-01", { cookie: cookies.admin }), params: {}, context: {} } as never)) as { rows: unknown[] };
    expect(future.rows).toEqual([]);
    const denied = (await run(() => loader({ request: req("/admin/audit", { cookie: cookies.engineer }), params: {}, context: {} } as never))) as Response;
    expect(denied.status).toBe(403);
    await expect(ctx.db.update(auditLog).set({ action: "nothing" })).rejects.toThrow();
    await expect(ctx.db.delete(auditLog)).rejects.toThrow();
  });
});

describe("admin: API keys of others", () => {
  it("an admin sees every live key (never its hash) and can revoke one; the owner's key is refused after", async () => {
    const { createApiKey } = await import("~/lib/auth/api-keys.server");
    const { getUser } = await import("~/lib/auth/authorize.server");
    const { loader, action } = await import("~/routes/admin.users");
    const { key, info } = await createApiKey({ userId: ids.engineer!, name: "left on a laptop" });
    const page = (await loader({ request: req("/admin/users", { cookie: cookies.admin }), params: {}, context: {} } as never)) as { keys: Record<string, unknown>[] };
    const listed = page.keys.find((k) => k.id === info.id);
    expect(listed).toMatchObject({ name: "left on a laptop", ownerEmail: "engineer.pages@tarrowkeel-test.example" });
    expect(JSON.stringify(page.keys)).not.toMatch(/hash|swk_[A-Za-z0-9_-]{20}/);
    await action({ request: form({ intent: "revoke-key", keyId: info.id }, { cookie: cookies.admin, path: "/admin/users" }), params: {}, context: {} } as never);
    expect(await getUser(req("/api/projects", { key }))).toBeNull();
  });
});

describe("sign-in form origin", () => {
  it("a form posted from another site is refused; one from this host by any name is accepted", async () => {
    const { action } = await import("~/routes/sign-in");
    const body = () => new URLSearchParams({ email: "engineer.pages@tarrowkeel-test.example", password: PASSWORD });
    const foreign = (await run(() =>
      action({ request: new Request("http://127.0.0.1:4310/sign-in", { method: "POST", body: body(), headers: { origin: "https://elsewhere.example" } }), params: {}, context: {} } as never),
    )) as unknown as { init: { status: number }; data: { errors: Record<string, string> } };
    expect(foreign.init.status).toBe(400);
    expect(foreign.data.errors.form).toMatch(/sent from another site/);
    const local = (await run(() =>
      action({ request: new Request("http://127.0.0.1:4310/sign-in", { method: "POST", body: body(), headers: { origin: "http://127.0.0.1:4310" } }), params: {}, context: {} } as never),
    )) as Response;
    expect(local.status).toBe(302);
  });
});
