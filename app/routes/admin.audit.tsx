import { Form, Link, useSearchParams } from "react-router";
import { listAudit } from "~/lib/auth/audit.server";
import { requirePermission } from "~/lib/auth/authorize.server";
import type { Route } from "./+types/admin.audit";
import { RouteError } from "~/components/ui/RouteError";
import { withDependencies, badRequest } from "~/lib/http.server";

export function meta() {
  return [{ title: "Audit trail — Strutwise" }];
}

const PAGE = 100;

function day(value: string | null): Date | undefined {
  if (!value || !/^\d{4}-\d{2}-\d{2}$/.test(value)) return undefined;
  const d = new Date(`${value}T00:00:00Z`);
  return Number.isNaN(d.getTime()) ? undefined : d;
}

/** { from: "viewer", to: "checker" } → "from viewer · to checker", for reading at a glance. */
function describe(detail: unknown): string {
  if (!detail || typeof detail !== "object") return "";
  return Object.entries(detail as Record<string, unknown>)
    .filter(([, v]) => v !== undefined && v !== null && v !== "")
    .map(([k, v]) => `${k} ${typeof v === "object" ? JSON.stringify(v) : String(v)}`)
    .join(" · ");
}

/** The "older than" cursor: a positive whole entry id, or a 400 naming the parameter. */
function beforeId(raw: string | null): number | undefined {
  if (raw === null || raw === "") return undefined;
  const n = Number(raw);
  if (!Number.isSafeInteger(n) || n < 1) badRequest(`before must be a whole entry number from 1; got "${raw.slice(0, 40)}"`, [{ path: "before", message: "not an entry number" }]);
  return n;
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "read:audit");
  const sp = new URL(request.url).searchParams;
  const to = day(sp.get("to"));
  const rows = await listAudit({
    action: sp.get("action") || undefined,
    actor: sp.get("actor") || undefined,
    from: day(sp.get("from")),
    to: to ? new Date(to.getTime() + 86_400_000) : undefined, // the "to" day is included
    before: beforeId(sp.get("before")),
    limit: PAGE + 1,
  });
  const more = rows.length > PAGE;
  return {
    rows: rows.slice(0, PAGE).map((r) => ({ ...r, at: r.at.toISOString(), detail: describe(r.detail) })),
    nextBefore: more ? rows[PAGE - 1]!.id : null,
  };
});

export default function AdminAudit({ loaderData }: Route.ComponentProps) {
  const { rows, nextBefore } = loaderData;
  const [sp] = useSearchParams();
  const next = new URLSearchParams(sp);
  if (nextBefore) next.set("before", String(nextBefore));
  return (
    <section>
      <h1 className="text-3xl font-semibold tracking-tight">Audit trail</h1>
      <p className="mt-1 text-ink-soft">Every sign-in, upload, run, review, role change and API key, in the order it happened. Entries are never changed.</p>
      <Form method="get" className="card mt-6 flex flex-wrap items-end gap-4">
        <div>
          <label htmlFor="f-action" className="field-label">Action starts with</label>
          <input id="f-action" name="action" defaultValue={sp.get("action") ?? ""} placeholder="review, job.submit…" className="field-input w-48" />
        </div>
        <div>
          <label htmlFor="f-actor" className="field-label">Actor e-mail contains</label>
          <input id="f-actor" name="actor" defaultValue={sp.get("actor") ?? ""} className="field-input w-56" />
        </div>
        <div>
          <label htmlFor="f-from" className="field-label">From (UTC day)</label>
          <input id="f-from" name="from" type="date" defaultValue={sp.get("from") ?? ""} className="field-input" />
        </div>
        <div>
          <label htmlFor="f-to" className="field-label">To (UTC day)</label>
          <input id="f-to" name="to" type="date" defaultValue={sp.get("to") ?? ""} className="field-input" />
        </div>
        <button type="submit" className="btn btn-secondary">Filter</button>
        <Link to="/admin/audit" className="btn btn-secondary">Clear</Link>
      </Form>
      <div className="card mt-6 overflow-x-auto p-0">
        {rows.length === 0 ? (
          <p className="px-5 py-10 text-center text-ink-muted">No entries match these filters.</p>
        ) : (
          <table className="data-table">
            <caption className="sr-only">Audit entries, newest first</caption>
            <thead>
              <tr><th scope="col">When (UTC)</th><th scope="col">Actor</th><th scope="col">Action</th><th scope="col">Subject</th><th scope="col">Detail</th><th scope="col">Address</th></tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id}>
                  <td className="whitespace-nowrap font-mono text-xs">{r.at.replace("T", " ").slice(0, 19)}</td>
                  <td className="font-mono text-xs">{r.actorEmail ?? r.actorId ?? "—"}</td>
                  <td className="whitespace-nowrap font-mono text-xs">{r.action}</td>
                  <td className="font-mono text-xs">{r.entityType ? `${r.entityType} ${r.entityId ?? ""}` : "—"}</td>
                  <td className="max-w-md text-xs">{r.detail}</td>
                  <td className="font-mono text-xs">{r.ip ?? ""}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
      {nextBefore && <p className="mt-4"><Link to={`?${next}`} className="btn btn-secondary">Older entries</Link></p>}
    </section>
  );
}

// errors render inside the shell, so the navigation stays
export function ErrorBoundary() {
  return <RouteError what="audit trail" />;
}
