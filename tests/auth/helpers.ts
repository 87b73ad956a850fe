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
export async function sessionCookie(email: string, password = PASSWORD, ip = "10.9.8.7"): Promise<string> {
  const { callAuthEndpoint } = await import("~/lib/auth/auth.server");
  const res = await callAuthEndpoint(new Request("http://localhost/", { headers: { "x-forwarded-for": ip } }), "/sign-in/email", { email, password });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.data)}`);
  return res.setCookies.map((c) => c.split(";")[0]).join("; ");
}

export function req(path: string, init: RequestInit & { cookie?: string; key?: string } = {}): Request {
  const headers = new Headers(init.headers);
  if (init.cookie) headers.set("cookie", init.cookie);
  if (init.key) headers.set("authorization", `Bearer ${init.key}`);
  return new Request(`http://localhost:4310${path}`, { ...init, headers });
}
