// The development inbox: the messages the local mail catcher took in (local-services), read
// from its HTTP API at MAIL_CATCHER_URL. Who may look: admins always; any signed-in user only
// when NODE_ENV is "development", where the mail is all test traffic of the demo accounts.
import { forbidden, requireUser } from "~/lib/auth/authorize.server";
import { config } from "~/lib/config.server";
import { db } from "~/db/client.server";
import { listUndeliveredMail } from "~/lib/mail/outbox.server";
import { UndeliveredMail } from "~/components/mail/UndeliveredMail";
import type { CaughtMail } from "../../local-services/mail-catcher";
import type { Route } from "./+types/dev.inbox";
import { RouteError } from "~/components/ui/RouteError";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Development inbox — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const c = config();
  if (c.NODE_ENV !== "development" && user.role !== "admin")
    throw forbidden(`The development inbox is for admins outside development; your role is ${user.role}`);
  const undelivered = await listUndeliveredMail(db());
  return { ...(await caughtMail(c.MAIL_CATCHER_URL)), undelivered };
});

async function caughtMail(url: string | undefined) {
  const base = url?.replace(/\/+$/, "");
  if (!base) return { catcher: null, messages: [] as CaughtMail[], problem: "No mail catcher is configured (MAIL_CATCHER_URL is empty)." };
  try {
    const res = await fetch(`${base}/messages`, { signal: AbortSignal.timeout(3000) });
    if (!res.ok) return { catcher: base, messages: [] as CaughtMail[], problem: `The mail catcher at ${base} answered ${res.status}.` };
    const body = (await res.json()) as { messages?: CaughtMail[] };
    return { catcher: base, messages: (body.messages ?? []).slice(0, 200), problem: null };
  } catch (e) {
    const why = e instanceof Error ? e.message : String(e);
    return { catcher: base, messages: [] as CaughtMail[], problem: `The mail catcher at ${base} did not answer (${why}). Is \`npm run services\` running?` };
  }
}

/** Text with its URLs as links, so a job link in a mail opens the job. */
function Linked({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return (
    <>
      {parts.map((p, i) =>
        /^https?:\/\//.test(p) ? (
          <a key={i} href={p} className="text-brass-strong underline">
            {p}
          </a>
        ) : (
          <span key={i}>{p}</span>
        ),
      )}
    </>
  );
}

export default function DevInbox({ loaderData }: Route.ComponentProps) {
  const { catcher, messages, problem, undelivered } = loaderData;
  return (
    <section>
      <h1 className="text-3xl font-semibold tracking-tight">Development inbox</h1>
      <p className="mt-1 text-ink-soft">
        Mail the desk sent, as the local mail catcher received it{catcher ? ` (${catcher})` : ""}. Newest first; nothing here leaves this machine.
      </p>
      {undelivered.length > 0 ? (
        <div className="card mt-6 p-0" data-testid="undelivered-mail">
          <h2 className="px-5 pt-4 text-lg font-semibold">Not delivered yet ({undelivered.length})</h2>
          <UndeliveredMail rows={undelivered} />
        </div>
      ) : null}
      {problem ? (
        <p className="caution mt-6" role="status">
          {problem}
        </p>
      ) : messages.length === 0 ? (
        <p className="card mt-6 text-ink-muted">No mail yet. Finishing a job, a waiting review or a decision sends one.</p>
      ) : (
        <ul className="mt-6 space-y-3" aria-label="Messages">
          {messages.map((m) => (
            <li key={m.id} className="card p-0">
              <details>
                <summary className="flex cursor-pointer flex-wrap items-baseline gap-x-4 gap-y-1 px-5 py-3">
                  <span className="font-medium text-ink">{m.subject || "(no subject)"}</span>
                  <span className="text-sm text-ink-soft">to {m.to.join(", ")}</span>
                  <time className="ml-auto text-xs text-ink-muted" dateTime={m.receivedAt}>
                    {m.receivedAt.replace("T", " ").slice(0, 19)} UTC
                  </time>
                </summary>
                <div className="border-t border-rule px-5 py-4">
                  <p className="mb-2 text-xs text-ink-muted">from {m.from}</p>
                  <pre className="whitespace-pre-wrap font-sans text-sm text-ink">
                    <Linked text={m.text} />
                  </pre>
                  {m.html ? (
                    <details className="mt-3">
                      <summary className="cursor-pointer text-sm text-ink-soft">HTML part</summary>
                      <iframe title={`HTML part of ${m.subject}`} sandbox="" srcDoc={m.html} className="mt-2 h-72 w-full rounded border border-rule bg-paper-raised" />
                    </details>
                  ) : null}
                </div>
              </details>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

// errors render inside the shell, so the navigation stays
export function ErrorBoundary() {
  return <RouteError what="inbox" />;
}
