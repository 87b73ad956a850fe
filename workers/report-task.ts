// A piscina task in the web process's report pool (app/lib/report/pool.server.ts): parse the
// stored result and model file and draw the calculation record, off the request thread.
// Errors come back as values: a class does not survive the trip between threads.
import { buildReportPdf } from "~/lib/report/document";
import { reportDataFromInputs, ReportError, type ReportInputs } from "~/lib/report/report-inputs";

export type ReportTaskOutput = { ok: true; bytes: Uint8Array } | { ok: false; status: 404 | 409 | 500; message: string };

export default async function renderReportTask(input: ReportInputs): Promise<ReportTaskOutput> {
  try {
    // the bytes are copied back to the web thread (a few MB at most: cheap next to drawing)
    return { ok: true, bytes: await buildReportPdf(reportDataFromInputs(input)) };
  } catch (e) {
    if (e instanceof ReportError) return { ok: false, status: e.status, message: e.message };
    console.error(`[report] job ${input.meta.job.id}: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    return { ok: false, status: 500, message: `The report of job ${input.meta.job.id} could not be drawn; the error is logged on the server` };
  }
}
