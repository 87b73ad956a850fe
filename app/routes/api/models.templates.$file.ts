// GET /api/models/templates/:file: import templates, filled with a small example model:
// nodes.csv, members.csv, loads.csv, settings.json and model.xlsx.
import { requireUser } from "~/lib/access.server";
import { notFound } from "~/lib/http.server";
import { modelToCsvFiles, writeWorkbook } from "~/lib/models/spreadsheet";
import { templateModel } from "~/lib/models/spreadsheet/template-model";
import type { Route } from "./+types/models.templates.$file";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireUser(request);
  const model = templateModel();
  const download = (body: BodyInit, type: string) =>
    new Response(body, { headers: { "Content-Type": type, "Content-Disposition": `attachment; filename="${params.file}"`, "Cache-Control": "private, max-age=300" } });
  const csv = modelToCsvFiles(model);
  switch (params.file) {
    case "nodes.csv":
      return download(csv.nodes, "text/csv; charset=utf-8");
    case "members.csv":
      return download(csv.members, "text/csv; charset=utf-8");
    case "loads.csv":
      return download(csv.loads, "text/csv; charset=utf-8");
    case "settings.json":
      return download(csv.settings, "application/json; charset=utf-8");
    case "model.xlsx":
      return download((await writeWorkbook(model)) as unknown as BodyInit, "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet");
    default:
      notFound(`Template ${params.file}`);
  }
}
