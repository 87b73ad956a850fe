// better-auth's own endpoints (/api/auth/sign-in/email, /api/auth/get-session, …).
import { auth } from "~/lib/auth/auth.server";
import type { Route } from "./+types/auth.$";

export async function loader({ request }: Route.LoaderArgs) {
  return auth().handler(request);
}

export async function action({ request }: Route.ActionArgs) {
  return auth().handler(request);
}
