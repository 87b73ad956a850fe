// POST /api/models/import: nodes, members and loads CSV files and a settings JSON (or one
// .xlsx workbook in the field "workbook"), filed under projectId as a new model.
import { assertProjectVisible, requirePermission } from "~/lib/access.server";
import { jsonError, withDependencies } from "~/lib/http.server";
import { auditUpload } from "~/lib/models.server";
import { importModel } from "~/lib/models/import.server";
import type { SpreadsheetFiles } from "~/lib/models/spreadsheet";
import { readUploadForm } from "~/lib/models/upload-form.server";
import type { Route } from "./+types/models.import";

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; POST the spreadsheet files`);
  const user = await requirePermission(request, "create:model");
  const read = await readUploadForm(request, ["nodes", "members", "loads", "workbook", "settings"], "the spreadsheet with the fields projectId, nodes, members, loads and settings (or workbook)");
  if (read instanceof Response) return read;
  const projectId = read.form.get("projectId");
  if (typeof projectId !== "string" || !projectId.trim()) return jsonError(400, "The import is incomplete", [{ path: "projectId", message: "required: the project to file the model under" }]);
  await assertProjectVisible(user, projectId.trim());

  const files: SpreadsheetFiles = {};
  for (const key of ["nodes", "members", "loads", "workbook"] as const) {
    const f = read.files.get(key);
    if (f) files[key] = f;
  }
  const settingsFile = read.files.get("settings");
  const settingsField = read.form.get("settings");
  if (settingsFile) files.settings = { name: settingsFile.name, text: new TextDecoder().decode(settingsFile.bytes) };
  else if (typeof settingsField === "string" && settingsField.trim()) files.settings = { name: "settings", text: settingsField };
  if (!files.workbook && !files.nodes && !files.members && !files.loads) {
    return jsonError(400, "The import is incomplete", [{ path: "files", message: "send nodes, members and loads CSV files (and settings), or one .xlsx workbook as 'workbook'" }]);
  }

  const stored = await importModel({ projectId: projectId.trim(), files, user });
  if (!stored.ok) return jsonError(stored.status, stored.error, stored.details);
  const m = stored.model;
  await auditUpload(request, user, m);
  return Response.json({ id: m.id, name: m.name, sha256: m.sha256, summary: m.summary, warnings: m.warnings, projectId: m.projectId }, { status: 201 });
});
