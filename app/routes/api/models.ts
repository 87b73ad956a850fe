// POST /api/models: upload a truss model (multipart: file, projectId); GET ?projectId= lists them.
import { MaxFileSizeExceededError, parseFormData, type FileUpload } from "@mjackson/form-data-parser";
import { assertProjectVisible, requirePermission } from "~/lib/access.server";
import { config } from "~/lib/config.server";
import { jsonError, withDependencies } from "~/lib/http.server";
import { listModels, auditUpload, storeModel, uploadTooLarge } from "~/lib/models.server";
import { sectionsFromUploadForm } from "~/lib/catalogues/catalogues.server";
import type { Route } from "./+types/models";

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "read:model");
  const projectId = new URL(request.url).searchParams.get("projectId") ?? undefined;
  if (projectId) await assertProjectVisible(user, projectId);
  return Response.json({ models: await listModels({ projectId, visibleTo: user }) });
});

// room for the form's other field and the multipart framing around the file
const FORM_OVERHEAD_BYTES = 64 * 1024;

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST to upload a model`);
  const user = await requirePermission(request, "create:model");
  if (!/^multipart\/form-data/i.test(request.headers.get("content-type") ?? "")) {
    return jsonError(415, "Send the model as multipart/form-data with the fields 'file' and 'projectId'");
  }
  const limit = config().UPLOAD_LIMIT_BYTES;
  const declared = Number(request.headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > limit + FORM_OVERHEAD_BYTES) return tooLarge();

  let upload: { name: string; bytes: Uint8Array } | null = null;
  let form: FormData;
  try {
    form = await parseFormData(request, { maxFileSize: limit, maxFiles: 1 }, async (file: FileUpload) => {
      if (file.fieldName !== "file") return null;
      upload = { name: file.name || "model.truss.json", bytes: new Uint8Array(await file.arrayBuffer()) };
      return null;
    });
  } catch (e) {
    if (e instanceof MaxFileSizeExceededError) return tooLarge();
    return jsonError(400, `The upload could not be read: ${(e as Error).message}`);
  }
  const projectId = form.get("projectId");
  const details = [];
  if (typeof projectId !== "string" || !projectId.trim()) details.push({ path: "projectId", message: "required: the project to file the model under" });
  if (!upload) details.push({ path: "file", message: "required: the truss JSON file" });
  if (details.length) return jsonError(400, "The upload is incomplete", details);
  const file = upload as unknown as { name: string; bytes: Uint8Array };

  // optional: the sections of a stored catalogue copied into the model (catalogueId, catalogueFamilies)
  const withSections = await sectionsFromUploadForm(form, file.bytes);
  if (!withSections.ok) return jsonError(withSections.status, withSections.error, withSections.details);

  await assertProjectVisible(user, (projectId as string).trim());
  const stored = await storeModel({ projectId: (projectId as string).trim(), fileName: file.name, bytes: withSections.bytes, user });
  if (!stored.ok) return jsonError(stored.status, stored.error, stored.details);
  const m = stored.model;
  await auditUpload(request, user, m);
  const { catalogue } = withSections;
  return Response.json(
    { id: m.id, name: m.name, sha256: m.sha256, summary: m.summary, warnings: [...withSections.warnings, ...m.warnings], projectId: m.projectId, ...(catalogue ? { catalogue } : {}) },
    { status: 201 },
  );

  function tooLarge() {
    const r = uploadTooLarge(null, null, limit);
    return jsonError(413, r.error, r.details);
  }
});
