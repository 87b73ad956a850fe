// Recording how a job ended together with the mails that tell people about it: the job's row
// and its outbox rows go in one db.batch (one transaction), so a worker killed a moment later
// loses neither. The mails are composed first from the end about to be recorded, and each is
// written only if the guarded write before it applied (this worker still held the job):
// a job's mails are queued once, by the worker that recorded it.
import { sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { jobs } from "~/db/schema";
import type { JobSummary } from "~/engine/design/result-types";
import { mailInsert, type OutboxMail } from "~/lib/mail/outbox.server";
import { jobFinishedMails, reviewWaitingMails, type JobEnd } from "~/lib/notify.server";
import { cancelAbandonedJobs, completeJobStatement, exhaustedJobs, exhaustedMessage, failExhaustedStatement, failJobStatement, recordedBy, type Lease } from "./claim.server";
import { appendAll } from "~/engine/util/extent";

export interface MailChoice {
  /** queue the mails at all (off in the benchmark) */
  notify: boolean;
}

/** The job succeeded; mail the submitter, and the checkers when `reviewRequested`. */
export async function recordSuccess(
  database: Db,
  lease: Lease,
  done: { resultKey: string; summary: JobSummary; outcome: JobSummary["status"] },
  mail: MailChoice & { reviewRequested: boolean },
): Promise<boolean> {
  const now = Date.now();
  const end: JobEnd = { status: "succeeded", outcome: done.outcome, summary: done.summary };
  const mails: OutboxMail[] = [];
  if (mail.notify) {
    appendAll(mails, await jobFinishedMails(database, lease.job.id, { reviewRequested: mail.reviewRequested, end }));
    if (mail.reviewRequested) appendAll(mails, await reviewWaitingMails(database, lease.job.id, end));
  }
  const onlyIf = recordedBy(lease, "succeeded", now);
  const [rows] = await database.batch([completeJobStatement(database, lease, done, now), ...mails.map((m) => mailInsert(database, m, onlyIf, now))]);
  return rows.length === 1;
}

/** The job failed for good; mail the submitter the reason. */
export async function recordFailure(database: Db, lease: Lease, message: string, mail: MailChoice): Promise<boolean> {
  const now = Date.now();
  const mails = mail.notify ? await jobFinishedMails(database, lease.job.id, { end: { status: "failed", error: message } }) : [];
  const onlyIf = recordedBy(lease, "failed", now);
  const [rows] = await database.batch([failJobStatement(database, lease, message, now), ...mails.map((m) => mailInsert(database, m, onlyIf, now))]);
  return rows.length === 1;
}

/**
 * Settle jobs whose worker vanished and that must not run again: cancel those with a pending
 * cancel request, fail those that used every attempt (each with its failure mail, in one batch).
 */
export async function settleAbandoned(database: Db, mail: MailChoice, now = Date.now()): Promise<{ cancelled: string[]; failed: string[] }> {
  const cancelled = await cancelAbandonedJobs(database, now);
  const failed: string[] = [];
  for (const j of await exhaustedJobs(database, now)) {
    const mails = mail.notify ? await jobFinishedMails(database, j.id, { end: { status: "failed", error: exhaustedMessage(j) } }) : [];
    const onlyIf = sql`exists (select 1 from ${jobs} where ${jobs.id} = ${j.id} and ${jobs.status} = 'failed' and ${jobs.finishedAt} = ${now})`;
    const [rows] = await database.batch([failExhaustedStatement(database, j, now), ...mails.map((m) => mailInsert(database, m, onlyIf, now))]);
    if (rows.length === 1) failed.push(j.id);
  }
  return { cancelled, failed };
}
