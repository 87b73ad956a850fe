// GET /api/models/:modelId/file: the uploaded JSON exactly as it was sent.
import { requirePermission } from "~/lib/auth/authorize.server";
import { notFound } from "~/lib/http.server";
import { getModelFile } from "~/lib/models.server";
import type { Route } from "./+types/models.$modelId.file";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "read:model");
  const file = await getModelFile(params.modelId);
  if (!file) notFound(`Model ${params.modelId}`);
  const safeName = file.fileName.replace(/[^\w.\- ]+/g, "_");
  return new Response(file.text, {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      "Content-Disposition": `attachment; filename="${safeName}"`,
      "Cache-Control": "private, max-age=3600", // a stored model never changes
    },
  });
}
