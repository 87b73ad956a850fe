// POST /api/models/:modelId/versions: a new immutable version (multipart: file, note?).
// GET lists the versions.
import { audit } from "~/lib/auth/audit.server";
import { requireModel } from "~/lib/access.server";
import { jsonError, notFound, withDependencies } from "~/lib/http.server";
import { getModel } from "~/lib/models.server";
import { readUploadForm } from "~/lib/models/upload-form.server";
import { createModelVersion, listModelVersions } from "~/lib/models/versions.server";
import type { Route } from "./+types/models.$modelId.versions";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireModel(request, params.modelId, "read:model");
  const model = await getModel(params.modelId);
  if (!model) notFound(`Model ${params.modelId}`);
  return Response.json({ versions: await listModelVersions(model.id) });
});

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST to add a version`);
  const { user } = await requireModel(request, params.modelId, "create:model");
  const read = await readUploadForm(request, ["file"], "the new version with the fields 'file' and 'note'");
  if (read instanceof Response) return read;
  const file = read.files.get("file");
  if (!file) return jsonError(400, "The new version is missing its file", [{ path: "file", message: "required: the truss JSON file" }]);
  const note = read.form.get("note");
  const created = await createModelVersion({ modelId: params.modelId, fileName: file.name, bytes: file.bytes, note: typeof note === "string" ? note : null, user });
  if (!created.ok) return jsonError(created.status, created.error, created.details);
  const v = created.version;
  await audit({ request, actor: user, action: "model.version", entityType: "model", entityId: created.modelId, detail: { version: v.version, sha256: v.sha256, note: v.note } });
  return Response.json(
    { id: created.modelId, version: v.version, sha256: v.sha256, summary: v.summary, warnings: v.warnings, note: v.note },
    { status: 201, headers: { Location: `/api/models/${created.modelId}/file?version=${v.version}` } },
  );
});
