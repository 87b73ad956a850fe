// Change one's password on the account page: the current password is required, and every
// other session of the account is signed out (the account page's action, intent "password").
import { Form, useNavigation } from "react-router";
import { TextField } from "~/lib/auth/text-field";

export interface PasswordResult {
  ok: boolean;
  message: string;
  errors: Record<string, string>;
}

export function PasswordChange({ result }: { result?: PasswordResult }) {
  const busy = useNavigation().state === "submitting";
  const errors = result?.errors ?? {};
  return (
    <section className="card mt-8 max-w-md" aria-label="Change password">
      <h2 className="font-semibold">Change password</h2>
      <p className="mt-1 text-sm text-ink-soft">Your other sessions (other browsers and devices) are signed out; this one stays.</p>
      {result?.message && (
        <p role={result.ok ? "status" : "alert"} className={`mt-3 rounded-md px-3 py-2 text-sm ${result.ok ? "bg-ok-wash text-ok" : "bg-bad-wash text-bad"}`}>
          {result.message}
        </p>
      )}
      <Form method="post" className="mt-3 space-y-3" noValidate>
        <input type="hidden" name="intent" value="password" />
        <TextField label="Current password" name="currentPassword" type="password" autoComplete="current-password" error={errors.currentPassword} required />
        <TextField label="New password" name="newPassword" type="password" autoComplete="new-password" error={errors.newPassword} hint="At least 10 characters." required />
        <button type="submit" className="btn btn-primary" disabled={busy}>
          Change password
        </button>
      </Form>
    </section>
  );
}
