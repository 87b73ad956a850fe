import { Form, data, useActionData, useNavigation } from "react-router";
import { createApiKey, listApiKeys, revokeApiKey } from "~/lib/auth/api-keys.server";
import { requirePermission } from "~/lib/auth/authorize.server";
import { callAuthEndpoint, cookieHeaders } from "~/lib/auth/auth.server";
import { apiKeySchema, fieldErrors, formObject, passwordChangeSchema } from "~/lib/auth/forms";
import { PasswordChange, type PasswordResult } from "~/components/account/PasswordChange";
import { ROLE_LABELS } from "~/lib/auth/permissions";
import { TextField } from "~/lib/auth/text-field";
import type { Route } from "./+types/account";
import { RouteError } from "~/components/ui/RouteError";
import { withDependencies } from "~/lib/http.server";
import { getDisplayUnits, setDisplayUnits } from "~/lib/display-units.server";
import { DISPLAY_UNIT_CHOICES } from "~/lib/format";

export function meta() {
  return [{ title: "Your account — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "manage:apikey:own");
  const [keys, displayUnits] = await Promise.all([listApiKeys(user.id), getDisplayUnits(user.id)]);
  return {
    user: { name: user.name, email: user.email, role: user.role },
    displayUnits,
    keys: keys.map((k) => ({
      id: k.id,
      name: k.name,
      prefix: k.prefix,
      createdAt: k.createdAt.toISOString(),
      lastUsedAt: k.lastUsedAt?.toISOString() ?? null,
      revokedAt: k.revokedAt?.toISOString() ?? null,
    })),
  };
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  const user = await requirePermission(request, "manage:apikey:own");
  const values = formObject(await request.formData());
  if (values.intent === "create") {
    const parsed = apiKeySchema.safeParse(values);
    if (!parsed.success) return data({ newKey: null, message: "", errors: fieldErrors(parsed.error) }, { status: 400 });
    const { key, info } = await createApiKey({ userId: user.id, email: user.email, name: parsed.data.name, request });
    return { newKey: { key, name: info.name }, message: "", errors: {} as Record<string, string> };
  }
  if (values.intent === "revoke") {
    const ok = await revokeApiKey({ id: values.keyId ?? "", actor: user, request });
    return data(
      { newKey: null, message: ok ? "The key is revoked; requests with it are refused from now on." : "That key is not yours, or is revoked already.", errors: {} as Record<string, string> },
      { status: ok ? 200 : 404 },
    );
  }
  if (values.intent === "password") return changePassword(request, values);
  if (values.intent === "display-units") {
    const saved = await setDisplayUnits(user.id, values.displayUnits ?? "");
    return data(
      { newKey: null, message: saved.ok ? "Saved: result pages show figures in these units from now on (downloads keep the model's units)." : "", errors: (saved.ok ? {} : { displayUnits: saved.error }) as Record<string, string> },
      { status: saved.ok ? 200 : 400 },
    );
  }
  return data({ newKey: null, message: "Unknown request", errors: {} as Record<string, string> }, { status: 400 });
});

async function changePassword(request: Request, values: Record<string, string>) {
  const parsed = passwordChangeSchema.safeParse(values);
  const reply = (password: PasswordResult, status = 200, headers?: Headers) =>
    data({ newKey: null, message: "", errors: {} as Record<string, string>, password }, { status, headers });
  if (!parsed.success) return reply({ ok: false, message: "", errors: fieldErrors(parsed.error) }, 400);
  // better-auth checks the current password and, with revokeOtherSessions, ends every other
  // session and hands this browser a fresh one
  const res = await callAuthEndpoint(request, "/change-password", { ...parsed.data, revokeOtherSessions: true });
  if (res.status === 200) return reply({ ok: true, message: "Your password is changed; your other sessions are signed out.", errors: {} }, 200, cookieHeaders(res.setCookies));
  if (res.data?.code === "INVALID_PASSWORD") return reply({ ok: false, message: "", errors: { currentPassword: "That is not your current password" } }, 400);
  if (String(res.data?.code ?? "").includes("PASSWORD")) return reply({ ok: false, message: "", errors: { newPassword: "Choose a password of 10 to 128 characters" } }, 400);
  return reply({ ok: false, message: "The password was not changed. Try again.", errors: {} }, res.status === 429 ? 429 : 400);
}

const when = (iso: string | null) => (iso ? iso.replace("T", " ").slice(0, 16) : "—");

export default function Account({ loaderData }: Route.ComponentProps) {
  const { user, keys } = loaderData;
  const result = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const errors: Record<string, string | undefined> = result?.errors ?? {};
  return (
    <section className="max-w-4xl">
      <h1 className="text-3xl font-semibold tracking-tight">Your account</h1>
      <p className="mt-1 text-ink-soft">
        {user.name} · <span className="font-mono text-sm">{user.email}</span> · {ROLE_LABELS[user.role]}
      </p>

      <h2 className="mt-8 text-xl font-semibold">Units on result pages</h2>
      <Form method="post" className="card mt-4 flex flex-wrap items-end gap-3" aria-label="Display units">
        <input type="hidden" name="intent" value="display-units" />
        <label className="block min-w-64 flex-1">
          <span className="field-label">Show forces, lengths and masses in</span>
          <select name="displayUnits" className="field-input" defaultValue={loaderData.displayUnits} data-testid="display-units" aria-invalid={errors.displayUnits ? true : undefined}>
            {Object.entries(DISPLAY_UNIT_CHOICES).map(([k, c]) => (
              <option key={k} value={k}>
                {c.label}
              </option>
            ))}
          </select>
          {errors.displayUnits && <span className="mt-1 block text-sm text-bad">{errors.displayUnits}</span>}
          <span className="mt-1 block text-xs text-ink-muted">Converted on display only: stored results, the result JSON, the CSV tables and the PDF report keep each model's own units.</span>
        </label>
        <button type="submit" className="btn btn-primary" disabled={busy}>
          Save units
        </button>
      </Form>

      <h2 className="mt-8 text-xl font-semibold">API keys</h2>
      <p className="mt-1 text-sm text-ink-soft">
        For scripts: send <code className="font-mono">Authorization: Bearer &lt;key&gt;</code> to the /api routes. A key acts with
        your role as it is at the moment of each request. We keep only a fingerprint of the key, so it is shown once.
      </p>

      {result?.newKey && (
        <div className="caution mt-4" role="status">
          <p className="font-semibold">Key "{result.newKey.name}" — copy it now, it is not shown again:</p>
          <p className="mt-2"><code className="select-all break-all rounded bg-paper-raised px-2 py-1 font-mono text-sm" data-testid="new-api-key">{result.newKey.key}</code></p>
        </div>
      )}
      {result?.message && <p role="status" className="mt-4 text-sm text-ink-soft">{result.message}</p>}

      <Form method="post" className="card mt-4 flex flex-wrap items-end gap-3" noValidate>
        <input type="hidden" name="intent" value="create" />
        <div className="min-w-64 flex-1">
          <TextField label="Key name" name="name" placeholder="e.g. span study laptop" error={errors.name} required />
        </div>
        <button type="submit" className="btn btn-primary" disabled={busy}>Create key</button>
      </Form>

      <div className="card mt-4 overflow-x-auto p-0">
        {keys.length === 0 ? (
          <p className="px-5 py-6 text-center text-ink-muted">No keys yet.</p>
        ) : (
          <table className="data-table">
            <caption className="sr-only">Your API keys</caption>
            <thead>
              <tr><th scope="col">Name</th><th scope="col">Starts with</th><th scope="col">Created</th><th scope="col">Last used</th><th scope="col">State</th></tr>
            </thead>
            <tbody>
              {keys.map((k) => (
                <tr key={k.id}>
                  <td>{k.name}</td>
                  <td className="font-mono text-xs">{k.prefix}…</td>
                  <td className="font-mono text-xs">{when(k.createdAt)}</td>
                  <td className="font-mono text-xs">{when(k.lastUsedAt)}</td>
                  <td>
                    {k.revokedAt ? (
                      <span className="text-xs text-ink-muted">revoked {when(k.revokedAt)}</span>
                    ) : (
                      <Form method="post">
                        <input type="hidden" name="intent" value="revoke" />
                        <input type="hidden" name="keyId" value={k.id} />
                        <button type="submit" className="btn btn-danger px-2 py-1" disabled={busy} aria-label={`Revoke key ${k.name}`}>Revoke</button>
                      </Form>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
      <PasswordChange result={result && "password" in result ? (result.password as PasswordResult) : undefined} />
    </section>
  );
}

// errors render inside the shell, so the navigation stays
export function ErrorBoundary() {
  return <RouteError what="account page" />;
}
