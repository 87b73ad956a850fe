// Renders the report of a model file and a result file from `npm run -s optimize`, for looking
// at a real solver result: `npx tsx tests/report/render-files.ts model.json result.json out.pdf`.
import fs from "node:fs";
import type { TrussResult } from "~/engine/design/result-types";
import { buildReportPdf } from "~/lib/report/document";
import type { ModelFile } from "~/lib/report/report-data";

const [modelPath, resultPath, out] = process.argv.slice(2);
if (!modelPath || !resultPath || !out) throw new Error("usage: render-files.ts model.json result.json out.pdf");
const model = JSON.parse(fs.readFileSync(modelPath, "utf8")) as ModelFile;
const result = JSON.parse(fs.readFileSync(resultPath, "utf8")) as TrussResult;
const pdf = await buildReportPdf({
  job: { id: "job-local", status: "succeeded", options: {}, createdAt: new Date(), startedAt: null, finishedAt: null, submitter: "local run" },
  project: { code: "LOCAL", name: "Local run" },
  model: { id: "local", name: model.name ?? "model", fileName: modelPath.split("/").pop()!, sha256: "(not computed)", sizeBytes: fs.statSync(modelPath).size, uploadedAt: null, file: model },
  result,
  reviews: [],
  generatedAt: new Date(),
});
fs.writeFileSync(out, pdf);
console.log(`${out}: ${pdf.byteLength} bytes`);
