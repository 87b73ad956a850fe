// Writes sample reports for looking at (pdftoppm): `npx tsx tests/report/write-sample.ts <dir> [panels]`.
import fs from "node:fs";
import path from "node:path";
import { buildReportPdf } from "~/lib/report/document";
import { reportDataFor, warrenFixture } from "./warren-fixture";

const dir = process.argv[2] ?? "test-artifacts/report";
const panels = Number(process.argv[3] ?? 8); // 626 panels give the 2,503-member benchmark job
fs.mkdirSync(dir, { recursive: true });
const f = warrenFixture({ panels, loadScale: Math.min(1, (8 / panels) ** 2) });
const t0 = performance.now();
const pdf = await buildReportPdf(reportDataFor(f));
console.log(`not reviewed: ${pdf.byteLength} bytes in ${(performance.now() - t0).toFixed(0)} ms`);
fs.writeFileSync(path.join(dir, "not-reviewed.pdf"), pdf);
const approved = await buildReportPdf(
  reportDataFor(f, [
    { id: "r1", decision: "changes-requested", comment: "Check the drift case on the right half too.", reviewer: "Tomasz Réveillon", at: new Date("2026-11-30T11:00:00Z") },
    { id: "r2", decision: "approved", comment: "Chord groups checked by hand against the section method; agreed.", reviewer: "Priya Vantongeren", at: new Date("2026-11-30T15:10:00Z") },
  ]),
);
fs.writeFileSync(path.join(dir, "approved.pdf"), approved);
console.log(`approved: ${approved.byteLength} bytes`);
