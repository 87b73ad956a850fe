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
  // the address is taken as proven here; tests of the verification link itself sign up on their own
  await db().update(user).set({ role, emailVerified: true }).where(eq(user.email, email));
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

/**
 * A request to the app. With a cookie and a state-changing method it carries the app's own
 * Origin, as a browser on our pages sends it (the same-origin rule is tested on its own).
 */
export function req(path: string, init: RequestInit & { cookie?: string; key?: string } = {}): Request {
  const headers = new Headers(init.headers);
  if (init.cookie) headers.set("cookie", init.cookie);
  if (init.cookie && init.method && !["GET", "HEAD"].includes(init.method.toUpperCase()) && !headers.has("origin")) headers.set("origin", "http://localhost:4310");
  if (init.key) headers.set("authorization", `Bearer ${init.key}`);
  return new Request(`http://localhost:4310${path}`, { ...init, headers });
}

/** A project, a model and a job row straight in the database (the queue is not needed here). */
export async function makeJob(opts: { submittedBy: string; status?: "queued" | "running" | "succeeded" | "failed" | "cancelled"; code?: string; outcome?: "optimal" | "not-converged" | "infeasible"; members?: string[] }) {
  const { db } = await import("~/db/client.server");
  const { projects, models, jobs, projectMembers } = await import("~/db/schema");
  const { randomUUID } = await import("node:crypto");
  const projectId = randomUUID();
  const modelId = randomUUID();
  const jobId = randomUUID();
  await db().insert(projects).values({ id: projectId, code: opts.code ?? `T-${projectId.slice(0, 6)}`, name: "Marsh Lane footbridge", createdBy: opts.submittedBy });
  // members: the submitter and the accounts given; without a list, every account so far (the
  // role tests act across roles inside one project; membership is tested with explicit lists)
  const { user } = await import("~/db/schema");
  const memberIds = opts.members ?? (await db().select({ id: user.id }).from(user)).map((u) => u.id);
  for (const m of new Set([opts.submittedBy, ...memberIds])) await db().insert(projectMembers).values({ projectId, userId: m }).onConflictDoNothing();
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

/** Wait for a mail to this address whose subject matches, from the test mail catcher. */
export async function mailTo(services: { mail: { messages(): { to: string[]; subject: string; text: string }[] } }, address: string, subject: RegExp) {
  // mail waits in the outbox; deliver what is due, as the queue worker's sender does
  const { MailSender } = await import("~/lib/mail/sender.server");
  const { db } = await import("~/db/client.server");
  await new MailSender({ db: db(), senderId: "auth-tests", log: () => undefined }).deliverDue();
  for (let i = 0; i < 60; i++) {
    const hit = services.mail.messages().find((m) => m.to.includes(address) && subject.test(m.subject));
    if (hit) return hit;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no mail to ${address} matching ${subject}`);
}

/** Open the confirmation link of a verification mail through /api/auth/*, as a browser would. */
export async function followVerificationLink(text: string): Promise<Response> {
  const link = /(http\S+\/api\/auth\/verify-email\?\S+)/.exec(text)?.[1];
  if (!link) throw new Error("the mail holds no confirmation link");
  const { loader } = await import("~/routes/api/auth.$");
  try {
    return (await loader({ request: new Request(link), params: {}, context: {} } as never)) as Response;
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}
