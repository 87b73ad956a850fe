// better-auth's own endpoints (/api/auth/sign-in/email, /api/auth/get-session, …).
import { auth, prepareAuthRequest } from "~/lib/auth/auth.server";
import type { Route } from "./+types/auth.$";

export async function loader({ request }: Route.LoaderArgs) {
  return auth().handler(request);
}

export async function action({ request }: Route.ActionArgs) {
  // sign-in attempts are throttled per account (see auth.server.ts)
  return auth().handler(await prepareAuthRequest(request));
}
