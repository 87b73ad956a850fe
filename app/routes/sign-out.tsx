import { Form, redirect } from "react-router";
import { audit } from "~/lib/auth/audit.server";
import { callAuthEndpoint, cookieHeaders } from "~/lib/auth/auth.server";
import { requireUser } from "~/lib/auth/authorize.server";
import type { Route } from "./+types/sign-out";

export function meta() {
  return [{ title: "Sign out — Strutwise" }];
}

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { email: user.email };
}

// Signing out is a POST (a link or an image tag must not be able to do it).
export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const res = await callAuthEndpoint(request, "/sign-out", {});
  if (user.via === "session") await audit({ actor: user, action: "auth.sign-out", entityType: "user", entityId: user.id });
  throw redirect("/sign-in?signedOut=1", { headers: cookieHeaders(res.setCookies) });
}

export default function SignOut({ loaderData }: Route.ComponentProps) {
  return (
    <section className="mx-auto max-w-md">
      <h1 className="text-3xl font-semibold tracking-tight">Sign out</h1>
      <Form method="post" className="card mt-6 space-y-4">
        <p className="text-ink-soft">You are signed in as <strong>{loaderData.email}</strong>.</p>
        <button type="submit" className="btn btn-primary" autoFocus>Sign out</button>
      </Form>
    </section>
  );
}
