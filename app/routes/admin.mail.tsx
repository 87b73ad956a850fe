// Admin: the mail outbox at a glance. How many mails were delivered, wait or were refused,
// and every undelivered one with the reason (mail/outbox.server.ts; the sender runs in the
// queue workers).
import { requirePermission } from "~/lib/auth/authorize.server";
import { db } from "~/db/client.server";
import { listUndeliveredMail, outboxCounts } from "~/lib/mail/outbox.server";
import { UndeliveredMail } from "~/components/mail/UndeliveredMail";
import { RouteError } from "~/components/ui/RouteError";
import type { Route } from "./+types/admin.mail";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Mail — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  // the delivery record is part of the trail: whoever may read the audit trail may read it
  await requirePermission(request, "read:audit");
  const [counts, undelivered] = await Promise.all([outboxCounts(db()), listUndeliveredMail(db())]);
  return { counts, undelivered };
});

export default function AdminMail({ loaderData }: Route.ComponentProps) {
  const { counts, undelivered } = loaderData;
  return (
    <section>
      <h1 className="text-3xl font-semibold tracking-tight">Mail</h1>
      <p className="mt-1 text-ink-soft">
        Every notification is queued with the change it reports and delivered by the queue workers, retried until the mail server takes it.
      </p>
      <dl className="card mt-6 flex flex-wrap gap-x-10 gap-y-2">
        <div>
          <dt className="field-label">Delivered</dt>
          <dd className="font-mono text-lg">{counts.sent}</dd>
        </div>
        <div>
          <dt className="field-label">Waiting to be delivered</dt>
          <dd className="font-mono text-lg">{counts.pending}</dd>
        </div>
        <div>
          <dt className="field-label">Refused by the mail server</dt>
          <dd className="font-mono text-lg">{counts.failed}</dd>
        </div>
      </dl>
      <h2 className="mt-8 text-xl font-semibold">Not delivered</h2>
      <div className="card mt-3 p-0">
        <UndeliveredMail rows={undelivered} />
      </div>
    </section>
  );
}

export function ErrorBoundary() {
  return <RouteError what="mail outbox" />;
}
