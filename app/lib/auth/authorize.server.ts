// The one place that decides who the caller is and what they may do. Every loader, action and
// resource route calls requireUser / requirePermission; anything not granted is refused.
import { redirect } from "react-router";
import { config } from "~/lib/config.server";
import { jsonError } from "~/lib/http.server";
import { auth } from "./auth.server";
import { ownerOfApiKey } from "./api-keys.server";
import { can, isRole, rolesWith, type Permission, type Role } from "./permissions";

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
  via: "session" | "api-key";
}

function isApi(request: Request): boolean {
  return new URL(request.url).pathname.startsWith("/api/");
}

function bearerToken(request: Request): string | null {
  const h = request.headers.get("authorization")?.trim();
  if (!h || !/^bearer\b/i.test(h)) return null; // other schemes are not ours to judge
  const m = /^Bearer\s+(\S+)$/i.exec(h);
  return m ? m[1]! : ""; // "Bearer" with nothing usable: a key was meant, and it is not valid
}

type UserRow = { id: string; email: string; name: string; role?: string | null; banned?: boolean | null; emailVerified?: boolean | null };

function toSessionUser(u: Pick<UserRow, "id" | "email" | "name" | "role" | "banned" | "emailVerified">, via: SessionUser["via"]): SessionUser | null {
  if (u.banned) return null;
  // an address not yet proven by its link may do nothing (issue 14): not even read
  if (!u.emailVerified) return null;
  // a role outside the known four gets nothing: deny by default
  if (!isRole(u.role)) return null;
  return { id: u.id, email: u.email, name: u.name, role: u.role, via };
}

/** The caller from a Bearer API key (on /api/* only) or the session cookie; null when neither is valid. */
export async function getUser(request: Request): Promise<SessionUser | null> {
  const token = bearerToken(request);
  if (token !== null) {
    // keys are for scripts against the API; on pages (their loaders and actions: key
    // management among them) a key is no credential at all, so a leaked key cannot mint more
    if (!isApi(request)) return null;
    const owner = token ? await ownerOfApiKey(token) : null;
    return owner ? toSessionUser(owner, "api-key") : null;
  }
  if (!request.headers.get("cookie")) return null;
  // better-auth checks the cookie's signature and the session row's expiry
  const session = await auth().api.getSession({ headers: request.headers });
  if (!session) return null;
  return toSessionUser(session.user as UserRow, "session");
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * A state-changing request carried by the session cookie must come from our own pages: its
 * Origin is the app's (APP_URL, or the very host the request reached), or the browser says
 * Sec-Fetch-Site: same-origin. A page on another port of the same host is same-SITE, so the
 * SameSite=Lax cookie alone does not stop it; this does. API keys are not sent by browsers on
 * their own, so key-authenticated scripts need no Origin.
 */
export function sameOriginProblem(request: Request): string | null {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return null;
  const origin = request.headers.get("origin");
  const own = new Set([new URL(config().APP_URL).origin, new URL(request.url).origin]);
  if (origin && origin !== "null" && own.has(origin)) return null;
  if (!origin && request.headers.get("sec-fetch-site") === "same-origin") return null;
  return origin
    ? `Requests from ${origin} may not change anything here; use the app's own pages, or an API key for scripts`
    : "This request does not say where it comes from (no Origin header); use the app's own pages, or an API key for scripts";
}

/** The signed-in caller; pages redirect to sign-in, /api/* answers 401 JSON. */
export async function requireUser(request: Request): Promise<SessionUser> {
  const user = await getUser(request);
  if (user) {
    if (user.via === "session") {
      const problem = sameOriginProblem(request);
      if (problem) throw isApi(request) ? jsonError(403, problem) : forbidden(problem);
    }
    return user;
  }
  if (isApi(request)) {
    const sentKey = bearerToken(request) !== null;
    throw jsonError(
      401,
      sentKey
        ? "The API key is unknown or revoked; create a new one on your account page"
        : "Sign in first, or send an API key as 'Authorization: Bearer <key>'",
    );
  }
  const url = new URL(request.url);
  throw redirect(`/sign-in?redirectTo=${encodeURIComponent(url.pathname + url.search)}`);
}

// What each permission lets one do, in the words of the refusal ("Queueing a job is for …").
const ACTION_WORDS: Record<Permission, string> = {
  "read:project": "Reading projects",
  "create:project": "Opening a project",
  "create:model": "Uploading a model",
  "read:model": "Reading models",
  "create:job": "Queueing a job",
  "cancel:job:own": "Cancelling a job",
  "cancel:job:any": "Cancelling someone else's job",
  "review:job": "Reviewing a job",
  "read:job": "Reading jobs",
  "manage:users": "Managing people and roles",
  "read:audit": "Reading the audit trail",
  "manage:apikey:own": "Keeping API keys",
  "manage:apikey:any": "Managing other people's API keys",
  "read:catalogue": "Reading section catalogues",
  "manage:catalogue": "Uploading or retiring a section catalogue",
};

const orList = (items: string[]) => (items.length > 1 ? `${items.slice(0, -1).join(", ")} or ${items.at(-1)}` : (items[0] ?? "no"));

function deniedMessage(user: SessionUser, permission: Permission): string {
  const roles = rolesWith(permission);
  // plain words first; the permission itself stays in for scripts and support
  return (
    `${ACTION_WORDS[permission]} is for the ${orList(roles)} role${roles.length > 1 ? "s" : ""} ` +
    `(this needs permission ${permission}; your role is ${user.role})`
  );
}

/** 403 with the reason as { error } JSON; a page's ErrorBoundary shows it as "403 Not allowed". */
export function forbidden(message: string): Response {
  return Response.json({ error: message }, { status: 403, statusText: "Not allowed", headers: { "Cache-Control": "no-store" } });
}

/** The caller, if their role grants the permission; otherwise a 403 naming what was missing. */
export async function requirePermission(request: Request, permission: Permission): Promise<SessionUser> {
  const user = await requireUser(request);
  if (!can(user.role, permission)) {
    throw forbidden(deniedMessage(user, permission));
  }
  return user;
}

/** For a loader that must check a permission it already has a user for. */
export function assertPermission(user: SessionUser, permission: Permission): void {
  if (!can(user.role, permission)) {
    throw forbidden(deniedMessage(user, permission));
  }
}
