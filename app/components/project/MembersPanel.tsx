// The members of a project: everyone sees who is in it; its creator and admins add people by
// e-mail and remove them (the project page's action, intents add-member / remove-member).
import { Form, useActionData, useNavigation } from "react-router";

export interface MemberRow {
  userId: string;
  name: string;
  email: string;
  role: string;
  creator: boolean;
}

export interface MembersActionData {
  members?: { ok: boolean; message: string };
}

export function MembersPanel({ members, mayManage }: { members: MemberRow[]; mayManage: boolean }) {
  const result = useActionData<MembersActionData>()?.members;
  const busy = useNavigation().state === "submitting";
  return (
    <section className="card min-w-0" aria-label="Members">
      <h2 className="mb-1 font-semibold">Members</h2>
      <p className="mb-3 text-sm text-ink-soft">
        Only members (and admins) see this project and everything in it. {mayManage ? "Add people by the e-mail address of their account." : "The project's creator or an admin adds and removes members."}
      </p>
      {result && (
        <p role={result.ok ? "status" : "alert"} className={`mb-3 rounded-md px-3 py-2 text-sm ${result.ok ? "bg-ok-wash text-ok" : "bg-bad-wash text-bad"}`}>
          {result.message}
        </p>
      )}
      <ul className="divide-y divide-rule">
        {members.map((m) => (
          <li key={m.userId} className="flex flex-wrap items-center gap-x-3 gap-y-1 py-2 text-sm">
            <span className="font-medium">{m.name || m.email}</span>
            <span className="font-mono text-xs text-ink-soft">{m.email}</span>
            <span className="text-ink-soft">{m.role}</span>
            {m.creator && <span className="text-ink-soft">created the project</span>}
            {mayManage && !m.creator && (
              <Form method="post" className="ml-auto">
                <input type="hidden" name="intent" value="remove-member" />
                <input type="hidden" name="userId" value={m.userId} />
                <button type="submit" className="btn btn-secondary" disabled={busy} aria-label={`Remove ${m.email}`}>
                  Remove
                </button>
              </Form>
            )}
          </li>
        ))}
      </ul>
      {mayManage && (
        <Form method="post" className="mt-3 flex flex-wrap items-end gap-2">
          <input type="hidden" name="intent" value="add-member" />
          <label className="min-w-0 flex-1">
            <span className="field-label">E-mail of the person to add</span>
            <input name="email" type="email" required className="field-input w-full" placeholder="name@firm.example" />
          </label>
          <button type="submit" className="btn btn-primary" disabled={busy}>
            Add member
          </button>
        </Form>
      )}
    </section>
  );
}
