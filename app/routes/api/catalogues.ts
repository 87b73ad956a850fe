// GET /api/catalogues: the desk's section catalogues (?retired=1 adds retired ones).
// POST /api/catalogues: upload one (multipart: file (CSV), name, description?); admin or engineer.
import { MaxFileSizeExceededError, parseFormData, type FileUpload } from "@mjackson/form-data-parser";
import { requirePermission } from "~/lib/auth/authorize.server";
import { listCatalogues, storeCatalogue } from "~/lib/catalogues/catalogues.server";
import { config } from "~/lib/config.server";
import { jsonError, withDependencies } from "~/lib/http.server";
import type { Route } from "./+types/catalogues";

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "read:catalogue");
  const retired = new URL(request.url).searchParams.get("retired");
  return Response.json({ catalogues: await listCatalogues({ includeRetired: retired === "1" || retired === "true" }) });
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST to upload a catalogue`);
  const user = await requirePermission(request, "manage:catalogue");
  if (!/^multipart\/form-data/i.test(request.headers.get("content-type") ?? "")) {
    return jsonError(415, "Send the catalogue as multipart/form-data with the fields 'file' (CSV) and 'name'");
  }
  const limit = config().UPLOAD_LIMIT_BYTES;
  let upload: { name: string; bytes: Uint8Array } | null = null;
  let form: FormData;
  try {
    form = await parseFormData(request, { maxFileSize: limit, maxFiles: 1 }, async (file: FileUpload) => {
      if (file.fieldName !== "file") return null;
      upload = { name: file.name || "catalogue.csv", bytes: new Uint8Array(await file.arrayBuffer()) };
      return null;
    });
  } catch (e) {
    if (e instanceof MaxFileSizeExceededError) return jsonError(413, `The catalogue file is larger than the upload limit of ${limit} bytes`, [{ path: "file", message: "too large" }]);
    return jsonError(400, `The upload could not be read: ${(e as Error).message}`);
  }
  const file = upload as { name: string; bytes: Uint8Array } | null;
  if (!file) return jsonError(400, "The upload is incomplete", [{ path: "file", message: "required: the catalogue as a CSV file" }]);
  const stored = await storeCatalogue({
    name: String(form.get("name") ?? ""),
    description: typeof form.get("description") === "string" ? String(form.get("description")) : null,
    fileName: file.name,
    bytes: file.bytes,
    user,
    request,
  });
  if (!stored.ok) return jsonError(stored.status, stored.error, stored.details);
  return Response.json(stored.catalogue, { status: 201 });
});
