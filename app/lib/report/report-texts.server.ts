// The stored texts a report is drawn from, read from the bucket: on a report thread when a
// report is downloaded (workers/web-task.ts), in process for tests and small uses.
import { getText } from "~/lib/storage.server";
import { ReportError, type ReportInputs } from "./report-inputs";

/** The stored result and model file as text; a ReportError when the result is gone. */
export async function readReportTexts(jobId: string, resultKey: string, modelKey: string): Promise<Pick<ReportInputs, "resultText" | "modelText">> {
  const resultText = await getText(resultKey);
  if (resultText === null) throw new ReportError(500, `The stored result of job ${jobId} is missing from the bucket (${resultKey})`);
  // without the model file the report still says what it can
  const modelText = await getText(modelKey).catch(() => null);
  return { resultText, modelText };
}
