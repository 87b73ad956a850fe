// E-mail notifications of the job workflow (product.md, step 6): the submitter hears when a
// job ends and when a checker decides; checkers hear when a review is waiting. Each mail has
// plain text and a simple HTML part, and a link to the job page. The *Mails functions compose
// outbox rows (mail/outbox.server.ts) for a change about to be recorded, described by `end`;
// the caller stores them in the same batch as the change (jobs/outcome.server.ts,
// auth/reviews.server.ts): both are stored or neither. The outbox sender in the worker
// delivers them (mail/sender.server.ts). The queue* functions do the same for a change
// already recorded.
import { and, eq, ne } from "drizzle-orm";
import type { DbExecutor } from "~/db/client.server";
import { reviews, user } from "~/db/schema";
import { config } from "~/lib/config.server";
import { loadJobWithModel } from "~/lib/job-with-model.server";
import type { Mail } from "~/lib/mail.server";
import { enqueueMail, type OutboxMail } from "~/lib/mail/outbox.server";
import { formatDateTime, formatNumber, quantityFormatter } from "~/lib/format";
import { memberOfJobProject } from "~/lib/project-scope.server";
import { OUTCOMES_WITHOUT_REVIEW } from "~/lib/review-request";
import { jobState, TONE_COLORS, type JobState } from "~/lib/job-state";

/** How a job is about to end, when its mail is composed before the row says so. */
export interface JobEnd {
  status: "succeeded" | "failed" | "cancelled";
  outcome?: string | null;
  error?: string | null;
  summary?: unknown;
}

interface JobFacts {
  id: string;
  status: string;
  outcome: string | null;
  error: string | null;
  /** a cancelled run whose best design was kept */
  hasResult: boolean;
  modelName: string;
  projectCode: string;
  projectName: string;
  submitter: { id: string; name: string; email: string } | null;
  summary: { objectiveKind?: string; objectiveInitial?: number; objectiveFinal?: number; iterations?: number } | null;
  /** the model's declared units (its stored summary), for the objective's unit */
  units: { length: string; force: string; mass: string } | null;
}

async function jobFacts(database: DbExecutor, jobId: string, end?: JobEnd): Promise<JobFacts | null> {
  const r = await loadJobWithModel(jobId, database);
  if (!r) return null;
  const job = end ? { ...r.job, status: end.status, outcome: end.outcome ?? null, error: end.error ?? null, summary: end.summary ?? null } : r.job;
  return {
    id: job.id,
    status: job.status,
    outcome: job.outcome,
    error: job.error,
    hasResult: r.job.resultKey !== null,
    modelName: r.model.name,
    projectCode: r.project.code,
    projectName: r.project.name,
    submitter: r.submitter,
    summary: (job.summary as JobFacts["summary"]) ?? null,
    units: (r.model.summary as { units?: JobFacts["units"] } | null)?.units ?? null,
  };
}

/** " · job 1a2b3c4d": a study queues many runs of one model, so subjects tell them apart. */
function jobTag(jobId: string): string {
  return ` · job ${jobId.slice(0, 8)}`;
}

export function jobLink(jobId: string): string {
  return `${config().APP_URL.replace(/\/+$/, "")}/jobs/${encodeURIComponent(jobId)}`;
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

const OUTCOME_WORDS: Record<string, string> = {
  optimal: "an optimum was found",
  "not-converged": "the solver stopped before converging",
  infeasible: "no design meets every limit",
  failed: "the solver failed",
  analysed: "the analysis is done",
};

/** A mail with a greeting, paragraphs, a key/value list and the job link; text and HTML agree. */
export function composeMail(opts: {
  to: string | string[];
  subject: string;
  greeting: string;
  paragraphs: string[];
  facts: [string, string][];
  link: string;
  linkLabel: string;
  /** the job's state in the one sentence and colour of the pages and the PDF (job-state.ts) */
  state?: JobState;
}): Mail {
  const factText = opts.facts.map(([k, v]) => `  ${k}: ${v}`).join("\n");
  const tone = opts.state ? TONE_COLORS[opts.state.tone] : null;
  const text = [
    opts.greeting,
    "",
    ...(opts.state ? [`State: ${opts.state.sentence}`, ""] : []),
    ...opts.paragraphs.flatMap((p) => [p, ""]),
    factText,
    "",
    `${opts.linkLabel}: ${opts.link}`,
    "",
    "— Strutwise desk",
  ].join("\n");
  const html = [
    `<div style="font-family:'IBM Plex Sans',Arial,sans-serif;color:#16202c;font-size:14px;line-height:1.5">`,
    `<p>${escapeHtml(opts.greeting)}</p>`,
    ...(opts.state && tone
      ? [`<p><span style="display:inline-block;padding:2px 10px;border-radius:999px;background:${tone.wash};color:${tone.ink};font-weight:600">${escapeHtml(`${opts.state.mark} ${opts.state.sentence}`)}</span></p>`]
      : []),
    ...opts.paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
    `<table style="border-collapse:collapse;margin:8px 0">`,
    ...opts.facts.map(
      ([k, v]) =>
        `<tr><td style="padding:2px 12px 2px 0;color:#6b7683">${escapeHtml(k)}</td><td style="padding:2px 0">${escapeHtml(v)}</td></tr>`,
    ),
    `</table>`,
    `<p><a href="${escapeHtml(opts.link)}" style="color:#9c6314">${escapeHtml(opts.linkLabel)}</a></p>`,
    `<p style="color:#6b7683;font-size:12px">Strutwise desk. Results are a design aid, not a design.</p>`,
    `</div>`,
  ].join("\n");
  return { to: opts.to, subject: opts.subject, text, html };
}

function jobFactRows(j: JobFacts): [string, string][] {
  return [
    ["Project", `${j.projectCode} ${j.projectName}`],
    ["Model", j.modelName],
    ["Job", j.id],
  ];
}

/** A composed mail as an outbox row about a job. */
function outboxMail(kind: string, dedupeKey: string, mail: Mail & { to: string }, jobId: string): OutboxMail {
  return { kind, dedupeKey, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html, entity: { type: "job", id: jobId } };
}

async function enqueueAll(database: DbExecutor, mails: OutboxMail[]): Promise<void> {
  for (const m of mails) await enqueueMail(database, m);
}

function warn(line: string): [] {
  console.warn(line);
  return [];
}

/** Why a finished run asks no checker for review, in the submitter's words. */
function noReviewReason(outcome: string): string {
  if (outcome === "infeasible") return "No checker was asked to review it: no design within the bounds meets every limit. The job page says what to try.";
  if (outcome === "not-converged") return "No checker was asked to review it: the best design found does not meet every limit. The job page says what to try.";
  return "No checker was asked to review it: the run produced no design to sign off.";
}

/**
 * To the submitter: the job finished (with its solver outcome), failed or was cancelled.
 * `reviewRequested` says whether checkers were asked to review the run (the queue decides it
 * from the result, see review-request.ts); without it, every outcome but infeasible or failed
 * counts as asked.
 */
export async function jobFinishedMails(database: DbExecutor, jobId: string, opts: { reviewRequested?: boolean; end?: JobEnd } = {}): Promise<OutboxMail[]> {
  const j = await jobFacts(database, jobId, opts.end);
  if (!j) throw new Error(`job ${jobId} does not exist`);
  if (!j.submitter) return warn(`[notify] job ${jobId} has no submitter to tell`);
  if (j.status !== "succeeded" && j.status !== "failed" && j.status !== "cancelled") return warn(`[notify] job ${jobId} is still ${j.status}; no finished mail sent`);
  const facts = jobFactRows(j);
  const state = jobState({ status: j.status, outcome: j.status === "succeeded" ? (j.outcome ?? "optimal") : j.outcome, hasResult: j.hasResult });
  // the subject leads with the state sentence every list and the PDF show
  const subject = `Job ${state.sentence}: ${j.modelName}${jobTag(j.id)}`;
  let paragraphs: string[];
  if (j.status === "succeeded") {
    const outcome = j.outcome ?? "optimal";
    paragraphs = [`Your optimization run of "${j.modelName}" has finished: ${OUTCOME_WORDS[outcome] ?? outcome}.`];
    const s = j.summary;
    if (s) {
      const kind = s.objectiveKind === "compliance" ? "compliance" : "mass";
      const unit = j.units ? `, ${quantityFormatter(j.units).unit(kind)}` : "";
      facts.push([`Objective (${kind}${unit})`, `${formatNumber(s.objectiveInitial)} → ${formatNumber(s.objectiveFinal)}`]);
      if (s.iterations !== undefined) facts.push(["Iterations", String(s.iterations)]);
    }
    const asked = (opts.reviewRequested ?? true) && !OUTCOMES_WITHOUT_REVIEW.includes(outcome);
    paragraphs.push(asked ? "A checker still has to review it before the report is approved." : noReviewReason(outcome));
  } else if (j.status === "failed") {
    paragraphs = [`Your optimization run of "${j.modelName}" failed.`, j.error ? `Reason: ${j.error}` : "No reason was recorded."];
  } else {
    paragraphs = [`Your optimization run of "${j.modelName}" was stopped before it finished${j.hasResult ? "; the best design found so far is kept on the job page" : ""}.`];
  }
  const mail = composeMail({
    to: j.submitter.email,
    subject,
    greeting: `Hello ${j.submitter.name || j.submitter.email},`,
    paragraphs,
    facts,
    link: jobLink(j.id),
    linkLabel: "Open the job",
    state,
  });
  return [outboxMail("job-finished", `job-finished:${j.id}`, { ...mail, to: j.submitter.email }, j.id)];
}

export async function queueJobFinishedMail(database: DbExecutor, jobId: string, opts: { reviewRequested?: boolean } = {}): Promise<void> {
  await enqueueAll(database, await jobFinishedMails(database, jobId, opts));
}

/**
 * To every checker except the submitter (four-eyes rule): a finished job waits for review.
 * The caller decides that the design is worth reviewing (review-request.ts); a job that did
 * not succeed, or whose outcome leaves nothing to sign off, is refused here all the same.
 */
export async function reviewWaitingMails(database: DbExecutor, jobId: string, end?: JobEnd): Promise<OutboxMail[]> {
  const j = await jobFacts(database, jobId, end);
  if (!j) throw new Error(`job ${jobId} does not exist`);
  if (j.status !== "succeeded" || OUTCOMES_WITHOUT_REVIEW.includes(j.outcome ?? ""))
    return warn(`[notify] job ${jobId} is ${j.status}${j.outcome ? ` (${j.outcome})` : ""}: nothing for a checker to review, no review mail sent`);
  const checkers = await database
    .select({ email: user.email, name: user.name, banned: user.banned })
    .from(user)
    // only checkers of the job's project hear of it (issue 14: nothing outside one's projects)
    .where(and(eq(user.role, "checker"), memberOfJobProject(user.id, jobId), j.submitter ? ne(user.id, j.submitter.id) : undefined));
  const to = checkers.filter((c) => !c.banned).map((c) => c.email);
  if (to.length === 0) return warn(`[notify] no checker to tell about job ${jobId}`);
  const by = j.submitter ? j.submitter.name || j.submitter.email : "an engineer";
  // one mail per checker: nobody sees the other recipients, and one bad address does not
  // hold back the rest
  const mails: OutboxMail[] = [];
  for (const email of to) {
    const mail = composeMail({
      to: email,
      subject: `Review waiting: ${j.modelName}${jobTag(j.id)}`,
      greeting: "Hello,",
      paragraphs: [
        `${by} has finished an optimization run of "${j.modelName}" and it is waiting for an independent check.`,
        "Approve it, or return it with comments, from the job page.",
      ],
      facts: [...jobFactRows(j), ["Submitted by", by]],
      link: jobLink(j.id),
      linkLabel: "Review the job",
      state: jobState({ status: j.status, outcome: j.outcome }),
    });
    mails.push(outboxMail("review-waiting", `review-waiting:${j.id}:${email.toLowerCase()}`, { ...mail, to: email }, j.id));
  }
  return mails;
}

export async function queueReviewWaitingMails(database: DbExecutor, jobId: string): Promise<void> {
  await enqueueAll(database, await reviewWaitingMails(database, jobId));
}

export interface DecisionFacts {
  id: string;
  jobId: string;
  reviewerId: string;
  decision: "approved" | "changes-requested";
  comment: string;
  createdAt: Date;
}

/** To the submitter: a checker approved the job or asked for changes (the review as it is recorded). */
export async function decisionMails(database: DbExecutor, review: DecisionFacts): Promise<OutboxMail[]> {
  const [who] = await database.select({ name: user.name, email: user.email }).from(user).where(eq(user.id, review.reviewerId)).limit(1);
  if (!who) throw new Error(`reviewer ${review.reviewerId} of review ${review.id} does not exist`);
  const r = { ...review, reviewerName: who.name, reviewerEmail: who.email };
  const reviewId = review.id;
  const j = await jobFacts(database, r.jobId);
  if (!j) throw new Error(`job ${r.jobId} of review ${reviewId} does not exist`);
  if (!j.submitter) return warn(`[notify] job ${j.id} has no submitter to tell`);
  const reviewer = r.reviewerName || r.reviewerEmail;
  const approved = r.decision === "approved";
  const mail = composeMail({
    to: j.submitter.email,
    subject: `${approved ? "Approved" : "Changes requested"}: ${j.modelName}${jobTag(j.id)}`,
    greeting: `Hello ${j.submitter.name || j.submitter.email},`,
    paragraphs: [
      approved
        ? `${reviewer} has checked and approved your optimization run of "${j.modelName}". The report now carries the approval.`
        : `${reviewer} has checked your optimization run of "${j.modelName}" and requests changes.`,
      `Comment: ${r.comment || "(none)"}`,
    ],
    facts: [...jobFactRows(j), ["Checked by", reviewer], ["Decided", formatDateTime(r.createdAt)]],
    link: jobLink(j.id),
    linkLabel: "Open the job",
  });
  return [outboxMail("decision", `decision:${reviewId}`, { ...mail, to: j.submitter.email }, j.id)];
}

/** decisionMails of a recorded review, queued. */
export async function queueDecisionMail(database: DbExecutor, reviewId: string): Promise<void> {
  const [r] = await database.select().from(reviews).where(eq(reviews.id, reviewId)).limit(1);
  if (!r) throw new Error(`review ${reviewId} does not exist`);
  if (r.decision === "reopened") return; // an admin's reopening is in the audit trail, not a checker's decision
  await enqueueAll(database, await decisionMails(database, { ...r, decision: r.decision }));
}
