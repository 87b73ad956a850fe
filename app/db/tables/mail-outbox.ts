// The mail outbox: every notification is a row here, written in the same transaction as the
// state change that causes it (a job recorded, a review decided, an invitation made). A sender
// in the queue worker delivers the rows (app/lib/mail/sender.server.ts); a row is marked sent
// once, by the sender that holds its claim. `dedupe_key` names the event and the recipient, so
// the same notification is never queued twice, whoever records the event.
import { sql } from "drizzle-orm";
import { index, integer, sqliteTable, text } from "drizzle-orm/sqlite-core";

export const MAIL_STATES = ["pending", "sent", "failed"] as const;
export type MailState = (typeof MAIL_STATES)[number];

export const mailOutbox = sqliteTable(
  "mail_outbox",
  {
    id: text("id").primaryKey(),
    /** e.g. "job-finished:<jobId>", "review-waiting:<jobId>:<email>", "decision:<reviewId>" */
    dedupeKey: text("dedupe_key").notNull().unique(),
    /** job-finished, review-waiting, decision, invitation, verification, password-reset… */
    kind: text("kind").notNull(),
    recipient: text("recipient").notNull(),
    subject: text("subject").notNull(),
    textBody: text("text_body").notNull(),
    htmlBody: text("html_body"),
    /** what the mail is about, for the admin page: "job", "review", "user"… */
    entityType: text("entity_type"),
    entityId: text("entity_id"),
    state: text("state", { enum: MAIL_STATES }).notNull().default("pending"),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: integer("next_attempt_at", { mode: "timestamp_ms" }).notNull(),
    /** the sender holding the row while it talks to the SMTP server, and until when */
    claimedBy: text("claimed_by"),
    claimExpiresAt: integer("claim_expires_at", { mode: "timestamp_ms" }),
    /** the last delivery failure in words (SMTP reply or network error) */
    lastError: text("last_error"),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    createdAt: integer("created_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`),
  },
  (t) => [index("mail_outbox_due_idx").on(t.state, t.nextAttemptAt), index("mail_outbox_entity_idx").on(t.entityType, t.entityId)],
);
