// Spreadsheet import: the files to a model (pure, spreadsheet/), then stored like an upload
// (version 1). Nothing is stored when any problem is found.
import type { Db } from "~/db/client.server";
import type { ErrorDetail } from "~/lib/http.server";
import { storeModel, type StoreModelResult } from "~/lib/models.server";
import { importSpreadsheet, type SpreadsheetFiles } from "./spreadsheet";

export async function importModel(
  input: { projectId: string; files: SpreadsheetFiles; user: { id: string } | null },
  database?: Db,
): Promise<StoreModelResult> {
  const r = await importSpreadsheet(input.files);
  if (!r.ok) {
    const n = r.problems.length;
    const details: ErrorDetail[] = r.problems;
    return { ok: false, status: 400, error: `The spreadsheet has ${n} problem${n === 1 ? "" : "s"}; the first: ${details[0]!.path}: ${details[0]!.message} (columns: docs/model-format.md)`, details };
  }
  const name = String(r.model.name ?? "imported model");
  const fileName = `${name.replace(/[^\w.\- ]+/g, "_").slice(0, 100) || "imported"}.truss.json`;
  const bytes = new TextEncoder().encode(`${JSON.stringify(r.model, null, 2)}\n`);
  return storeModel({ projectId: input.projectId, fileName, bytes, user: input.user, note: "imported from a spreadsheet" }, database);
}
