// Role x membership x route matrix (issue 14), written from product.md's role table, NOT from
// the app's own access table: every route of app/routes.ts, each of its server functions,
// called in-process as an anonymous caller and as each role, as a member of the project and
// as a non-member, by session cookie and by API key. A route of routes.ts without a rule
// here fails the first test, so routes added later must be placed in this table. Actions that
// do different things by their body (a form's "intent") are called once per body as well.
// The app's own table (app/lib/auth/route-access.ts, which every route needs an entry in) is
// checked against this one and against the route modules, so the two cannot drift apart.
//
// product.md "Who uses it":
//   admin    manage users and roles, see everything, manage API keys
//   engineer create projects, upload models, queue / cancel / re-run jobs, download
//   checker  everything a viewer can, plus review finished jobs (never their own)
//   viewer   read projects, models, jobs, results, reports
// plus issue 14: outside one's projects every project route answers 404 (admins see all);
// members are added and removed by the project's creator or an admin; API keys work on
// /api/* only (on pages a key is no credential: the page sends the caller to sign in).
//
// Expected codes, listed per caller:
//   anonymous, or an API key on a page:  page -> 302 to /sign-in?redirectTo=…, API -> 401
//   non-member on a project route:       404 (admins are members of every project)
//   member whose role may not:           403
//   allowed:                             past the gate — any answer but 401, 403, 404 or the
//                                        sign-in redirect (the calls carry empty bodies, so an
//                                        allowed POST answers 400/409; routes outside projects
//                                        may answer 404 for their made-up ids)
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeUser, req, sessionCookie, setup } from "./helpers";

type Role = "admin" | "engineer" | "checker" | "viewer";
type Method = "GET" | "POST" | "DELETE";
// who may, in product.md's words
type Who = "anyone" | "signed-in" | "read" | "produce" | "review" | "admin" | "managers" | "submitter-or-admin";
interface Rule {
  project?: boolean; // the URL names something inside a project: the 404 rule applies
  GET?: Who;
  POST?: Who;
  DELETE?: Who;
}

const RULES: Record<string, Rule> = {
  "layout:routes/shell.tsx": { GET: "anyone" },
  "/": { GET: "anyone" },
  "/sign-in": { GET: "anyone", POST: "anyone" },
  "/sign-up": { GET: "anyone", POST: "anyone" },
  "/sign-out": { GET: "signed-in", POST: "signed-in" },
  "/forgot-password": { GET: "anyone", POST: "anyone" },
  "/reset-password": { GET: "anyone", POST: "anyone" },
  "/account": { GET: "signed-in", POST: "signed-in" },
  "/projects": { GET: "read", POST: "produce" },
  "/admin/users": { GET: "admin", POST: "admin" },
  "/admin/audit": { GET: "admin" },
  "/admin/mail": { GET: "admin" },
  "/projects/:p": { project: true, GET: "read", POST: "produce" },
  "/projects/:p/new-model": { project: true, GET: "produce", POST: "produce" },
  "/models/:p": { project: true, GET: "read", POST: "produce" },
  "/models/:p/edit": { project: true, GET: "produce", POST: "produce" },
  "/models/:p/versions/:p": { project: true, GET: "read", POST: "produce" },
  "/jobs": { GET: "read" },
  "/jobs/:p": { project: true, GET: "read", POST: "read" }, // the action's intents check review/cancel rights themselves
  "/compare": { GET: "read" }, // the runs are named in ?jobs=; their 404 rule has its own test below
  "/catalogues": { GET: "read", POST: "produce" },
  "/catalogues/:p": { GET: "read", POST: "produce" },
  "/dev/inbox": { GET: "admin" }, // any signed-in role only when NODE_ENV=development
  "/api/health": { GET: "anyone" },
  "/api/auth/*": { GET: "anyone", POST: "anyone" },
  "/api/schema/model.json": { GET: "anyone" },
  "/api/projects": { GET: "read", POST: "produce" },
  "/api/projects/:p/members": { project: true, GET: "read", POST: "managers" },
  "/api/projects/:p/members/:p": { project: true, DELETE: "managers" },
  "/api/models": { GET: "read", POST: "produce" },
  "/api/models/import": { POST: "produce" },
  "/api/models/templates/:p": { GET: "signed-in" },
  "/api/models/:p": { project: true, GET: "read" },
  "/api/models/:p/file": { project: true, GET: "read" },
  "/api/models/:p/versions": { project: true, GET: "read", POST: "produce" },
  "/api/generators": { GET: "read" },
  "/api/generators/:p": { POST: "read" },
  "/api/jobs": { GET: "read", POST: "produce" },
  "/api/jobs/:p": { project: true, GET: "read" },
  "/api/jobs/:p/cancel": { project: true, POST: "submitter-or-admin" },
  "/api/jobs/:p/result": { project: true, GET: "read" },
  "/api/jobs/:p/progress": { project: true, GET: "read" },
  "/api/jobs/:p/reviews": { project: true, GET: "read", POST: "review" },
  "/api/jobs/:p/report": { project: true, GET: "read" },
  "/api/jobs/:p/clean-layout": { project: true, POST: "produce" },
  "/api/catalogues": { GET: "read", POST: "produce" },
  "/api/catalogues/:p": { GET: "read" },
  "/api/catalogues/:p/retire": { POST: "produce" },
};

/**
 * Actions that branch on their body, one call per body (page forms as multipart, /api/* as
 * JSON). The project fixture's job has failed: past the gate a review or cancel answers 400/409.
 */
const BODY_CASES: { route: string; method: Method; body: Record<string, string>; who: Who }[] = [
  { route: "/jobs/:p", method: "POST", body: { intent: "review", decision: "approved", comment: "checked" }, who: "review" },
  { route: "/jobs/:p", method: "POST", body: { intent: "cancel" }, who: "submitter-or-admin" },
  { route: "/api/jobs/:p/reviews", method: "POST", body: { decision: "approved", comment: "checked" }, who: "review" },
  { route: "/admin/users", method: "POST", body: { intent: "invite", email: "invited@hollowmere-matrix.example", role: "viewer" }, who: "admin" },
  { route: "/account", method: "POST", body: { intent: "create", name: "matrix key" }, who: "signed-in" },
  { route: "/projects", method: "POST", body: { code: "HM-MATRIX", name: "Hollowmere annex" }, who: "produce" },
];

const ROLES: Role[] = ["admin", "engineer", "checker", "viewer"];
function roleMay(who: Who, role: Role): boolean {
  switch (who) {
    case "anyone":
    case "signed-in":
    case "read":
      return true;
    case "produce":
      return role === "admin" || role === "engineer";
    case "review":
      return role === "admin" || role === "checker";
    case "admin":
    case "managers": // the creator (not among the callers) or an admin
    case "submitter-or-admin": // the submitter (not among the callers) or an admin
      return role === "admin";
  }
}

/**
 * What the role gate alone lets through, before a rule about the particular record: the
 * creator of a project may be of any role that creates projects, and is asked for after the
 * gate; so is the submitter of a job (an engineer or an admin).
 */
function gateMay(who: Who, role: Role): boolean {
  if (who === "managers") return true;
  if (who === "submitter-or-admin") return roleMay("produce", role);
  return roleMay(who, role);
}

type Expect = { code: number | "302 to sign-in" | "pass"; why: string };
interface Caller {
  label: string;
  role: Role | null;
  member: boolean;
  via: "session" | "key" | null;
}

/** The expected answer, from the rules above alone. */
function expected(rule: Rule, who: Who, c: Caller, api: boolean, hasParams: boolean): Expect {
  const signInCode = api ? 401 : "302 to sign-in";
  if (who === "anyone") return { code: "pass", why: "public" };
  if (!c.role || (c.via === "key" && !api)) return { code: signInCode, why: "not signed in (keys are no credential on pages)" };
  if (rule.project && !c.member && c.role !== "admin") return { code: 404, why: "outside the caller's projects" };
  if (!roleMay(who, c.role)) return { code: 403, why: `${who} is not for ${c.role}` };
  return { code: "pass", why: hasParams ? "allowed" : "allowed" };
}

type RouteNode = { file: string; path?: string; index?: boolean; children?: RouteNode[] };
type Flat = { key: string; pattern: string; file: string };
function flatten(nodes: RouteNode[], parent = ""): Flat[] {
  const out: Flat[] = [];
  for (const n of nodes) {
    const joined = (n.path ? `${parent.replace(/\/$/, "")}/${n.path}` : parent || "/").replace(/\/+/g, "/");
    const layout = !n.path && !n.index;
    out.push({ key: layout ? `layout:${n.file}` : joined, pattern: joined, file: n.file });
    if (n.children) out.push(...flatten(n.children, n.path ? joined : parent));
  }
  return out;
}
const norm = (k: string) => k.replace(/:[^/]+/g, ":p");

let ctx: Awaited<ReturnType<typeof setup>>;
let flat: Flat[] = [];
const fx = { projectId: "", modelId: "", jobId: "", ownerId: "" };
const creds: Record<string, { email: string; cookie: string; key: string }> = {};
const email = (role: Role, member: boolean) => `${member ? "in" : "out"}.${role}@hollowmere-matrix.example`;

beforeAll(async () => {
  ctx = await setup();
  const { createApiKey } = await import("~/lib/auth/api-keys.server");
  const { projects, projectMembers, jobs } = await import("~/db/schema");
  const { storeModel } = await import("~/lib/models.server");
  const { twoBarModel } = await import("../queue/support/models");
  const owner = await makeUser("owner.engineer@hollowmere-matrix.example", "engineer", "Owner Engineer");
  fx.ownerId = owner.id;
  fx.projectId = "matrix-project";
  await ctx.db.insert(projects).values({ id: fx.projectId, code: "HM-1", name: "Hollowmere pump-house roof", createdBy: owner.id });
  await ctx.db.insert(projectMembers).values({ projectId: fx.projectId, userId: owner.id });
  const stored = await storeModel({ projectId: fx.projectId, fileName: "pump-house.truss.json", bytes: new TextEncoder().encode(JSON.stringify(twoBarModel())), user: { id: owner.id } });
  if (!stored.ok) throw new Error(stored.error);
  fx.modelId = stored.model.id;
  fx.jobId = "matrix-job";
  // a failed run of the owner's: past the gates cancel and the result answer 409, a review 400
  await ctx.db.insert(jobs).values({ id: fx.jobId, projectId: fx.projectId, modelId: fx.modelId, submittedBy: owner.id, status: "failed", error: "matrix fixture", options: {}, modelVersion: 1 });
  for (const role of ROLES) {
    for (const member of [true, false]) {
      const u = await makeUser(email(role, member), role);
      if (member) await ctx.db.insert(projectMembers).values({ projectId: fx.projectId, userId: u.id });
      creds[`${role}:${member}`] = { email: u.email, cookie: await sessionCookie(u.email), key: (await createApiKey({ userId: u.id, name: "matrix" })).key };
    }
  }
  flat = flatten((await import("~/routes")).default as RouteNode[]);
}, 120_000);
afterAll(async () => ctx?.services.stop());

function urlFor(pattern: string): { url: string; params: Record<string, string> } {
  const params: Record<string, string> = {};
  const url = pattern.replace(/:([^/]+)/g, (_, name: string) => {
    const v =
      name === "projectId" ? fx.projectId
      : name === "modelId" ? fx.modelId
      : name === "jobId" ? fx.jobId
      : name === "userId" ? fx.ownerId // the creator: removing them answers 409 past the gate
      : name === "version" ? "1"
      : name === "kind" ? "made-up-kind"
      : "matrix-made-up-id";
    params[name] = v;
    return v;
  });
  if (pattern.endsWith("*")) params["*"] = "matrix-made-up";
  return { url: url.replace(/\*$/, "matrix-made-up"), params };
}

function outcome(value: unknown): number {
  if (value instanceof Response) return value.status;
  const init = (value as { init?: { status?: number } } | null)?.init;
  return init?.status ?? 200;
}

function classify(status: number, location: string | null): string {
  if (status === 302 && location?.startsWith("/sign-in?redirectTo=")) return "302 to sign-in";
  return String(status);
}

async function call(mod: Record<string, unknown>, method: Method, pattern: string, c: Caller, fields: Record<string, string> = {}): Promise<{ status: number; location: string | null }> {
  const fn = (method === "GET" ? mod.loader : mod.action) as ((a: unknown) => Promise<unknown>) | undefined;
  if (!fn) return { status: 200, location: null };
  const { url, params } = urlFor(pattern);
  const api = pattern.startsWith("/api/");
  const headers: Record<string, string> = {};
  let body: BodyInit | undefined;
  if (method !== "GET") {
    headers.origin = "http://localhost:4310"; // our own pages; the same-origin rule has its own test
    if (api) {
      headers["content-type"] = "application/json";
      body = JSON.stringify(fields);
    } else {
      // multipart, as the page forms send uploads: without fields, uploads and intents alike stop at validation
      const form = new FormData();
      for (const [k, v] of Object.entries(fields)) form.set(k, v);
      body = form;
    }
  }
  const cred = c.role ? creds[`${c.role}:${c.member}`]! : null;
  const request = req(url, { method, headers, body, cookie: c.via === "session" ? cred?.cookie : undefined, key: c.via === "key" ? cred?.key : undefined });
  try {
    const v = await fn({ request, params, context: {} });
    return { status: outcome(v), location: v instanceof Response ? v.headers.get("location") : null };
  } catch (e) {
    if (e instanceof Response) return { status: e.status, location: e.headers.get("location") };
    return { status: 500, location: String((e as Error)?.message ?? e) };
  }
}

const ruleOf = (key: string) => Object.entries(RULES).find(([k]) => norm(k) === norm(key))?.[1];

function allCallers(): Caller[] {
  const callers: Caller[] = [{ label: "anonymous", role: null, member: false, via: null }];
  for (const role of ROLES)
    for (const member of [true, false])
      for (const via of ["session", "key"] as const) callers.push({ label: `${role} ${member ? "member" : "non-member"} by ${via}`, role, member, via });
  return callers;
}

/** Whether an answer matches what the role table expects. */
function matches(want: Expect, who: Who, rule: Rule, got: { status: number; location: string | null }): boolean {
  const code = classify(got.status, got.location);
  const pass = !["401", "403", "302 to sign-in"].includes(code) && (code !== "404" || !rule.project) && got.status !== 500;
  return want.code === "pass" ? pass || (who === "anyone" && got.status !== 500) : code === String(want.code);
}

describe("role x membership x route matrix (product.md role table)", () => {
  it("every route of app/routes.ts has a rule here", () => {
    const missing = flat.filter((f) => !ruleOf(f.key)).map((f) => `${f.key} (${f.file})`);
    expect(missing, `add a rule for: ${missing.join(", ")}`).toEqual([]);
  });

  it("every route has an entry in app/lib/auth/route-access.ts that says what this table says", async () => {
    const { accessFor, allows } = await import("~/lib/auth/route-access");
    const problems: string[] = [];
    for (const f of flat) {
      const access = accessFor(f.key);
      const rule = ruleOf(f.key);
      if (!access) {
        problems.push(`${f.key} (${f.file}): no entry in route-access.ts`);
        continue;
      }
      if (!rule) continue; // reported by the test above
      const listed = Object.keys(access).sort().join(",");
      const here = (["GET", "POST", "DELETE"] as Method[]).filter((m) => rule[m]).sort().join(",");
      if (listed !== here) problems.push(`${f.key}: route-access.ts lists ${listed}, the role table ${here}`);
      for (const method of ["GET", "POST", "DELETE"] as Method[]) {
        const who = rule[method];
        const gate = access[method];
        if (!who || !gate) continue;
        if (allows(gate, null) !== (who === "anyone")) problems.push(`${method} ${f.key}: anonymous ${allows(gate, null) ? "allowed" : "refused"} by route-access.ts`);
        for (const role of ROLES)
          if (allows(gate, role) !== gateMay(who, role)) problems.push(`${method} ${f.key}: route-access.ts ${allows(gate, role) ? "lets" : "stops"} ${role}, the role table (${who}) does not`);
      }
    }
    expect(problems).toEqual([]);
  });

  it("every server function of a route module has its rule, and a guarded page has a loader", async () => {
    const problems: string[] = [];
    for (const f of flat) {
      const rule = ruleOf(f.key);
      if (!rule) continue;
      const mod = (await import(/* @vite-ignore */ path.resolve("app", f.file))) as Record<string, unknown>;
      if (mod.loader && !rule.GET) problems.push(`${f.key}: has a loader but no GET rule`);
      if (mod.action && !rule.POST && !rule.DELETE) problems.push(`${f.key}: has an action but no POST/DELETE rule`);
      if (!mod.loader && rule.GET && rule.GET !== "anyone" && mod.default) problems.push(`${f.key}: GET is restricted but the page has no loader to enforce it`);
      if ((rule.POST || rule.DELETE) && !mod.action) problems.push(`${f.key}: POST/DELETE has a rule but there is no action`);
    }
    expect(problems).toEqual([]);
  });

  it("each caller gets the code the role table gives", async () => {
    const callers = allCallers();
    const mismatches: string[] = [];
    let calls = 0;
    for (const f of flat) {
      const rule = ruleOf(f.key);
      if (!rule) continue;
      const mod = (await import(/* @vite-ignore */ path.resolve("app", f.file))) as Record<string, unknown>;
      const api = f.pattern.startsWith("/api/");
      for (const method of ["GET", "POST", "DELETE"] as Method[]) {
        const who = rule[method];
        if (!who) continue;
        for (const c of callers) {
          if (!api && c.via === "key" && c.role !== "admin") continue; // one key on each page is enough: keys never count there
          const want = expected(rule, who, c, api, f.pattern.includes(":"));
          const got = await call(mod, method, f.pattern, c);
          calls++;
          if (!matches(want, who, rule, got)) mismatches.push(`${method} ${f.key} as ${c.label}: expected ${want.code} (${want.why}), got ${got.status}${got.location ? ` ${got.location}` : ""}`);
          // a sign-out ends that session; sign the caller in again for the next routes
          if (f.key === "/sign-out" && c.via === "session" && c.role) creds[`${c.role}:${c.member}`]!.cookie = await sessionCookie(creds[`${c.role}:${c.member}`]!.email);
        }
      }
    }
    expect(mismatches).toEqual([]);
    expect(calls).toBeGreaterThan(500);
  }, 600_000);

  it("actions that branch on their body answer per body as the role table says", async () => {
    const mismatches: string[] = [];
    let calls = 0;
    for (const bc of BODY_CASES) {
      const f = flat.find((x) => norm(x.key) === norm(bc.route));
      expect(f, `${bc.route} is a route of app/routes.ts`).toBeDefined();
      const rule = ruleOf(bc.route)!;
      const mod = (await import(/* @vite-ignore */ path.resolve("app", f!.file))) as Record<string, unknown>;
      const api = f!.pattern.startsWith("/api/");
      for (const c of allCallers()) {
        if (!api && c.via === "key" && c.role !== "admin") continue;
        const want = expected(rule, bc.who, c, api, true);
        const got = await call(mod, bc.method, f!.pattern, c, bc.body);
        calls++;
        if (!matches(want, bc.who, rule, got)) mismatches.push(`${bc.method} ${bc.route} ${JSON.stringify(bc.body)} as ${c.label}: expected ${want.code} (${want.why}), got ${got.status}${got.location ? ` ${got.location}` : ""}`);
      }
    }
    expect(mismatches).toEqual([]);
    expect(calls).toBeGreaterThan(60);
  }, 300_000);

  it("compares only runs in the caller's projects: a run outside them answers 404, even beside one inside", async () => {
    const { loader } = await import("~/routes/compare");
    const status = async (cookie: string, jobsParam: string) => {
      try {
        return outcome(await loader({ request: req(`/compare?jobs=${jobsParam}`, { cookie }), params: {}, context: {} } as never));
      } catch (e) {
        if (e instanceof Response) return e.status;
        throw e;
      }
    };
    // one run of the matrix project named twice: members get the page (it explains that two runs are needed)
    expect(await status(creds["viewer:true"]!.cookie, `${fx.jobId},${fx.jobId}`)).toBe(400);
    expect(await status(creds["viewer:false"]!.cookie, `${fx.jobId},${fx.jobId}`)).toBe(404);
    expect(await status(creds["engineer:false"]!.cookie, `${fx.jobId},no-such-run`)).toBe(404);
    expect(await status(creds["checker:true"]!.cookie, `${fx.jobId},no-such-run`)).toBe(404);
    expect(await status(creds["admin:false"]!.cookie, fx.jobId)).toBe(400);
  });

  it("admins see every project; others only their own, in lists too", async () => {
    const { loader } = await import("~/routes/api/projects");
    const list = async (cookie: string) => ((await (await loader({ request: req("/api/projects", { cookie }), params: {}, context: {} } as never)).json()) as { projects: { id: string }[] }).projects.map((p) => p.id);
    expect(await list(creds["admin:false"]!.cookie)).toContain(fx.projectId);
    expect(await list(creds["viewer:true"]!.cookie)).toEqual([fx.projectId]);
    expect(await list(creds["engineer:false"]!.cookie)).toEqual([]);
    const jobs = await import("~/routes/api/jobs");
    const jobIds = async (cookie: string) => ((await (await jobs.loader({ request: req("/api/jobs", { cookie }), params: {}, context: {} } as never)).json()) as { jobs: { id: string }[] }).jobs.map((j) => j.id);
    expect(await jobIds(creds["checker:true"]!.cookie)).toContain(fx.jobId);
    expect(await jobIds(creds["checker:false"]!.cookie)).toEqual([]);
    const { projectMembers } = await import("~/db/schema");
    // the owner and the four member callers (the matrix added nobody: its POSTs carry no e-mail)
    expect((await ctx.db.select().from(projectMembers).where(eq(projectMembers.projectId, fx.projectId))).length).toBe(5);
  });
});
