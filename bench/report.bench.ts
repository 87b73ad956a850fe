// The calculation record of a 2,500-member job must be generated in under 10 s (issue 9).
// The job is a 626-panel Warren roof truss (2,503 members, 1,253 nodes, two load cases) with
// its exact fully stressed design (tests/report/warren-fixture.ts); the time covers the whole
// PDF, every table and the drawing, from gathered data to the last byte.
import { buildReportPdf } from "~/lib/report/document";
import { reportDataFor, warrenFixture } from "../tests/report/warren-fixture";
import { maxOf, minOf } from "~/engine/util/extent";

const TARGET_MS = 10_000;
// loads scaled by (8 / 626)² keep the midspan moment of the 8-panel test truss
const fx = warrenFixture({ panels: 626, loadScale: (8 / 626) ** 2 });
const data = reportDataFor(fx);
console.log(`job: ${fx.result.members.length} members, ${fx.result.nodes.length} nodes, ${fx.result.loadCases?.length} load cases`);

await buildReportPdf(reportDataFor(warrenFixture({ panels: 4 }))); // load fonts and code once
const runs: number[] = [];
let size = 0;
for (let i = 0; i < 3; i++) {
  const t0 = performance.now();
  const pdf = await buildReportPdf(data);
  runs.push(performance.now() - t0);
  size = pdf.byteLength;
}
const best = minOf(runs);
const worst = maxOf(runs);
const mem = process.memoryUsage().rss / 2 ** 20;
console.log(`report of ${fx.result.members.length} members: best ${(best / 1000).toFixed(2)} s, worst ${(worst / 1000).toFixed(2)} s over ${runs.length} runs; ${(size / 2 ** 20).toFixed(2)} MiB; rss ${mem.toFixed(0)} MiB`);
console.log(worst < TARGET_MS ? `OK: under the ${TARGET_MS / 1000} s target` : `SLOW: over the ${TARGET_MS / 1000} s target`);
if (worst >= TARGET_MS) process.exitCode = 1;
