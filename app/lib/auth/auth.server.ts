// The better-auth instance: e-mail + password accounts, database sessions through the Drizzle
// adapter, the admin plugin for the role column and bans, sign-in throttling stored in the
// database (so it holds across processes), password reset by e-mail.
import { createHash } from "node:crypto";
import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { createAuthMiddleware, isAPIError } from "better-auth/api";
import { admin } from "better-auth/plugins";
import { eq } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import * as schema from "~/db/schema";
import { config } from "~/lib/config.server";
import { enqueueMail } from "~/lib/mail/outbox.server";
import { audit } from "./audit.server";

/**
 * Sign-in throttle: at most `max` attempts per ACCOUNT (the e-mail tried) within `window`
 * seconds. better-auth keys its limiter by client address, but behind react-router-serve no
 * trustworthy address reaches the app, and one shared bucket would let anyone lock everyone
 * out. So sign-in requests carry a stand-in address derived from the e-mail tried
 * (throttleAddressFor), set by our code and never taken from the client.
 * AUTH_SIGN_IN_LIMIT="max/windowSeconds" overrides it (e.g. for an end-to-end harness that
 * signs in many times from one address); the default slows brute force to 10 a minute.
 */
export function signInLimit(env = process.env): { max: number; window: number } {
  const m = /^(\d+)\/(\d+)$/.exec(env.AUTH_SIGN_IN_LIMIT ?? "");
  return m ? { max: Number(m[1]), window: Number(m[2]) } : { max: 10, window: 60 };
}

/** A private-range IPv6 address (fd00::/8) standing for one e-mail in the throttle's key. */
export function throttleAddressFor(email: string): string {
  const h = createHash("sha256").update(email.trim().toLowerCase()).digest("hex");
  // better-auth collapses IPv6 to its /64 prefix, so the distinguishing bits go up front
  return `fd${h.slice(0, 2)}:${h.slice(2, 6)}:${h.slice(6, 10)}:${h.slice(10, 14)}::1`;
}

/** Header that carries the caller's own forwarded address past the throttle's stand-in. */
export const CLIENT_ADDRESS_HEADER = "x-strutwise-client-address";

/** The request as better-auth should see it: a sign-in gets its throttle address. */
export async function prepareAuthRequest(request: Request): Promise<Request> {
  const url = new URL(request.url);
  if (request.method !== "POST" || !url.pathname.endsWith("/sign-in/email")) return request;
  const text = await request.text();
  let email = "";
  try {
    email = String(JSON.parse(text)?.email ?? "");
  } catch {
    // better-auth answers the malformed body itself
  }
  const headers = new Headers(request.headers);
  const original = request.headers.get("x-forwarded-for");
  headers.delete(CLIENT_ADDRESS_HEADER);
  if (original) headers.set(CLIENT_ADDRESS_HEADER, original.split(",")[0]!.trim());
  headers.set("x-forwarded-for", throttleAddressFor(email));
  return new Request(request.url, { method: "POST", headers, body: text });
}

function realAddress(ctx: { headers?: Headers; request?: Request } | null | undefined): string | null {
  const h = ctx?.headers ?? ctx?.request?.headers;
  return h?.get(CLIENT_ADDRESS_HEADER) ?? h?.get("x-forwarded-for")?.split(",")[0]?.trim() ?? null;
}

function createAuth(database: Db) {
  const c = config();
  const secure = c.APP_URL.startsWith("https://");
  const limit = signInLimit();
  return betterAuth({
    appName: "Strutwise",
    // failed passwords are expected traffic; keep test output to real errors
    logger: { level: c.NODE_ENV === "test" ? "error" : "warn" },
    baseURL: c.APP_URL,
    basePath: "/api/auth",
    secret: c.BETTER_AUTH_SECRET,
    trustedOrigins: [new URL(c.APP_URL).origin],
    database: drizzleAdapter(database, { provider: "sqlite", schema }),
    emailAndPassword: {
      enabled: true,
      minPasswordLength: 10,
      maxPasswordLength: 128,
      autoSignIn: true,
      revokeSessionsOnPasswordReset: true,
      resetPasswordTokenExpiresIn: 60 * 60,
      // queued in the outbox like every mail; the queue worker's sender delivers it
      sendResetPassword: async ({ user, url, token }) => {
        await enqueueMail(database, {
          kind: "password-reset",
          dedupeKey: `password-reset:${user.id}:${token}`,
          entity: { type: "user", id: user.id },
          to: user.email,
          subject: "Strutwise: choose a new password",
          text:
            `Hello ${user.name},\n\nSomeone (hopefully you) asked to reset the password of your Strutwise account.\n` +
            `Open this link within the hour to choose a new one:\n\n${url}\n\n` +
            `If you did not ask for this, ignore this message; your password stays as it is.\n`,
        });
      },
    },
    session: {
      expiresIn: 60 * 60 * 24 * 7,
      updateAge: 60 * 60 * 24,
    },
    advanced: {
      useSecureCookies: secure,
      cookiePrefix: "strutwise",
      defaultCookieAttributes: { httpOnly: true, sameSite: "lax", secure, path: "/" },
      ipAddress: { ipAddressHeaders: ["x-forwarded-for"] },
    },
    rateLimit: {
      enabled: true,
      storage: "database",
      modelName: "rateLimit",
      window: 60,
      max: 200,
      customRules: {
        "/sign-in/email": { window: limit.window, max: limit.max },
        "/sign-up/email": { window: 60, max: 10 },
        "/request-password-reset": { window: 60, max: 5 },
      },
    },
    plugins: [admin({ defaultRole: "viewer", adminRoles: ["admin"], bannedUserMessage: "This account is suspended" })],
    hooks: {
      // a refused password is part of the trail too (throttled attempts never get this far)
      after: createAuthMiddleware(async (ctx) => {
        if (ctx.path !== "/sign-in/email" || !isAPIError(ctx.context.returned)) return;
        const email = typeof ctx.body?.email === "string" ? ctx.body.email.toLowerCase().slice(0, 200) : null;
        const known = email ? await database.query.user.findFirst({ where: eq(schema.user.email, email) }) : undefined;
        await audit({
          actor: known ? { id: known.id, email: known.email } : null,
          action: "auth.sign-in-refused",
          entityType: "user",
          entityId: known?.id,
          detail: { email, reason: (ctx.context.returned as { body?: { code?: string } }).body?.code ?? "refused" },
          ip: realAddress(ctx),
        }, database);
      }),
    },
    databaseHooks: {
      user: {
        create: {
          // An invitation decides the role of a new account; everyone else starts as viewer.
          before: async (user) => {
            const invite = await database.query.invitations.findFirst({
              where: eq(schema.invitations.email, user.email.toLowerCase()),
            });
            return { data: { ...user, role: invite && !invite.acceptedAt ? invite.role : "viewer" } };
          },
          after: async (user) => {
            await database
              .update(schema.invitations)
              .set({ acceptedAt: new Date() })
              .where(eq(schema.invitations.email, user.email.toLowerCase()));
            await audit({
              actor: { id: user.id, email: user.email },
              action: "user.sign-up",
              entityType: "user",
              entityId: user.id,
              detail: { role: (user as { role?: string }).role ?? "viewer" },
            }, database);
          },
        },
      },
      session: {
        create: {
          // keep the caller's own address on the session, not the throttle's stand-in
          before: async (session, ctx) => ({ data: { ...session, ipAddress: realAddress(ctx) } }),
          after: async (session) => {
            const u = await database.query.user.findFirst({ where: eq(schema.user.id, session.userId) });
            await audit({
              actor: { id: session.userId, email: u?.email ?? null },
              action: "auth.sign-in",
              entityType: "session",
              entityId: session.id,
              ip: session.ipAddress ?? null,
            }, database);
          },
        },
      },
    },
  });
}

export type Auth = ReturnType<typeof createAuth>;

let instance: { db: Db; auth: Auth } | undefined;

/** The process's auth instance, bound to db() (or to the handle given, for tests and scripts). */
export function auth(database: Db = defaultDb()): Auth {
  if (!instance || instance.db !== database) instance = { db: database, auth: createAuth(database) };
  return instance.auth;
}

/**
 * Call one of better-auth's HTTP endpoints from a page action, through its full handler so
 * that throttling, origin checks and cookie handling apply exactly as for /api/auth/*.
 * Returns the status, the parsed JSON body and the Set-Cookie headers to pass on.
 */
export async function callAuthEndpoint(
  request: Request,
  path: string,
  body: Record<string, unknown> | null,
): Promise<{ status: number; data: any; setCookies: string[]; retryAfter: number | null }> {
  const base = config().APP_URL.replace(/\/$/, "");
  const headers = new Headers({ "content-type": "application/json" });
  // A form posted from this very host (whatever name it was reached by: localhost, 127.0.0.1)
  // speaks for our own origin.
  // A form from elsewhere is refused here, before better-auth (which skips its own origin
  // check when NODE_ENV=test, so this keeps the rule the same everywhere).
  const sent = request.headers.get("origin");
  const own = new URL(base).origin;
  if (sent && sent !== new URL(request.url).origin && sent !== own) {
    return { status: 403, data: { code: "INVALID_ORIGIN", message: `Forms from ${sent} are not accepted` }, setCookies: [], retryAfter: null };
  }
  headers.set("origin", own);
  for (const h of ["cookie", "user-agent", "x-forwarded-for"]) {
    const v = request.headers.get(h);
    if (v) headers.set(h, v);
  }
  const res = await auth().handler(
    await prepareAuthRequest(
      new Request(`${base}/api/auth${path}`, {
        method: body ? "POST" : "GET",
        headers,
        body: body ? JSON.stringify(body) : undefined,
      }),
    ),
  );
  const text = await res.text();
  let data: any = null;
  try {
    data = text ? JSON.parse(text) : null;
  } catch {
    data = { message: text };
  }
  const retry = res.headers.get("x-retry-after");
  return { status: res.status, data, setCookies: res.headers.getSetCookie(), retryAfter: retry ? Number(retry) : null };
}

/** Headers carrying the Set-Cookie lines of an auth response onward (redirects, data()). */
export function cookieHeaders(setCookies: string[]): Headers {
  const h = new Headers();
  for (const c of setCookies) h.append("set-cookie", c);
  return h;
}
