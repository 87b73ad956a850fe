// GET /api/jobs/:jobId/report: the calculation record (PDF) of a succeeded job (api.md),
// generated from the stored result and cached in the bucket per review state.
import { requireJob } from "~/lib/access.server";
import { jsonError, withDependencies, dependencyResponse } from "~/lib/http.server";
import { renderReportFile, ReportError } from "~/lib/report/render.server";
import type { Route } from "./+types/jobs.$jobId.report";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireJob(request, params.jobId, "read:job");
  try {
    const report = await renderReportFile(params.jobId);
    return new Response(new Uint8Array(report.bytes), {
      status: 200,
      headers: {
        "Content-Type": "application/pdf",
        "Content-Length": String(report.bytes.byteLength),
        "Content-Disposition": `attachment; filename="${report.fileName}"`,
        // the review state can change; the browser asks again, the bucket cache answers
        "Cache-Control": "private, no-cache",
        "X-Report-Cache": report.cached ? "hit" : "miss",
      },
    });
  } catch (e) {
    if (e instanceof ReportError) return jsonError(e.status, e.message);
    const unavailable = dependencyResponse(e);
    if (unavailable) return unavailable;
    console.error(`[report] job ${params.jobId}: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    return jsonError(500, `The report of job ${params.jobId} could not be generated; the error is logged on the server`);
  }
});
