// Talking to a running app (tests/e2e/harness.ts) as its users do, over HTTP: sign in for a
// session cookie, then JSON and multipart requests from the app's own origin. Plus direct
// reads of the app's database, for what no page shows (the outbox rows' states).
import { createClient } from "@libsql/client";
import type { RunningApp } from "../../e2e/harness";

export interface Session {
  email: string;
  get(path: string): Promise<Response>;
  json<T>(path: string): Promise<T>;
  post(path: string, body: unknown): Promise<Response>;
}

export async function signIn(app: RunningApp, role: string): Promise<Session> {
  const account = app.accounts.find((a) => a.role === role);
  if (!account) throw new Error(`the seed made no ${role} account`);
  const res = await fetch(`${app.baseUrl}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: app.baseUrl },
    body: JSON.stringify({ email: account.email, password: account.password }),
  });
  if (res.status !== 200) throw new Error(`sign-in of ${account.email}: ${res.status} ${await res.text()}`);
  const cookie = res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
  const headers = { cookie, origin: app.baseUrl };
  const get = (path: string) => fetch(`${app.baseUrl}${path}`, { headers });
  return {
    email: account.email,
    get,
    json: async <T>(path: string) => {
      const r = await get(path);
      if (!r.ok) throw new Error(`GET ${path}: ${r.status} ${await r.text()}`);
      return (await r.json()) as T;
    },
    post: (path: string, body: unknown) =>
      fetch(`${app.baseUrl}${path}`, {
        method: "POST",
        headers: body instanceof FormData ? headers : { ...headers, "content-type": "application/json" },
        body: body instanceof FormData ? body : JSON.stringify(body),
      }),
  };
}

async function expectStatus(res: Response, status: number, what: string): Promise<unknown> {
  const body = await res.text();
  if (res.status !== status) throw new Error(`${what}: ${res.status} ${body}`);
  return JSON.parse(body);
}

/** A project of the engineer's with the given other accounts as members. */
export async function makeProject(engineer: Session, code: string, memberEmails: string[] = []): Promise<string> {
  const p = (await expectStatus(await engineer.post("/api/projects", { code, name: `Fault drill ${code}` }), 201, "create project")) as { id: string };
  for (const email of memberEmails) await expectStatus(await engineer.post(`/api/projects/${p.id}/members`, { email }), 201, `add ${email}`);
  return p.id;
}

export async function uploadModel(engineer: Session, projectId: string, model: unknown, fileName = "drill.truss.json"): Promise<string> {
  const form = new FormData();
  form.set("projectId", projectId);
  form.set("file", new Blob([JSON.stringify(model)], { type: "application/json" }), fileName);
  let res: Response;
  try {
    res = await engineer.post("/api/models", form);
  } catch (e) {
    // a connection cut while the body was still being sent (seen once on a crowded machine):
    // said loudly, and sent once more, as a person would press the button again
    console.warn(`!!! upload of ${fileName}: ${(e as Error).message} (${String((e as Error).cause ?? "")}); trying once more`);
    res = await engineer.post("/api/models", form);
  }
  const m = (await expectStatus(res, 201, "upload")) as { id: string };
  return m.id;
}

export async function enqueue(engineer: Session, modelId: string, kind: "design" | "analysis" = "design"): Promise<string> {
  const j = (await expectStatus(await engineer.post("/api/jobs", { modelId, kind }), 202, "enqueue")) as { id: string };
  return j.id;
}

export interface JobListEntry {
  id: string;
  status: string;
  outcome: string | null;
  attempts: number;
  waitingFor: string | null;
}

export async function listJobs(s: Session, projectId: string): Promise<JobListEntry[]> {
  return (await s.json<{ jobs: JobListEntry[] }>(`/api/jobs?projectId=${projectId}&limit=100`)).jobs;
}

/**
 * The seed queues the demo scenario's jobs; a fault drill stops them first, so that the
 * worker's time and the mail are the drill's own.
 */
export async function cancelDemoJobs(admin: Session): Promise<void> {
  const { jobs } = await admin.json<{ jobs: JobListEntry[] }>("/api/jobs?limit=100");
  for (const j of jobs) if (j.status === "queued" || j.status === "running") await admin.post(`/api/jobs/${j.id}/cancel`, {});
}

/** Rows of the app's database (read-only use). */
export async function query<T>(app: RunningApp, sql: string, args: (string | number)[] = []): Promise<T[]> {
  const client = createClient({ url: app.env.DATABASE_URL! });
  try {
    return (await client.execute({ sql, args })).rows as unknown as T[];
  } finally {
    client.close();
  }
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export async function waitUntil<T>(what: string, fn: () => Promise<T | null | undefined | false>, timeoutMs: number, everyMs = 200): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out after ${timeoutMs / 1000} s waiting for ${what}`);
    await sleep(everyMs);
  }
}
