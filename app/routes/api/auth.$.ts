// better-auth's own endpoints (/api/auth/sign-in/email, /api/auth/get-session, …), except its
// admin plugin's endpoints, which bypass the desk's rules (auth.server.ts CLOSED_AUTH_PATHS).
import { auth, isClosedAuthPath, prepareAuthRequest } from "~/lib/auth/auth.server";
import { sameOriginProblem } from "~/lib/auth/authorize.server";
import { jsonError } from "~/lib/http.server";
import type { Route } from "./+types/auth.$";

function closed(request: Request): Response | null {
  return isClosedAuthPath(new URL(request.url).pathname) ? jsonError(404, "Not found: people and roles are managed on the desk's admin pages") : null;
}

export async function loader({ request }: Route.LoaderArgs) {
  return closed(request) ?? auth().handler(request);
}

export async function action({ request }: Route.ActionArgs) {
  const refused = closed(request);
  if (refused) return refused;
  // a browser carrying our session cookie must be on our own pages (same rule as /api/*)
  const problem = request.headers.get("cookie") ? sameOriginProblem(request) : null;
  if (problem) return jsonError(403, problem);
  // sign-in attempts are throttled per account and per address (see auth.server.ts)
  const prepared = await prepareAuthRequest(request);
  return prepared instanceof Response ? prepared : auth().handler(prepared);
}
