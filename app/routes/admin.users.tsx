import { Form, data, useActionData, useNavigation } from "react-router";
import { listAllLiveApiKeys, revokeApiKey } from "~/lib/auth/api-keys.server";
import { requirePermission } from "~/lib/auth/authorize.server";
import { fieldErrors, formObject, inviteSchema, roleChangeSchema } from "~/lib/auth/forms";
import { ROLE_LABELS, ROLES } from "~/lib/auth/permissions";
import { changeRole, inviteUser, listOpenInvitations, listUsers, setBanned } from "~/lib/auth/users.server";
import { TextField } from "~/lib/auth/text-field";
import type { Route } from "./+types/admin.users";
import { RouteError } from "~/components/ui/RouteError";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "People and roles — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const me = await requirePermission(request, "manage:users");
  const [users, invites, keys] = await Promise.all([listUsers(), listOpenInvitations(), listAllLiveApiKeys()]);
  return {
    meId: me.id,
    keys: keys.map((k) => ({ ...k, createdAt: k.createdAt.toISOString(), lastUsedAt: k.lastUsedAt?.toISOString() ?? null })),
    users: users.map((u) => ({ ...u, createdAt: u.createdAt.toISOString() })),
    invites: invites.map((i) => ({ email: i.email, role: i.role, createdAt: i.createdAt.toISOString() })),
  };
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  const by = await requirePermission(request, "manage:users");
  const values = formObject(await request.formData());
  const intent = values.intent;
  if (intent === "invite") {
    const parsed = inviteSchema.safeParse(values);
    if (!parsed.success) return data({ intent, ok: false, message: "", errors: fieldErrors(parsed.error) }, { status: 400 });
    const res = await inviteUser({ ...parsed.data, by, request });
    return data({ intent, ok: res.ok, message: res.message, errors: !res.ok && res.field ? { [res.field]: res.message } : {} }, { status: res.ok ? 200 : 400 });
  }
  if (intent === "role") {
    const parsed = roleChangeSchema.safeParse(values);
    if (!parsed.success) return data({ intent, ok: false, message: "Pick one of the four roles", errors: {} }, { status: 400 });
    const res = await changeRole({ ...parsed.data, by, request });
    return data({ intent, ok: res.ok, message: res.message, errors: {} }, { status: res.ok ? 200 : 400 });
  }
  if (intent === "suspend" || intent === "restore") {
    const res = await setBanned({ userId: values.userId ?? "", banned: intent === "suspend", by, request });
    return data({ intent, ok: res.ok, message: res.message, errors: {} }, { status: res.ok ? 200 : 400 });
  }
  if (intent === "revoke-key") {
    const ok = await revokeApiKey({ id: values.keyId ?? "", actor: by, asAdmin: true, request });
    return data({ intent, ok, message: ok ? "The key is revoked." : "That key does not exist or is revoked already.", errors: {} }, { status: ok ? 200 : 404 });
  }
  return data({ intent, ok: false, message: `Unknown request "${intent ?? ""}"`, errors: {} }, { status: 400 });
});

export default function AdminUsers({ loaderData }: Route.ComponentProps) {
  const { users, invites, meId, keys } = loaderData;
  const result = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const errors: Record<string, string | undefined> = result?.errors ?? {};
  return (
    <section>
      <h1 className="text-3xl font-semibold tracking-tight">People and roles</h1>
      <p className="mt-1 text-ink-soft">Admins manage accounts; engineers produce runs; checkers review them; viewers read.</p>
      {result?.message && (
        <p role={result.ok ? "status" : "alert"} className={`mt-4 rounded-md px-3 py-2 text-sm ${result.ok ? "bg-ok-wash text-ok" : "bg-bad-wash text-bad"}`}>
          {result.message}
        </p>
      )}
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_20rem]">
        {/* below md each account is a stacked block (name, e-mail, role, state), so a phone
            reads it without scrolling sideways; from md up it is a plain table */}
        <div className="card min-w-0 p-0 md:overflow-x-auto" data-testid="accounts">
          <table className="data-table block md:table">
            <caption className="sr-only">Accounts</caption>
            <thead className="hidden md:table-header-group">
              <tr><th scope="col">Name</th><th scope="col">E-mail</th><th scope="col">Role</th><th scope="col">State</th></tr>
            </thead>
            <tbody className="block md:table-row-group">
              {users.map((u) => (
                <tr key={u.id} className="block border-b border-rule/70 px-1 py-2 last:border-b-0 md:table-row md:p-0" data-testid="account-row">
                  <td className="block border-b-0 py-0.5 font-medium md:table-cell md:border-b md:py-1.5 md:font-normal">{u.name}</td>
                  <td className="block break-all border-b-0 py-0.5 font-mono text-xs md:table-cell md:border-b md:py-1.5 md:break-normal">{u.email}</td>
                  <td className="block border-b-0 py-1 md:table-cell md:border-b md:py-1.5">
                    {u.id === meId ? (
                      <span>{ROLE_LABELS[u.role as keyof typeof ROLE_LABELS] ?? u.role} (you)</span>
                    ) : (
                      <Form method="post" className="flex items-center gap-2">
                        <input type="hidden" name="intent" value="role" />
                        <input type="hidden" name="userId" value={u.id} />
                        <label className="sr-only" htmlFor={`role-${u.id}`}>Role of {u.email}</label>
                        <select id={`role-${u.id}`} name="role" defaultValue={u.role} className="field-input w-32 py-1">
                          {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
                        </select>
                        <button type="submit" className="btn btn-secondary px-2 py-1" disabled={busy}>Save</button>
                      </Form>
                    )}
                  </td>
                  <td className="block border-b-0 py-1 md:table-cell md:border-b md:py-1.5">
                    {u.id !== meId && (
                      <Form method="post" className="inline">
                        <input type="hidden" name="userId" value={u.id} />
                        <button type="submit" name="intent" value={u.banned ? "restore" : "suspend"} className={`btn px-2 py-1 ${u.banned ? "btn-secondary" : "btn-danger"}`} disabled={busy}>
                          {u.banned ? "Restore" : "Suspend"}
                        </button>
                      </Form>
                    )}
                    {u.banned && <span className="ml-2 text-xs text-bad">suspended</span>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <div className="space-y-6">
          <Form method="post" className="card space-y-4" noValidate aria-labelledby="invite-title">
            <h2 id="invite-title" className="text-lg font-semibold">Invite someone</h2>
            <input type="hidden" name="intent" value="invite" />
            <TextField label="E-mail" name="email" type="email" error={errors.email} required />
            <div>
              <label htmlFor="invite-role" className="field-label">Role</label>
              <select id="invite-role" name="role" defaultValue="engineer" className="field-input">
                {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
              </select>
              {errors.role && <p className="field-error">{errors.role}</p>}
            </div>
            <button type="submit" className="btn btn-primary" disabled={busy}>Invite</button>
          </Form>
          <div className="card">
            <h2 className="text-lg font-semibold">API keys in use</h2>
            {keys.length === 0 ? (
              <p className="mt-2 text-sm text-ink-muted">No live keys.</p>
            ) : (
              <ul className="mt-2 space-y-2 text-sm">
                {keys.map((k) => (
                  <li key={k.id} className="flex items-center justify-between gap-2">
                    <span>
                      <span className="font-mono text-xs">{k.prefix}…</span> {k.name}
                      <span className="block text-xs text-ink-muted">{k.ownerEmail} · used {k.lastUsedAt ? k.lastUsedAt.slice(0, 10) : "never"}</span>
                    </span>
                    <Form method="post">
                      <input type="hidden" name="keyId" value={k.id} />
                      <button type="submit" name="intent" value="revoke-key" className="btn btn-danger px-2 py-1" disabled={busy} aria-label={`Revoke key ${k.name} of ${k.ownerEmail}`}>Revoke</button>
                    </Form>
                  </li>
                ))}
              </ul>
            )}
          </div>
          {invites.length > 0 && (
            <div className="card">
              <h2 className="text-lg font-semibold">Open invitations</h2>
              <ul className="mt-2 space-y-1 text-sm">
                {invites.map((i) => <li key={i.email}><span className="font-mono text-xs">{i.email}</span> — {i.role}</li>)}
              </ul>
            </div>
          )}
        </div>
      </div>
    </section>
  );
}

// errors render inside the shell, so the navigation stays
export function ErrorBoundary() {
  return <RouteError what="list of people" />;
}
