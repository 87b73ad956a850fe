// The role x route matrix: EVERY route of app/routes.ts, each HTTP method its entry in
// app/lib/auth/route-access.ts names, called in-process (the route module's loader or action)
// by an anonymous caller and by each role, with a real session cookie and, on /api/*, with a
// real API key. Allowed means the call got past the access check (any answer but 401, 403 or
// a redirect to sign-in: a 400 or 404 for the made-up ids and empty bodies used here is
// fine); denied means 401 / 403 / the redirect to /sign-in?redirectTo=… of requireUser. A route without an entry fails.
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Role } from "~/lib/auth/permissions";
import type { Access, Method } from "~/lib/auth/route-access";
import { makeUser, req, sessionCookie, setup } from "./helpers";

type RouteNode = { file: string; path?: string; index?: boolean; children?: RouteNode[] };
type Flat = { key: string; pattern: string; file: string; layout: boolean };

function flatten(nodes: RouteNode[], parent = ""): Flat[] {
  const out: Flat[] = [];
  for (const n of nodes) {
    const joined = n.path ? `${parent.replace(/\/$/, "")}/${n.path}` : parent || "/";
    const pattern = joined.replace(/\/+/g, "/");
    const layout = !n.path && !n.index;
    out.push({ key: layout ? `layout:${n.file}` : pattern, pattern, file: n.file, layout });
    if (n.children) out.push(...flatten(n.children, n.path ? pattern : parent));
  }
  return out;
}

/** A URL for a pattern: made-up ids for parameters, "x" for a splat. */
function urlFor(pattern: string): string {
  return pattern.replace(/:[^/]+/g, "matrix-made-up-id").replace(/\*$/, "x") || "/";
}

function paramsFor(pattern: string): Record<string, string> {
  const p: Record<string, string> = {};
  for (const m of pattern.matchAll(/:([^/?]+)/g)) p[m[1]!] = "matrix-made-up-id";
  if (pattern.endsWith("*")) p["*"] = "x";
  return p;
}

type Outcome = { kind: "allowed" | "denied"; status: number; note: string };

function classify(value: unknown, threw: boolean): Outcome {
  if (value instanceof Response) {
    const loc = value.headers.get("location") ?? "";
    if (value.status === 401 || value.status === 403) return { kind: "denied", status: value.status, note: "" };
    if (value.status >= 300 && value.status < 400 && loc.startsWith("/sign-in?redirectTo=")) return { kind: "denied", status: value.status, note: loc };
    return { kind: "allowed", status: value.status, note: loc };
  }
  // data() results carry their init; plain objects are a 200
  const init = (value as { init?: { status?: number } } | null)?.init;
  if (!threw && value && typeof value === "object" && "type" in value && (value as { type: string }).type === "DataWithResponseInit") {
    const s = init?.status ?? 200;
    return { kind: s === 401 || s === 403 ? "denied" : "allowed", status: s, note: "" };
  }
  return { kind: "allowed", status: 200, note: threw ? "threw" : "" };
}

let ctx: Awaited<ReturnType<typeof setup>>;
const ROLES: Role[] = ["admin", "engineer", "checker", "viewer"];
const email = (r: Role) => `matrix.${r}@tallowbrook-matrix.example`;
const cookies = {} as Record<Role, string>;
const keys = {} as Record<Role, string>;
let flat: Flat[] = [];

beforeAll(async () => {
  ctx = await setup();
  const { createApiKey } = await import("~/lib/auth/api-keys.server");
  for (const r of ROLES) {
    const u = await makeUser(email(r), r);
    cookies[r] = await sessionCookie(u.email);
    keys[r] = (await createApiKey({ userId: u.id, email: u.email, name: "matrix" })).key;
  }
  flat = flatten((await import("~/routes")).default as RouteNode[]);
});
afterAll(async () => ctx?.services.stop());

async function stillSignedIn(r: Role): Promise<void> {
  const { getUser } = await import("~/lib/auth/authorize.server");
  if (!(await getUser(req("/", { cookie: cookies[r] })))) cookies[r] = await sessionCookie(email(r)); // after /sign-out
}

async function callRoute(
  mod: Record<string, unknown>,
  method: Method,
  pattern: string,
  who: { cookie?: string; key?: string },
  fields: Record<string, string> = {},
): Promise<Outcome> {
  const fn = (method === "GET" ? mod.loader : mod.action) as ((a: unknown) => Promise<unknown>) | undefined;
  if (!fn) return { kind: "allowed", status: 200, note: "no server function" };
  const isJsonApi = pattern.startsWith("/api/");
  const init: RequestInit = { method };
  if (method !== "GET") {
    init.body = isJsonApi ? JSON.stringify(fields) : new URLSearchParams(fields);
    init.headers = { "content-type": isJsonApi ? "application/json" : "application/x-www-form-urlencoded", origin: "http://localhost:4310" };
  }
  const request = req(urlFor(pattern), { ...init, cookie: who.cookie, key: who.key });
  try {
    return classify(await fn({ request, params: paramsFor(pattern), context: {} }), false);
  } catch (e) {
    if (e instanceof Response) return classify(e, true);
    return { kind: "allowed", status: 500, note: `threw ${(e as Error)?.message ?? e}` };
  }
}

describe("role x route matrix", () => {
  it("every route of app/routes.ts has an entry in route-access.ts", async () => {
    const { accessFor } = await import("~/lib/auth/route-access");
    const missing = flat.filter((f) => !accessFor(f.key)).map((f) => `${f.key} (${f.file})`);
    expect(missing, `add these to app/lib/auth/route-access.ts: ${missing.join(", ")}`).toEqual([]);
  });

  it("every server function has its method in the entry, and a page without a loader is public", async () => {
    const { accessFor } = await import("~/lib/auth/route-access");
    const problems: string[] = [];
    for (const f of flat) {
      const access = accessFor(f.key);
      if (!access) continue;
      const mod = await import(/* @vite-ignore */ path.resolve("app", f.file));
      if (mod.loader && !access.GET) problems.push(`${f.key}: has a loader but no GET entry`);
      if (mod.action && !Object.keys(access).some((m) => m !== "GET")) problems.push(`${f.key}: has an action but no POST/PUT/PATCH/DELETE entry`);
      if (!mod.loader && access.GET && access.GET !== "public" && mod.default) problems.push(`${f.key}: GET is restricted but the page has no loader to enforce it`);
      for (const m of Object.keys(access)) if (m !== "GET" && !mod.action) problems.push(`${f.key}: ${m} is listed but there is no action`);
    }
    expect(problems).toEqual([]);
  });

  it("each caller is allowed or denied exactly as the table says", async () => {
    const { accessFor, allows } = await import("~/lib/auth/route-access");
    const mismatches: string[] = [];
    const errored: string[] = [];
    let calls = 0;
    for (const f of flat) {
      const access = accessFor(f.key);
      if (!access) continue;
      const mod = await import(/* @vite-ignore */ path.resolve("app", f.file));
      for (const [method, rule] of Object.entries(access) as [Method, Access][]) {
        const callers: { label: string; role: Role | null; cookie?: string; key?: string }[] = [{ label: "anonymous", role: null }];
        for (const r of ROLES) {
          callers.push({ label: `${r} (cookie)`, role: r, cookie: cookies[r] });
          if (f.pattern.startsWith("/api/") && !f.pattern.startsWith("/api/auth")) callers.push({ label: `${r} (API key)`, role: r, key: keys[r] });
        }
        for (const c of callers) {
          const got = await callRoute(mod, method, f.pattern, c);
          calls++;
          const want = allows(rule, c.role) ? "allowed" : "denied";
          // a made-up id is outside every project: 404 before the role is asked (access.server.ts)
          if (want === "denied" && got.status === 404 && c.role) got.kind = "denied";
          if (got.kind !== want) mismatches.push(`${method} ${f.key} as ${c.label}: expected ${want}, got ${got.status} ${got.note}`);
          else if (got.status === 500) errored.push(`${method} ${f.key} as ${c.label}: ${got.note}`);
          if (c.role && c.cookie && method !== "GET") await stillSignedIn(c.role);
        }
      }
    }
    // crashes after the access check are the route's own business, but worth seeing
    if (errored.length) console.warn(`[route-matrix] allowed calls that threw (made-up ids or empty bodies):\n  ${errored.join("\n  ")}`);
    expect(mismatches).toEqual([]);
    expect(calls).toBeGreaterThan(100);
  });

  it("actions that branch on their body deny per case, as BODY_CASES says", async () => {
    const { BODY_CASES, accessFor, allows, normalizePattern } = await import("~/lib/auth/route-access");
    const mismatches: string[] = [];
    let ran = 0;
    for (const c of BODY_CASES) {
      const f = flat.find((x) => normalizePattern(x.key) === normalizePattern(c.route));
      if (!f) continue; // the route is not in app/routes.ts (yet)
      expect(accessFor(f.key)?.[c.method], `${c.route} lists ${c.method}`).toBeDefined();
      const mod = await import(/* @vite-ignore */ path.resolve("app", f.file));
      const callers: { label: string; role: Role | null; cookie?: string }[] = [{ label: "anonymous", role: null }, ...ROLES.map((r) => ({ label: r, role: r, cookie: cookies[r] }))];
      for (const who of callers) {
        const got = await callRoute(mod, c.method, f.pattern, who, c.body);
        ran++;
        const want = allows(c.access, who.role) ? "allowed" : "denied";
        if (want === "denied" && got.status === 404 && who.role) got.kind = "denied";
        if (got.kind !== want) mismatches.push(`${c.method} ${c.route} ${JSON.stringify(c.body)} as ${who.label}: expected ${want}, got ${got.status} ${got.note}`);
        if (who.role) await stillSignedIn(who.role);
      }
    }
    expect(mismatches).toEqual([]);
    expect(ran).toBeGreaterThan(0);
  });
});
