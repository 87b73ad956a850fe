// GET /api/models/:modelId: the model's metadata and the engine's summary of it.
import { requirePermission } from "~/lib/auth/authorize.server";
import { notFound } from "~/lib/http.server";
import { getModel } from "~/lib/models.server";
import type { Route } from "./+types/models.$modelId";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "read:model");
  const model = await getModel(params.modelId);
  if (!model) notFound(`Model ${params.modelId}`);
  return Response.json(model);
}
