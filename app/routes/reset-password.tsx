import { Form, Link, data, useActionData, useNavigation, useSearchParams } from "react-router";
import { callAuthEndpoint } from "~/lib/auth/auth.server";
import { fieldErrors, formObject, resetPasswordSchema } from "~/lib/auth/forms";
import { TextField } from "~/lib/auth/text-field";
import type { Route } from "./+types/reset-password";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Choose a new password — Strutwise" }];
}

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  const values = formObject(await request.formData());
  const parsed = resetPasswordSchema.safeParse(values);
  if (!parsed.success) return data({ done: false, errors: fieldErrors(parsed.error) }, { status: 400 });
  const res = await callAuthEndpoint(request, "/reset-password", { token: parsed.data.token, newPassword: parsed.data.password });
  if (res.status !== 200) {
    return data({ done: false, errors: { form: "This reset link is used up or has expired. Ask for a new one." } as Record<string, string> }, { status: 400 });
  }
  return { done: true, errors: {} as Record<string, string> };
});

export default function ResetPassword() {
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state === "submitting";
  const errors = result?.errors ?? {};
  const token = params.get("token") ?? "";
  const linkError = params.get("error");
  return (
    <section className="mx-auto max-w-md">
      <h1 className="text-3xl font-semibold tracking-tight">Choose a new password</h1>
      {result?.done ? (
        <div className="card mt-6" role="status">
          <p>Your password is changed, and every session of the account was signed out.</p>
          <p className="mt-4"><Link to="/sign-in" className="btn btn-primary">Sign in</Link></p>
        </div>
      ) : linkError || !token ? (
        <div className="card mt-6" role="alert">
          <p>This reset link is used up, has expired, or is incomplete.</p>
          <p className="mt-4 text-sm"><Link to="/forgot-password" className="text-info underline">Ask for a new link</Link></p>
        </div>
      ) : (
        <Form method="post" className="card mt-6 space-y-4" noValidate>
          <input type="hidden" name="token" value={token} />
          {errors.form && <p role="alert" className="rounded-md bg-bad-wash px-3 py-2 text-sm text-bad">{errors.form}</p>}
          <TextField label="New password" name="password" type="password" autoComplete="new-password" error={errors.password} hint="At least 10 characters." autoFocus required />
          <TextField label="Repeat the new password" name="confirm" type="password" autoComplete="new-password" error={errors.confirm} required />
          <button type="submit" className="btn btn-primary w-full" disabled={busy}>Save new password</button>
        </Form>
      )}
    </section>
  );
}
