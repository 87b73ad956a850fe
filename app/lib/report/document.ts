// Assembles the calculation record from gathered data; no database or bucket access here, so
// tests and the benchmark can build a report from a result alone.
import { constraintsSection } from "./constraints-section";
import { coverPage } from "./cover";
import { designSection } from "./design-section";
import { registerFonts } from "./fonts";
import { createDocument, ReportWriter } from "./layout";
import { modelSection } from "./model-section";
import { drawPageMarks } from "./page-marks";
import { reviewState, type ReportData } from "./report-data";
import { resultsSection } from "./results-section";
import { catalogueSection } from "./catalogue-section";
import { reactionsSection } from "./reactions-section";

export function buildReportPdf(data: ReportData): Promise<Uint8Array> {
  const doc = createDocument({
    title: `Calculation record: ${data.model.name} (job ${data.job.id})`,
    author: data.job.submitter ?? "Strutwise",
    subject: `${data.project.code} ${data.project.name}`,
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Uint8Array>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(new Uint8Array(Buffer.concat(chunks))));
    doc.on("error", reject);
  });
  try {
    registerFonts(doc);
    const w = new ReportWriter(doc);
    coverPage(w, data);
    modelSection(w, data);
    designSection(w, data);
    resultsSection(w, data);
    reactionsSection(w, data);
    catalogueSection(w, data);
    constraintsSection(w, data);
    drawPageMarks(w, {
      left: `Strutwise calculation record · ${data.project.code}`,
      right: `${data.model.name} · job ${data.job.id}`,
      state: reviewState(data.reviews, data.result),
    });
    doc.end();
  } catch (e) {
    doc.end();
    return Promise.reject(e);
  }
  return done;
}
