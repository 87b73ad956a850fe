// Who may call each route of app/routes.ts, as data: the role gate of each server function,
// before any rule about the particular record (membership: 404 outside one's projects; the
// project's creator, the job's submitter). tests/auth/membership-matrix.test.ts holds this
// table against the product's role table and against the route modules; a route of
// app/routes.ts without an entry here fails it.
//
// Keys: the URL pattern as routes.ts builds it ("/api/jobs/:jobId/reviews"; parameter names
// do not matter), or "layout:<file>" for a pathless layout. Values per HTTP method:
//   "public"     anyone, signed in or not
//   "signed-in"  any signed-in role; anonymous callers are sent to sign in (pages) or get 401
//   Role[]       only these roles; other roles get 403, anonymous callers as above
// A page without a loader can only be "public" for GET (nothing on the server guards it).
import type { Role } from "./permissions";

export type Access = "public" | "signed-in" | readonly Role[];
export type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

const ALL: readonly Role[] = ["admin", "engineer", "checker", "viewer"];
const PRODUCERS: readonly Role[] = ["admin", "engineer"];
const CHECKERS: readonly Role[] = ["admin", "checker"];
const ADMIN: readonly Role[] = ["admin"];

export const ROUTE_ACCESS: Record<string, Partial<Record<Method, Access>>> = {
  "layout:routes/shell.tsx": { GET: "public" }, // says who is signed in; pages guard themselves
  "/": { GET: "public" },

  // sign-in and account recovery
  "/sign-in": { GET: "public", POST: "public" },
  "/sign-up": { GET: "public", POST: "public" },
  "/sign-out": { GET: "signed-in", POST: "signed-in" },
  "/forgot-password": { GET: "public", POST: "public" },
  "/reset-password": { GET: "public", POST: "public" },
  "/api/auth/*": { GET: "public", POST: "public" }, // better-auth's endpoints check for themselves

  // the signed-in person's own things
  "/account": { GET: ALL, POST: ALL },

  // administration
  "/admin/users": { GET: ADMIN, POST: ADMIN },
  "/admin/audit": { GET: ADMIN },
  "/admin/mail": { GET: ADMIN },

  // projects
  "/projects": { GET: ALL, POST: PRODUCERS },
  "/api/projects": { GET: ALL, POST: PRODUCERS },
  "/api/projects/:id/members": { GET: ALL, POST: ALL }, // members and admins; POST: the creator or an admin
  "/api/projects/:id/members/:userId": { DELETE: ALL }, // the creator or an admin

  // API of api.md (entries stand ready for routes other parts add)
  "/api/health": { GET: "public" },
  "/api/models": { GET: ALL, POST: PRODUCERS },
  "/api/models/:id": { GET: ALL },
  "/api/models/:id/file": { GET: ALL },
  "/api/models/:id/versions": { GET: ALL, POST: PRODUCERS },
  "/api/models/import": { POST: PRODUCERS },
  "/api/models/templates/:id": { GET: ALL },
  "/api/generators": { GET: ALL },
  "/api/schema/model.json": { GET: "public" }, // the file format is public documentation
  "/api/generators/:id": { POST: ALL }, // builds a model, stores nothing
  "/api/jobs": { GET: ALL, POST: PRODUCERS },
  "/api/jobs/:id": { GET: ALL },
  "/api/jobs/:id/cancel": { POST: PRODUCERS }, // and then only the submitter, unless admin
  "/api/jobs/:id/result": { GET: ALL },
  "/api/jobs/:id/progress": { GET: ALL },
  "/api/jobs/:id/reviews": { GET: ALL, POST: CHECKERS }, // and never on one's own job
  "/api/jobs/:id/report": { GET: ALL },
  "/api/jobs/:id/clean-layout": { POST: PRODUCERS }, // stores the next version of the job's model

  // pages of other parts
  "/projects/:id": { GET: ALL, POST: PRODUCERS }, // POST uploads a model
  "/models/:id": { GET: ALL, POST: PRODUCERS }, // POST queues a job
  "/models/:id/edit": { GET: PRODUCERS, POST: PRODUCERS }, // POST saves a new version
  "/models/:id/versions/:id": { GET: ALL, POST: PRODUCERS }, // POST queues a run of that version
  "/projects/:id/new-model": { GET: PRODUCERS, POST: PRODUCERS },
  "/jobs": { GET: ALL },
  "/jobs/:id": { GET: ALL, POST: "signed-in" }, // actions inside check review/cancel rights
  "/compare": { GET: ALL }, // ?jobs=a,b: each run must be in one of the caller's projects (else 404)
  // section catalogues: the desk's, read by everyone signed in, kept by admins and engineers
  "/catalogues": { GET: ALL, POST: PRODUCERS }, // POST uploads a CSV catalogue
  "/catalogues/:id": { GET: ALL, POST: PRODUCERS }, // POST retires it
  "/api/catalogues": { GET: ALL, POST: PRODUCERS },
  "/api/catalogues/:id": { GET: ALL },
  "/api/catalogues/:id/retire": { POST: PRODUCERS },
  "/dev/inbox": { GET: ADMIN }, // any signed-in role too, but only when NODE_ENV=development
};

/** "/api/jobs/:jobId/reviews" and "/api/jobs/:id/reviews" are the same route. */
export function normalizePattern(pattern: string): string {
  return pattern.replace(/:[^/]+/g, ":param").replace(/\/+$/, "") || "/";
}

export function accessFor(pattern: string): Partial<Record<Method, Access>> | undefined {
  const want = normalizePattern(pattern);
  for (const [k, v] of Object.entries(ROUTE_ACCESS)) if (normalizePattern(k) === want) return v;
  return undefined;
}

export function allows(access: Access, role: Role | null): boolean {
  if (access === "public") return true;
  if (role === null) return false;
  if (access === "signed-in") return true;
  return access.includes(role);
}
