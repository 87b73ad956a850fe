import { Form, Link, data, redirect, useActionData, useNavigation, useSearchParams } from "react-router";
import { callAuthEndpoint, cookieHeaders } from "~/lib/auth/auth.server";
import { getUser } from "~/lib/auth/authorize.server";
import { fieldErrors, formObject, signInSchema, type FieldErrors } from "~/lib/auth/forms";
import { safeRedirect } from "~/lib/auth/redirect-target";
import { TextField } from "~/lib/auth/text-field";
import type { Route } from "./+types/sign-in";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Sign in — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  if (user) throw redirect(safeRedirect(new URL(request.url).searchParams.get("redirectTo")));
  return null;
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  const values = formObject(await request.formData());
  const parsed = signInSchema.safeParse(values);
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error), email: values.email ?? "" }, { status: 400 });
  const { email, password, redirectTo } = parsed.data;
  const res = await callAuthEndpoint(request, "/sign-in/email", { email, password });
  if (res.status === 200) throw redirect(safeRedirect(redirectTo), { headers: cookieHeaders(res.setCookies) });
  const errors: FieldErrors = {};
  if (res.status === 429) {
    errors.form = `Too many sign-in attempts for this account. Wait ${res.retryAfter ?? 60} seconds, then try again.`;
  } else if (res.status === 403 && res.data?.code === "BANNED_USER") {
    errors.form = "This account is suspended. Ask an administrator of your desk.";
  } else if (res.status === 403 && res.data?.code === "EMAIL_NOT_VERIFIED") {
    errors.form = "Confirm your e-mail address first: we have sent a new link to it. The account can do nothing until then.";
  } else if (res.status === 403 && String(res.data?.code ?? "").includes("ORIGIN")) {
    errors.form = "This sign-in form was sent from another site, so it was refused. Open the sign-in page of the desk itself.";
  } else if (res.status === 401 || res.status === 400) {
    errors.form = "That e-mail and password do not match an account.";
  } else {
    errors.form = "Signing in failed on our side. Try again in a moment.";
  }
  return data({ errors, email }, { status: res.status === 429 ? 429 : 400 });
});

export default function SignIn() {
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state === "submitting";
  const errors = result?.errors ?? {};
  return (
    <section className="mx-auto max-w-md">
      <h1 className="text-3xl font-semibold tracking-tight">Sign in</h1>
      <p className="mt-2 text-ink-soft">Use the e-mail address your desk knows you by.</p>
      <Form method="post" className="card mt-6 space-y-4" noValidate>
        <input type="hidden" name="redirectTo" value={params.get("redirectTo") ?? ""} />
        {errors.form && (
          <p role="alert" className="rounded-md bg-bad-wash px-3 py-2 text-sm text-bad">
            {errors.form}
          </p>
        )}
        <TextField label="E-mail" name="email" type="email" autoComplete="username" defaultValue={result?.email} error={errors.email} autoFocus required />
        <TextField label="Password" name="password" type="password" autoComplete="current-password" error={errors.password} required />
        <button type="submit" className="btn btn-primary w-full" disabled={busy}>
          Sign in
        </button>
        <p className="flex justify-between text-sm">
          <Link to="/forgot-password" className="text-info underline">Forgot your password?</Link>
          <Link to="/sign-up" className="text-info underline">Create an account</Link>
        </p>
      </Form>
    </section>
  );
}
