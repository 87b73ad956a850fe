// GET /api/models/:modelId: the model's metadata and the engine's summary of it, with the
// latest version number and every version.
import { requireModel } from "~/lib/access.server";
import { notFound, withDependencies } from "~/lib/http.server";
import { getModel } from "~/lib/models.server";
import { listModelVersions } from "~/lib/models/versions.server";
import type { Route } from "./+types/models.$modelId";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireModel(request, params.modelId, "read:model");
  const model = await getModel(params.modelId);
  if (!model) notFound(`Model ${params.modelId}`);
  const versions = await listModelVersions(model.id);
  return Response.json({
    ...model,
    version: versions.at(-1)?.version ?? null,
    versions: versions.map((v) => ({ version: v.version, sha256: v.sha256, createdAt: v.createdAt, createdBy: v.createdBy, note: v.note, name: v.name })),
  });
});
