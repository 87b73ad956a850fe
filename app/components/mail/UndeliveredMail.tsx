// Mail the outbox has not delivered yet, each with why: shown on the development inbox and
// the admin mail page. "Pending" mail is still being tried (with growing pauses); "refused"
// mail was turned down by the mail server for good and is not tried again.
import { Link } from "react-router";
import type { OutboxRow } from "~/lib/mail/outbox.server";

const when = (iso: string | null) => (iso ? `${iso.replace("T", " ").slice(0, 19)} UTC` : "—");

export function UndeliveredMail({ rows }: { rows: OutboxRow[] }) {
  if (rows.length === 0) return <p className="text-ink-muted">Every queued mail has been delivered.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="data-table" aria-label="Undelivered mail">
        <caption className="sr-only">Mail not delivered yet, newest first</caption>
        <thead>
          <tr>
            <th scope="col">Queued</th>
            <th scope="col">To</th>
            <th scope="col">Subject</th>
            <th scope="col">State</th>
            <th scope="col">Tries</th>
            <th scope="col">Why not delivered</th>
            <th scope="col">Next try</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((m) => (
            <tr key={m.id}>
              <td className="whitespace-nowrap font-mono text-xs">{when(m.createdAt)}</td>
              <td className="font-mono text-xs">{m.to}</td>
              <td className="text-sm">
                {m.entity?.type === "job" ? <Link to={`/jobs/${encodeURIComponent(m.entity.id)}`} className="text-brass-strong underline">{m.subject}</Link> : m.subject}
              </td>
              <td className="text-sm">{m.state === "failed" ? "refused, not retried" : "pending, retried"}</td>
              <td className="font-mono text-xs">{m.attempts}</td>
              <td className="max-w-md text-xs">{m.lastError ?? (m.attempts === 0 ? "not tried yet" : "—")}</td>
              <td className="whitespace-nowrap font-mono text-xs">{when(m.nextAttemptAt)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
