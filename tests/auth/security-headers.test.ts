// Security headers on responses that are not pages (issue 14, "Requests"): the JSON API, the
// PDF report, a CSV template, a model file download, and error answers (400, 401, 403, 404,
// 503), each made by the real route module and passed through the root route's middleware
// (app/root.tsx), which React Router runs on every response. That React Router really runs it
// on resource routes, and the page policy with its nonce, are checked over HTTP against the
// built app in tests/e2e/security-headers.e2e.test.ts.
//
// What each header is for (common practice, the OWASP secure headers advice):
//   X-Content-Type-Options: nosniff    a download is never sniffed into HTML or script
//   X-Frame-Options: DENY and CSP frame-ancestors 'none'   nobody frames the desk (clickjacking)
//   Referrer-Policy: same-origin       job and model ids in addresses stay on the desk
//   CSP default-src 'none' on resources   a JSON or CSV answer opened as a document runs nothing
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeJob, makeUser, req, sessionCookie, setup } from "./helpers";
import { warrenFixture } from "../report/warren-fixture";

let ctx: Awaited<ReturnType<typeof setup>>;
let cookie = "";
const fx = { jobId: "", modelId: "" };

beforeAll(async () => {
  ctx = await setup();
  const { putObject } = await import("~/lib/storage.server");
  const { jobs } = await import("~/db/schema");
  const { eq } = await import("drizzle-orm");
  const { storeModel } = await import("~/lib/models.server");
  const engineer = await makeUser("ada.brisk@kestrelgate.example", "engineer", "Ada Brisk");
  cookie = await sessionCookie(engineer.email);
  // a succeeded job with a stored result, so the report route renders a real PDF
  const warren = warrenFixture({ panels: 4 });
  const job = await makeJob({ submittedBy: engineer.id, code: "KG-7" });
  fx.jobId = job.jobId;
  await putObject(`models/${job.modelId}.json`, JSON.stringify(warren.model), "application/json");
  await putObject(`results/${job.jobId}.json`, JSON.stringify(warren.result), "application/json");
  await ctx.db.update(jobs).set({ resultKey: `results/${job.jobId}.json`, outcome: "optimal" }).where(eq(jobs.id, job.jobId));
  // a model stored the ordinary way (its versions in the bucket), for the file download
  const stored = await storeModel({ projectId: job.projectId, fileName: "kestrel-gate.truss.json", bytes: new TextEncoder().encode(JSON.stringify(warren.model)), user: { id: engineer.id } });
  if (!stored.ok) throw new Error(stored.error);
  fx.modelId = stored.model.id;
}, 120_000);
afterAll(async () => ctx?.services.stop());

/** Call a route module's loader or action as React Router would, through the root middleware. */
async function through(routeFile: string, request: Request, params: Record<string, string> = {}): Promise<Response> {
  const { middleware } = await import("~/root");
  const mod = (await import(/* @vite-ignore */ `~/routes/${routeFile}`)) as Record<string, (a: unknown) => Promise<unknown>>;
  const fn = request.method === "GET" ? mod.loader! : mod.action!;
  const next = async () => {
    try {
      return (await fn({ request, params, context: {} })) as Response;
    } catch (e) {
      if (e instanceof Response) return e;
      throw e;
    }
  };
  return (await middleware[0]!({ request, params, context: {} } as never, next as never)) as Response;
}

function expectResourceHeaders(res: Response, what: string) {
  expect(res.headers.get("x-content-type-options"), what).toBe("nosniff");
  expect(res.headers.get("x-frame-options"), what).toBe("DENY");
  expect(res.headers.get("referrer-policy"), what).toBe("same-origin");
  const csp = res.headers.get("content-security-policy") ?? "";
  expect(csp, what).toContain("default-src 'none'");
  expect(csp, what).toContain("frame-ancestors 'none'");
}

describe("security headers on API answers", () => {
  it("a JSON list, the PDF report, a CSV template and a model file download", async () => {
    const cases: [string, string, Request, Record<string, string>, string][] = [
      ["JSON", "api/jobs", req("/api/jobs", { cookie }), {}, "application/json"],
      ["PDF", "api/jobs.$jobId.report", req(`/api/jobs/${fx.jobId}/report`, { cookie }), { jobId: fx.jobId }, "application/pdf"],
      ["CSV", "api/models.templates.$file", req("/api/models/templates/members.csv", { cookie }), { file: "members.csv" }, "text/csv"],
      ["file", "api/models.$modelId.file", req(`/api/models/${fx.modelId}/file`, { cookie }), { modelId: fx.modelId }, "application/json"],
    ];
    for (const [what, file, request, params, type] of cases) {
      const res = await through(file, request, params);
      expect(res.status, what).toBe(200);
      expect(res.headers.get("content-type"), what).toContain(type);
      expectResourceHeaders(res, what);
    }
  });

  it("error answers: 400, 401, 403 (another origin), 404", async () => {
    const cases: [number, string, Request, Record<string, string>][] = [
      [400, "api/jobs", req("/api/jobs?limit=many", { cookie }), {}],
      [401, "api/projects", req("/api/projects"), {}],
      [403, "api/projects", req("/api/projects", { method: "POST", cookie, body: "{}", headers: { "content-type": "application/json", origin: "http://localhost:8081" } }), {}],
      [404, "api/jobs.$jobId", req("/api/jobs/no-such-job", { cookie }), { jobId: "no-such-job" }],
    ];
    for (const [status, file, request, params] of cases) {
      const res = await through(file, request, params);
      expect(res.status, `${file} ${status}`).toBe(status);
      expectResourceHeaders(res, `${status}`);
    }
  });

  it("a 503 when the bucket is gone, and a response whose headers are read-only", async () => {
    // a response passed on from fetch has immutable headers: it is copied, body intact
    const { middleware } = await import("~/root");
    const fetched = await fetch(`${ctx.services.mail.httpUrl}/messages`);
    expect(() => fetched.headers.set("x-probe", "1")).toThrow();
    const passed = (await middleware[0]!({} as never, (async () => fetched) as never)) as Response;
    expectResourceHeaders(passed, "fetched");
    expect(await passed.json()).toHaveProperty("messages");

    await ctx.services.s3.stop();
    const res = await through("api/models.$modelId.file", req(`/api/models/${fx.modelId}/file?version=1`, { cookie }), { modelId: fx.modelId });
    expect(res.status).toBe(503);
    expect(res.headers.get("retry-after")).toBe("5");
    expectResourceHeaders(res, "503");
  });
});

describe("the page policy", () => {
  it("allows our scripts by nonce only, frames nothing and is framed by nobody", async () => {
    const { contentSecurityPolicy, withSecurityHeaders } = await import("~/lib/security-headers");
    const csp = contentSecurityPolicy("n0nce", false);
    expect(csp).toContain("script-src 'self' 'nonce-n0nce'");
    expect(csp).not.toContain("unsafe-inline' 'unsafe-eval");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    // the middleware keeps a page's own policy (set with its nonce by entry.server.tsx)
    const page = withSecurityHeaders(new Response("<html></html>", { headers: { "content-security-policy": csp, "content-type": "text/html" } }));
    expect(page.headers.get("content-security-policy")).toBe(csp);
    expect(page.headers.get("x-frame-options")).toBe("DENY");
  });
});
