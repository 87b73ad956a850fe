// The better-auth instance: e-mail + password accounts, database sessions through the Drizzle
// adapter, the admin plugin for the role column and bans, sign-in throttling stored in the
// database (so it holds across processes), password reset by e-mail.
import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { APIError, createAuthMiddleware, isAPIError } from "better-auth/api";
import { admin } from "better-auth/plugins";
import { eq } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import * as schema from "~/db/schema";
import { config } from "~/lib/config.server";
import { enqueueMail } from "~/lib/mail/outbox.server";
import { audit } from "./audit.server";
import { clientAddress, countSignInAttempt, emailOfBody } from "./sign-in-throttle.server";
import { applyInvitationAfterVerification, INVITATION_HEADER, signUpRefusal } from "./sign-up-policy.server";
import { plainText } from "~/lib/text-hygiene";

/**
 * better-auth's admin plugin endpoints (role changes, impersonation, bans, user creation,
 * password setting) bypass the desk's own rules and audit trail; the plugin is kept only for
 * its role and ban columns. The desk's admin pages (users.server.ts) do these things with
 * checks and an audit record naming who; these paths answer 404 instead.
 */
export const CLOSED_AUTH_PATHS = [
  "/admin/set-role", "/admin/get-user", "/admin/create-user", "/admin/update-user", "/admin/list-users",
  "/admin/list-user-sessions", "/admin/unban-user", "/admin/ban-user", "/admin/impersonate-user",
  "/admin/stop-impersonating", "/admin/revoke-user-session", "/admin/revoke-user-sessions",
  "/admin/remove-user", "/admin/set-user-password", "/admin/has-permission",
];

/** Any path under /api/auth/admin/ (also ones a later plugin version adds) is closed. */
export function isClosedAuthPath(pathname: string): boolean {
  const rest = pathname.replace(/^.*?\/api\/auth/, "").replace(/\/+$/, "").toLowerCase();
  return rest === "/admin" || rest.startsWith("/admin/");
}

/**
 * The request as better-auth should see it. A sign-in attempt is counted first by the desk's
 * own throttle (sign-in-throttle.server.ts: per account whatever the body encoding, and per
 * address); past the limit the answer is a 429 and better-auth never sees it.
 */
export async function prepareAuthRequest(request: Request, database: Db = defaultDb()): Promise<Request | Response> {
  const url = new URL(request.url);
  if (request.method !== "POST" || !url.pathname.replace(/\/+$/, "").endsWith("/sign-in/email")) return request;
  const text = await request.text();
  const email = emailOfBody(request.headers.get("content-type") ?? "", text);
  const wait = await countSignInAttempt({ email, address: clientAddress(request) }, database);
  if (wait !== null) {
    return Response.json(
      { code: "TOO_MANY_REQUESTS", message: `Too many sign-in attempts for this account; wait ${wait} seconds` },
      { status: 429, headers: { "X-Retry-After": String(wait), "Retry-After": String(wait), "Cache-Control": "no-store" } },
    );
  }
  return new Request(request.url, { method: "POST", headers: request.headers, body: text });
}

function realAddress(ctx: { headers?: Headers; request?: Request } | null | undefined): string | null {
  const h = ctx?.headers ?? ctx?.request?.headers;
  return h?.get("x-forwarded-for")?.split(",")[0]?.trim() || null;
}

function createAuth(database: Db) {
  const c = config();
  const secure = c.APP_URL.startsWith("https://");
  return betterAuth({
    appName: "Strutwise",
    // failed passwords are expected traffic; keep test output to real errors
    logger: { level: c.NODE_ENV === "test" ? "error" : "warn" },
    baseURL: c.APP_URL,
    basePath: "/api/auth",
    secret: c.BETTER_AUTH_SECRET,
    trustedOrigins: [new URL(c.APP_URL).origin],
    database: drizzleAdapter(database, { provider: "sqlite", schema }),
    disabledPaths: CLOSED_AUTH_PATHS,
    emailAndPassword: {
      enabled: true,
      // no session until the address is proven by its link (issue 14)
      requireEmailVerification: true,
      minPasswordLength: 10,
      maxPasswordLength: 128,
      autoSignIn: true,
      revokeSessionsOnPasswordReset: true,
      resetPasswordTokenExpiresIn: 60 * 60,
      // the reset link came through the mailbox: the address is proven
      onPasswordReset: async ({ user }) => {
        const row = await database.query.user.findFirst({ where: eq(schema.user.id, user.id) });
        if (row && !row.emailVerified) {
          await database.update(schema.user).set({ emailVerified: true, updatedAt: new Date() }).where(eq(schema.user.id, user.id));
          await applyInvitationAfterVerification(row, database);
        }
      },
      // queued in the outbox like every mail; the queue worker's sender delivers it
      sendResetPassword: async ({ user, url, token }) => {
        await enqueueMail(database, {
          kind: "password-reset",
          dedupeKey: `password-reset:${user.id}:${token}`,
          entity: { type: "user", id: user.id },
          to: user.email,
          subject: "Strutwise: choose a new password",
          text:
            `Hello ${plainText(user.name)},\n\nSomeone (hopefully you) asked to reset the password of your Strutwise account.\n` +
            `Open this link within the hour to choose a new one:\n\n${url}\n\n` +
            `If you did not ask for this, ignore this message; your password stays as it is.\n`,
        });
      },
    },
    // a reset link reaches the mailbox just like a verification link, so it proves the address
    emailVerification: {
      sendOnSignUp: true,
      sendOnSignIn: true,
      autoSignInAfterVerification: true,
      expiresIn: 60 * 60 * 24,
      // through the outbox like every mail (the token's tail tells repeated links apart)
      sendVerificationEmail: async ({ user, url, token }) => {
        await enqueueMail(database, {
          kind: "verification",
          dedupeKey: `verification:${user.id}:${token.slice(-24)}`,
          entity: { type: "user", id: user.id },
          to: user.email,
          subject: "Strutwise: confirm your e-mail address",
          text:
            `Hello ${plainText(user.name)},\n\nA Strutwise account was created with this address. Open this link within 24 hours to confirm it is yours:\n\n${url}\n\n` +
            `Until then the account can do nothing. If you did not create it, ignore this message.\n`,
        });
      },
      afterEmailVerification: async (user) => {
        await applyInvitationAfterVerification(user, database);
        await audit({ actor: { id: user.id, email: user.email }, action: "user.email-verified", entityType: "user", entityId: user.id }, database);
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
        // sign-in has the desk's own throttle in front (prepareAuthRequest)
        "/sign-in/email": false,
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
          // SIGN_UP decides who may create an account; every account starts as an unverified
          // viewer, and an invitation's role applies only after the verification link
          // (sign-up-policy.server.ts). Demo and test accounts are written directly.
          before: async (user, ctx) => {
            const headers = ctx?.headers ?? ctx?.request?.headers;
            const refusal = await signUpRefusal(user.email, database, headers?.get(INVITATION_HEADER));
            // 400, not 403: better-auth turns a 403 here into its generic "check your mail" answer
            if (refusal) throw new APIError("BAD_REQUEST", { message: refusal, code: "SIGN_UP_CLOSED" });
            return { data: { ...user, role: "viewer", emailVerified: false } };
          },
          after: async (user) => {
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
  extraHeaders: Record<string, string> = {},
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
  for (const [k, v] of Object.entries(extraHeaders)) headers.set(k, v);
  for (const h of ["cookie", "user-agent", "x-forwarded-for"]) {
    const v = request.headers.get(h);
    if (v) headers.set(h, v);
  }
  const prepared = await prepareAuthRequest(
    new Request(`${base}/api/auth${path}`, {
      method: body ? "POST" : "GET",
      headers,
      body: body ? JSON.stringify(body) : undefined,
    }),
  );
  const res = prepared instanceof Response ? prepared : await auth().handler(prepared);
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
