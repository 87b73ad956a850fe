// GET /api/models/:modelId/file[?version=N]: one version's JSON exactly as it was stored
// (the latest without a version), passed on from the bucket as a stream.
import { requireModel } from "~/lib/access.server";
import { badRequest, notFound, withDependencies } from "~/lib/http.server";
import { getModelVersionStream } from "~/lib/models/versions.server";
import type { Route } from "./+types/models.$modelId.file";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireModel(request, params.modelId, "read:model");
  const raw = new URL(request.url).searchParams.get("version");
  let version: number | null = null;
  if (raw !== null && raw !== "") {
    version = Number(raw);
    if (!Number.isInteger(version) || version < 1) badRequest("version must be a whole number from 1", [{ path: "version", message: `got "${raw}"` }]);
  }
  const file = await getModelVersionStream(params.modelId, version);
  if (!file) notFound(version === null ? `Model ${params.modelId}` : `Version ${version} of model ${params.modelId}`);
  const base = file.fileName.replace(/[^\w.\- ]+/g, "_").replace(/\.truss\.json$|\.json$/i, "");
  return new Response(file.body, {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      ...(file.length !== null ? { "Content-Length": String(file.length) } : {}),
      "Content-Disposition": `attachment; filename="${base}.v${file.version}.truss.json"`,
      "X-Model-Version": String(file.version),
      // a version never changes; the latest may
      "Cache-Control": version === null ? "private, no-cache" : "private, max-age=3600",
    },
  });
});
