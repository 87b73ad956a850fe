// The report's inputs as the web process hands them to a report thread: the rows it read
// (plain values) and the stored result and model file as text. Parsing and checking the texts
// happens on the thread too, so a large result is never parsed on the web server's own thread.
// Pure: no database or bucket access.
import type { TrussResult } from "~/engine/design/result-types";
import type { ModelFile, ReportData } from "./report-data";

export class ReportError extends Error {
  constructor(
    readonly status: 404 | 409 | 500,
    message: string,
  ) {
    super(message);
    this.name = "ReportError";
  }
}

export interface ReportInputs {
  meta: Omit<ReportData, "result" | "model"> & { model: Omit<ReportData["model"], "file"> };
  resultText: string;
  modelText: string | null;
}

/**
 * What the web process hands a report thread: the rows, and where the stored texts are. The
 * thread reads them from the bucket itself, so megabytes of result never pass the request
 * thread.
 */
export interface ReportSources {
  meta: ReportInputs["meta"];
  resultKey: string;
  modelKey: string;
}

/** ReportData from the texts; a ReportError (500) when the stored result is not readable. */
export function reportDataFromInputs(input: ReportInputs): ReportData {
  const jobId = input.meta.job.id;
  let result: TrussResult;
  try {
    result = JSON.parse(input.resultText) as TrussResult;
  } catch {
    throw new ReportError(500, `The stored result of job ${jobId} is not valid JSON`);
  }
  if (result.format !== "strutwise.result" || !Array.isArray(result.members) || !Array.isArray(result.nodes))
    throw new ReportError(500, `The stored result of job ${jobId} is not a Strutwise result file`);
  // the model file adds connectivity, supports and the design block; the report still says
  // what it can without it
  let file: ModelFile | null = null;
  if (input.modelText) {
    try {
      file = JSON.parse(input.modelText) as ModelFile;
    } catch {
      file = null;
    }
  }
  return { ...input.meta, model: { ...input.meta.model, file }, result };
}
