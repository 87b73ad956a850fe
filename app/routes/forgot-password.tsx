import { Form, Link, data, useActionData, useNavigation } from "react-router";
import { callAuthEndpoint } from "~/lib/auth/auth.server";
import { fieldErrors, forgotPasswordSchema, formObject } from "~/lib/auth/forms";
import { TextField } from "~/lib/auth/text-field";
import type { Route } from "./+types/forgot-password";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Reset your password — Strutwise" }];
}

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  const values = formObject(await request.formData());
  const parsed = forgotPasswordSchema.safeParse(values);
  if (!parsed.success) return data({ sent: false, errors: fieldErrors(parsed.error) }, { status: 400 });
  const res = await callAuthEndpoint(request, "/request-password-reset", { email: parsed.data.email, redirectTo: "/reset-password" });
  if (res.status === 429) return data({ sent: false, errors: { form: `Too many requests from here. Wait ${res.retryAfter ?? 60} seconds.` } }, { status: 429 });
  // The same answer whether or not the address has an account, so this form cannot be used to probe.
  return { sent: true, errors: {} as Record<string, string> };
});

export default function ForgotPassword() {
  const result = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const errors: Record<string, string | undefined> = result?.errors ?? {};
  return (
    <section className="mx-auto max-w-md">
      <h1 className="text-3xl font-semibold tracking-tight">Reset your password</h1>
      {result?.sent ? (
        <div className="card mt-6" role="status">
          <p>If that address has an account, a message with a reset link is on its way. The link works for one hour.</p>
          <p className="mt-4 text-sm"><Link to="/sign-in" className="text-info underline">Back to sign in</Link></p>
        </div>
      ) : (
        <Form method="post" className="card mt-6 space-y-4" noValidate>
          <p className="text-ink-soft">We send a link to choose a new password.</p>
          {errors.form && <p role="alert" className="rounded-md bg-bad-wash px-3 py-2 text-sm text-bad">{errors.form}</p>}
          <TextField label="E-mail" name="email" type="email" autoComplete="email" error={errors.email} autoFocus required />
          <button type="submit" className="btn btn-primary w-full" disabled={busy}>Send reset link</button>
        </Form>
      )}
    </section>
  );
}
