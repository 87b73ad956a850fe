// Shared set-up for the auth tests: real services, a migrated database, accounts per role,
// and requests that carry a real session cookie or API key.
import { eq } from "drizzle-orm";
import { startTestServices, type TestServices } from "../support/services";

export const PASSWORD = "correct-horse-girder-42";

export async function setup() {
  const services: TestServices = await startTestServices();
  const { db } = await import("~/db/client.server");
  const { migrateDb } = await import("~/db/migrate.server");
  await migrateDb(db());
  return { services, db: db() };
}

/** Sign up through better-auth's HTTP handler, then set the role directly. */
export async function makeUser(email: string, role: string, name = email.split("@")[0]!) {
  const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
  const { db } = await import("~/db/client.server");
  const { user } = await import("~/db/schema");
  const res = await callAuthEndpoint(new Request("http://localhost/"), "/sign-up/email", { email, password: PASSWORD, name });
  if (res.status !== 200) throw new Error(`sign-up of ${email} failed: ${res.status} ${JSON.stringify(res.data)}`);
  await db().update(user).set({ role }).where(eq(user.email, email));
  const row = await db().query.user.findFirst({ where: eq(user.email, email) });
  return row!;
}

/** A Cookie header value for a fresh session of that account. */
// each sign-in comes from its own made-up address, so the sign-in throttle (tested on its own
// in brute-force.test.ts) does not trip while setting up accounts
export async function sessionCookie(email: string, password = PASSWORD, ip = randomIp()): Promise<string> {
  const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
  const res = await callAuthEndpoint(new Request("http://localhost/", { headers: { "x-forwarded-for": ip } }), "/sign-in/email", { email, password });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.data)}`);
  return res.setCookies.map((c) => c.split(";")[0]).join("; ");
}

export function randomIp(): string {
  const b = () => Math.floor(Math.random() * 254) + 1;
  return `10.${b()}.${b()}.${b()}`;
}

export function req(path: string, init: RequestInit & { cookie?: string; key?: string } = {}): Request {
  const headers = new Headers(init.headers);
  if (init.cookie) headers.set("cookie", init.cookie);
  if (init.key) headers.set("authorization", `Bearer ${init.key}`);
  return new Request(`http://localhost:4310${path}`, { ...init, headers });
}

/** A project, a model and a job row straight in the database (the queue is not needed here). */
export async function makeJob(opts: { submittedBy: string; status?: "queued" | "running" | "succeeded" | "failed" | "cancelled"; code?: string; outcome?: "optimal" | "not-converged" | "infeasible" }) {
  const { db } = await import("~/db/client.server");
  const { projects, models, jobs } = await import("~/db/schema");
  const { randomUUID } = await import("node:crypto");
  const projectId = randomUUID();
  const modelId = randomUUID();
  const jobId = randomUUID();
  await db().insert(projects).values({ id: projectId, code: opts.code ?? `T-${projectId.slice(0, 6)}`, name: "Marsh Lane footbridge", createdBy: opts.submittedBy });
  await db().insert(models).values({
    id: modelId,
    projectId,
    name: "deck truss",
    fileName: "deck.json",
    fileKey: `models/${modelId}.json`,
    sha256: "0".repeat(64),
    sizeBytes: 10,
    dimension: 2,
    nodeCount: 3,
    memberCount: 3,
    hasDesign: true,
    summary: {},
    warnings: [],
    uploadedBy: opts.submittedBy,
  });
  await db().insert(jobs).values({ id: jobId, projectId, modelId, submittedBy: opts.submittedBy, status: opts.status ?? "succeeded", options: {}, ...(opts.outcome ? { outcome: opts.outcome } : {}) });
  return { projectId, modelId, jobId };
}
