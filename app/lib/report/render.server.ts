// renderReport(jobId): the calculation record of a succeeded job, generated from the stored
// result and model file, and cached in the bucket under the job and its review state (the
// latest review id), so a new decision yields a new report and repeat downloads are free.
import { asc, eq, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { reviews, user } from "~/db/schema";
import { loadJobWithModel, type JobWithModel } from "~/lib/job-with-model.server";
import { getObject, putObject } from "~/lib/storage.server";
import { DependencyUnavailableError } from "~/lib/dependencies";
import { renderStoredReportOnThread } from "~/lib/web-pool.server";
import { getModelVersion } from "~/lib/models/versions.server";
import type { ReportData } from "./report-data";
import { ReportError, reportDataFromInputs, type ReportInputs, type ReportSources } from "./report-inputs";
import { readReportTexts } from "./report-texts.server";

export { ReportError };

// oldest first, as the job page lists them (reviews.server.ts): rowid, the insertion order,
// breaks ties between decisions of the same millisecond, so page and report agree on the latest
const REVIEW_ORDER = [asc(reviews.createdAt), asc(sql`"reviews"."rowid"`)] as const;

// Bump when the layout changes, so cached reports of the old layout are not served.
const LAYOUT_VERSION = 1;

/** The job's rows; 404 without such a job, 409 unless it succeeded. */
async function succeededJob(jobId: string): Promise<JobWithModel> {
  const row = await loadJobWithModel(jobId);
  if (!row) throw new ReportError(404, `Job ${jobId} not found`);
  if (row.job.status !== "succeeded") throw new ReportError(409, `Job ${jobId} is ${row.job.status}; a report exists only for a job that succeeded`);
  return row;
}

/** Everything the report shows, parsed here (tests, small reports); `row` when loaded already. */
export async function loadReportData(jobId: string, row?: JobWithModel): Promise<ReportData> {
  return reportDataFromInputs(await gatherReportInputs(jobId, row));
}

/** The rows and the stored texts a report is drawn from, unparsed (they may be large). */
export async function gatherReportInputs(jobId: string, row?: JobWithModel): Promise<ReportInputs> {
  const { meta, resultKey, modelKey } = await gatherReportSources(jobId, row);
  return { meta, ...(await readReportTexts(jobId, resultKey, modelKey)) };
}

/** The rows a report is drawn from, and the keys of its stored texts. */
export async function gatherReportSources(jobId: string, row?: JobWithModel): Promise<ReportSources> {
  const { job, model, project, submitter } = row ?? (await succeededJob(jobId));
  if (!job.resultKey) throw new ReportError(409, `Job ${jobId} succeeded but has no stored result`);
  // the file the job ran: a later version of the model may have moved nodes or changed loads
  const ran = job.modelVersion ? await getModelVersion(model.id, job.modelVersion) : null;

  const reviewRows = await db()
    .select({ review: reviews, name: user.name, email: user.email })
    .from(reviews)
    .innerJoin(user, eq(user.id, reviews.reviewerId))
    .where(eq(reviews.jobId, jobId))
    .orderBy(...REVIEW_ORDER);

  const meta: ReportSources["meta"] = {
    job: {
      id: job.id,
      status: job.status,
      options: (job.options as Record<string, unknown>) ?? {},
      createdAt: job.createdAt,
      startedAt: job.startedAt,
      finishedAt: job.finishedAt,
      submitter: submitter ? `${submitter.name || submitter.email} <${submitter.email}>` : null,
      attempts: job.attempts,
    },
    project: { code: project.code, name: project.name, client: project.client },
    model: { id: model.id, name: model.name, fileName: ran?.fileName ?? model.fileName, sha256: ran?.sha256 ?? model.sha256, sizeBytes: ran?.sizeBytes ?? model.sizeBytes, uploadedAt: ran?.createdAt ?? model.createdAt },
    reviews: reviewRows.map((r) => ({
      id: r.review.id,
      decision: r.review.decision,
      comment: r.review.comment,
      reviewer: r.name || r.email,
      at: r.review.createdAt,
    })),
    generatedAt: new Date(),
  };
  return { meta, resultKey: job.resultKey, modelKey: ran?.fileKey ?? model.fileKey };
}

export function reportCacheKey(jobId: string, latestReviewId: string | null): string {
  return `reports/${jobId}/v${LAYOUT_VERSION}-${latestReviewId ?? "not-reviewed"}.pdf`;
}

/** A download name: project code, model name and job id, in safe characters. */
export function reportFileName(projectCode: string, modelName: string, jobId: string): string {
  const slug = (s: string) =>
    s
      .normalize("NFKD")
      .replace(/[\u0300-\u036f]/g, "")
      .replace(/[^A-Za-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 60);
  return `${[slug(projectCode), slug(modelName), "job", slug(jobId)].filter(Boolean).join("-")}.pdf`;
}

export interface RenderedReport {
  bytes: Uint8Array;
  fileName: string;
  cacheKey: string;
  cached: boolean;
}

export async function renderReportFile(jobId: string): Promise<RenderedReport> {
  const latest = await db()
    .select({ id: reviews.id })
    .from(reviews)
    .where(eq(reviews.jobId, jobId))
    .orderBy(...REVIEW_ORDER);
  const latestId = latest.length ? latest[latest.length - 1]!.id : null;
  const key = reportCacheKey(jobId, latestId);
  const f = await succeededJob(jobId);
  const fileName = reportFileName(f.project.code, f.model.name, jobId);

  const hit = await getObject(key);
  if (hit && hit.byteLength > 0) return { bytes: hit, fileName, cacheKey: key, cached: true };

  const sources = await gatherReportSources(jobId, f);
  // read and drawn on a report thread: the web thread goes on answering other requests meanwhile
  const drawn = await renderStoredReportOnThread(sources);
  if (!drawn.ok) throw drawn.status === 503 ? new DependencyUnavailableError("storage", drawn.message) : new ReportError(drawn.status, drawn.message);
  const bytes = drawn.bytes;
  // a decision made while this report was being gathered is in it: file it under that state
  const storedKey = reportCacheKey(jobId, sources.meta.reviews[sources.meta.reviews.length - 1]?.id ?? null);
  try {
    await putObject(storedKey, bytes, "application/pdf");
  } catch (e) {
    // a full or unreachable bucket costs the cache, not the download
    console.error(`[report] could not cache the report of job ${jobId}: ${e instanceof Error ? e.message : String(e)}`);
  }
  return { bytes, fileName, cacheKey: storedKey, cached: false };
}

export async function renderReport(jobId: string): Promise<Uint8Array> {
  return (await renderReportFile(jobId)).bytes;
}
