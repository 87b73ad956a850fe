// Delivers the mail outbox (outbox.server.ts). Runs inside each queue worker; any number of
// senders may run. A sender claims a due row with a lease (one guarded UPDATE), hands it to
// the SMTP server, then marks it sent with an UPDATE that only a still-pending row matches:
// a row is marked sent exactly once. A sender killed between the SMTP server's "accepted" and
// that mark leaves the row claimed; after the claim runs out another sender delivers it again
// with the same Message-ID, which lets mail clients drop the copy (at least once, de-duplicated).
// Connection failures and 4xx replies are retried with backoff and jitter without end; a 5xx
// refusal of the message or recipient is final and shown with its reason on the admin pages.
import { and, asc, eq, inArray, isNull, lt, lte, or } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { mailOutbox } from "~/db/schema";
import { config } from "~/lib/config.server";
import { sendMail } from "~/lib/mail.server";
import { backoffDelay, sleep, type Backoff } from "./backoff";

export interface SenderOptions {
  db: Db;
  senderId: string;
  /** how long a claimed row is held before another sender may take it */
  claimMs?: number;
  /** how often an idle sender looks for due mail */
  pollMs?: number;
  /** rows per claim */
  batch?: number;
  backoff?: Backoff;
  log?: (line: string) => void;
}

type OutboxRecord = typeof mailOutbox.$inferSelect;

export const MAIL_BACKOFF: Backoff = { baseMs: 1000, capMs: 15_000 };

/** A failure the SMTP server will not change its mind about: a 5xx refusal of this message. */
export function isPermanentMailError(e: unknown): boolean {
  const err = e as { responseCode?: number; code?: string };
  return typeof err.responseCode === "number" && err.responseCode >= 500 && err.responseCode < 600 && (err.code === "EENVELOPE" || err.code === "EMESSAGE");
}

export function describeMailError(e: unknown): string {
  const err = e as { message?: string; code?: string; responseCode?: number };
  const msg = (err.message ?? String(e)).replace(/\s+/g, " ").slice(0, 300);
  if (err.code === "ECONNECTION" || /ECONNREFUSED|ETIMEDOUT|ENOTFOUND|EHOSTUNREACH|ECONNRESET/.test(msg))
    return `The mail server could not be reached (${msg})`;
  return err.responseCode ? `The mail server answered ${err.responseCode}: ${msg}` : msg;
}

function messageId(row: OutboxRecord): string {
  const from = config().MAIL_FROM;
  const domain = /@([^>\s]+)/.exec(from)?.[1] ?? "strutwise.local";
  return `<outbox-${row.id}@${domain}>`;
}

export class MailSender {
  private stopping = false;
  private wake: (() => void) | null = null;
  private loopDone: Promise<void> | null = null;
  private readonly log: (line: string) => void;
  readonly stats = { sent: 0, retried: 0, failed: 0 };

  constructor(private readonly o: SenderOptions) {
    this.log = o.log ?? ((line) => console.log(`[mail ${o.senderId}] ${line}`));
  }

  start(): void {
    this.loopDone ??= this.loop();
  }

  /** Look for due mail now (after this process queued some). */
  kick(): void {
    this.wake?.();
  }

  /** Stop after the pass in progress; one last pass delivers what is due. */
  async stop(): Promise<void> {
    this.stopping = true;
    this.wake?.();
    await this.loopDone;
  }

  private async loop(): Promise<void> {
    for (;;) {
      try {
        while ((await this.deliverDue()) > 0 && !this.stopping);
      } catch (e) {
        // a busy or unreachable database: the rows wait, the next pass tries again
        this.log(`outbox access failed, retrying: ${(e as Error).message}`);
      }
      if (this.stopping) return;
      await new Promise<void>((resolve) => {
        const t = setTimeout(resolve, this.o.pollMs ?? 1000);
        this.wake = () => {
          clearTimeout(t);
          resolve();
        };
      });
      this.wake = null;
    }
  }

  /** One pass: claim the due rows, oldest first, and try each once. Returns the rows tried. */
  async deliverDue(now = Date.now()): Promise<number> {
    const rows = await this.claim(now);
    for (const row of rows) await this.deliver(row);
    return rows.length;
  }

  private async claim(now: number): Promise<OutboxRecord[]> {
    const { db } = this.o;
    const nowDate = new Date(now);
    const due = and(
      eq(mailOutbox.state, "pending"),
      lte(mailOutbox.nextAttemptAt, nowDate),
      or(isNull(mailOutbox.claimExpiresAt), lt(mailOutbox.claimExpiresAt, nowDate)),
    );
    const next = db
      .select({ id: mailOutbox.id })
      .from(mailOutbox)
      .where(due)
      .orderBy(asc(mailOutbox.createdAt), asc(mailOutbox.id))
      .limit(this.o.batch ?? 20);
    const rows = await db
      .update(mailOutbox)
      .set({ claimedBy: this.o.senderId, claimExpiresAt: new Date(now + (this.o.claimMs ?? 120_000)) })
      .where(and(inArray(mailOutbox.id, next), due))
      .returning();
    return rows.sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id.localeCompare(b.id));
  }

  private async deliver(row: OutboxRecord): Promise<void> {
    const { db } = this.o;
    const mine = and(eq(mailOutbox.id, row.id), eq(mailOutbox.state, "pending"));
    try {
      await sendMail({ to: row.recipient, subject: row.subject, text: row.textBody, html: row.htmlBody ?? undefined, messageId: messageId(row) });
    } catch (e) {
      const attempts = row.attempts + 1;
      const reason = describeMailError(e);
      if (isPermanentMailError(e)) {
        this.stats.failed++;
        this.log(`mail ${row.id} (${row.kind} to ${row.recipient}) refused for good: ${reason}`);
        await retryDb(() => db.update(mailOutbox).set({ state: "failed", attempts, lastError: reason, claimedBy: null, claimExpiresAt: null }).where(mine));
        return;
      }
      this.stats.retried++;
      const delay = backoffDelay(attempts, this.o.backoff ?? MAIL_BACKOFF);
      if (attempts === 1 || attempts % 10 === 0) this.log(`mail ${row.id} (${row.kind}) not delivered, try ${attempts}; again in ${delay} ms: ${reason}`);
      await retryDb(() =>
        db
          .update(mailOutbox)
          .set({ attempts, lastError: reason, nextAttemptAt: new Date(Date.now() + delay), claimedBy: null, claimExpiresAt: null })
          .where(mine),
      );
      return;
    }
    // delivered: mark it, whatever happens to the database meanwhile (a mark lost here would
    // send the mail again once the claim runs out)
    await retryDb(
      () =>
        db
          .update(mailOutbox)
          .set({ state: "sent", sentAt: new Date(), attempts: row.attempts + 1, lastError: null, claimedBy: null, claimExpiresAt: null })
          .where(mine),
      20,
    );
    this.stats.sent++;
  }
}

async function retryDb<T>(fn: () => Promise<T>, tries = 8): Promise<T> {
  for (let i = 1; ; i++) {
    try {
      return await fn();
    } catch (e) {
      if (i >= tries) throw e;
      await sleep(backoffDelay(i, { baseMs: 100, capMs: 3000 }));
    }
  }
}
