// Tasks of the web process's thread pool (app/lib/web-pool.server.ts): the work a request
// may need that takes more than a few milliseconds of CPU. Each is a named export piscina
// calls by name. Errors come back as values: a class does not survive the trip between threads.
import { buildReportPdf } from "~/lib/report/document";
import { reportDataFromInputs, ReportError, type ReportInputs, type ReportSources } from "~/lib/report/report-inputs";
import { readReportTexts } from "~/lib/report/report-texts.server";
import { DependencyUnavailableError } from "~/lib/dependencies";
import { checkModelBytes, type GateResult } from "~/lib/models/model-gate";

export type ReportTaskOutput = { ok: true; bytes: Uint8Array } | { ok: false; status: 404 | 409 | 500 | 503; message: string };

/** Parse the stored result and model file and draw the calculation record. */
export async function renderReport(input: ReportInputs): Promise<ReportTaskOutput> {
  try {
    // the bytes are copied back to the web thread (a few MB at most: cheap next to drawing)
    return { ok: true, bytes: await buildReportPdf(reportDataFromInputs(input)) };
  } catch (e) {
    if (e instanceof ReportError) return { ok: false, status: e.status, message: e.message };
    console.error(`[report] job ${input.meta.job.id}: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    return { ok: false, status: 500, message: `The report of job ${input.meta.job.id} could not be drawn; the error is logged on the server` };
  }
}

/** The upload gate (decode, parse, validate) of a large model file. */
export function checkModel(input: { fileName: string; bytes: Uint8Array; limitBytes: number }): GateResult {
  return checkModelBytes(input.fileName, input.bytes, input.limitBytes);
}

/**
 * Read the stored result and model file from the bucket here, then draw: the request thread
 * only gathered the rows. A bucket that does not answer comes back as 503 with its reason.
 */
export async function renderStoredReport(input: ReportSources): Promise<ReportTaskOutput> {
  let texts: Pick<ReportInputs, "resultText" | "modelText">;
  try {
    texts = await readReportTexts(input.meta.job.id, input.resultKey, input.modelKey);
  } catch (e) {
    if (e instanceof ReportError) return { ok: false, status: e.status, message: e.message };
    if (e instanceof DependencyUnavailableError) return { ok: false, status: 503, message: e.reason };
    throw e;
  }
  return renderReport({ meta: input.meta, ...texts });
}
