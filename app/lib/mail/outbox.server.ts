// Writing to the mail outbox and reading it back for the pages. A notification is stored with
// the change it reports: mailInsert(db, mail, onlyIf) is a statement for the same
// db.batch([...]) as the change (one transaction), so both are stored or neither; onlyIf lets
// the mail depend on the change having applied (a guarded UPDATE that matched). enqueueMail
// queues one at once, for a change that has no row of its own (a password reset link). The
// sender (sender.server.ts) delivers the rows.
import { randomUUID } from "node:crypto";
import { and, desc, eq, inArray, sql, type SQL } from "drizzle-orm";
import type { Db, DbExecutor } from "~/db/client.server";
import { mailOutbox, type MailState } from "~/db/schema";
import { plainText } from "~/lib/text-hygiene";

export interface OutboxMail {
  /**
   * The event and the recipient, unique over all mail ever queued: queuing the same key again
   * does nothing, so an event recorded twice (a retry, a second worker) still mails once.
   * Conventions: "job-finished:<jobId>", "review-waiting:<jobId>:<email>",
   * "decision:<reviewId>", "invitation:<invitationId>", "verification:<userId>:<token id>".
   */
  dedupeKey: string;
  kind: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
  entity?: { type: string; id: string };
}

function rowValues(mail: OutboxMail, now: number) {
  return {
    id: randomUUID(),
    dedupeKey: mail.dedupeKey,
    kind: mail.kind,
    recipient: mail.to,
    subject: plainText(mail.subject), // one line, no bidi controls (text-hygiene.ts)
    textBody: mail.text,
    htmlBody: mail.html ?? null,
    entityType: mail.entity?.type ?? null,
    entityId: mail.entity?.id ?? null,
    nextAttemptAt: new Date(now),
    createdAt: new Date(now),
  };
}

/** Queue one mail now; false when its dedupe key was queued before. */
export async function enqueueMail(database: DbExecutor, mail: OutboxMail, now = Date.now()): Promise<boolean> {
  const rows = await database
    .insert(mailOutbox)
    .values(rowValues(mail, now))
    .onConflictDoNothing({ target: mailOutbox.dedupeKey })
    .returning({ id: mailOutbox.id });
  return rows.length === 1;
}

/**
 * The statement that queues `mail`, for a db.batch with the change it reports. With `onlyIf`
 * (an SQL condition, read after the batch's earlier statements) the row is written only when
 * the condition holds. A dedupe key queued before writes nothing.
 */
export function mailInsert(database: Db, mail: OutboxMail, onlyIf?: SQL, now = Date.now()) {
  const v = rowValues(mail, now);
  if (!onlyIf) return database.insert(mailOutbox).values(v).onConflictDoNothing({ target: mailOutbox.dedupeKey });
  return database.run(sql`insert into ${mailOutbox} (id, dedupe_key, kind, recipient, subject, text_body, html_body, entity_type, entity_id, next_attempt_at, created_at)
    select ${v.id}, ${v.dedupeKey}, ${v.kind}, ${v.recipient}, ${v.subject}, ${v.textBody}, ${v.htmlBody}, ${v.entityType}, ${v.entityId}, ${now}, ${now}
    where ${onlyIf}
    on conflict (dedupe_key) do nothing`);
}

export interface OutboxRow {
  id: string;
  kind: string;
  to: string;
  subject: string;
  state: MailState;
  attempts: number;
  lastError: string | null;
  createdAt: string;
  nextAttemptAt: string | null;
  sentAt: string | null;
  entity: { type: string; id: string } | null;
}

function toRow(r: typeof mailOutbox.$inferSelect): OutboxRow {
  return {
    id: r.id,
    kind: r.kind,
    to: r.recipient,
    subject: r.subject,
    state: r.state,
    attempts: r.attempts,
    lastError: r.lastError,
    createdAt: r.createdAt.toISOString(),
    nextAttemptAt: r.state === "pending" ? r.nextAttemptAt.toISOString() : null,
    sentAt: r.sentAt ? r.sentAt.toISOString() : null,
    entity: r.entityType && r.entityId ? { type: r.entityType, id: r.entityId } : null,
  };
}

/** Mail not delivered yet (still being tried, or given up), newest first, with the reason. */
export async function listUndeliveredMail(database: DbExecutor, limit = 200): Promise<OutboxRow[]> {
  const rows = await database
    .select()
    .from(mailOutbox)
    .where(inArray(mailOutbox.state, ["pending", "failed"]))
    .orderBy(desc(mailOutbox.createdAt))
    .limit(limit);
  return rows.map(toRow);
}

/** Every queued mail about one thing (a job, a review…), oldest first. */
export async function listMailAbout(database: DbExecutor, entity: { type: string; id: string }): Promise<OutboxRow[]> {
  const rows = await database
    .select()
    .from(mailOutbox)
    .where(and(eq(mailOutbox.entityType, entity.type), eq(mailOutbox.entityId, entity.id)))
    .orderBy(mailOutbox.createdAt);
  return rows.map(toRow);
}

/** How many mails wait per state, for the health answer and the admin page. */
export async function outboxCounts(database: DbExecutor): Promise<Record<MailState, number>> {
  const rows = await database
    .select({ state: mailOutbox.state, n: sql<number>`count(*)` })
    .from(mailOutbox)
    .groupBy(mailOutbox.state);
  const counts: Record<MailState, number> = { pending: 0, sent: 0, failed: 0 };
  for (const r of rows) counts[r.state] = Number(r.n);
  return counts;
}
