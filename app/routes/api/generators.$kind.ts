// POST /api/generators/:kind: the parameters (JSON) in, a complete truss model out (not stored).
import { requirePermission } from "~/lib/auth/authorize.server";
import { jsonError, readJson, withDependencies } from "~/lib/http.server";
import { generateCheckedModel } from "~/lib/models/generate";
import type { Route } from "./+types/generators.$kind";

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; POST the parameters as JSON`);
  await requirePermission(request, "read:model");
  const body = await readJson(request);
  if (typeof body !== "object" || body === null || Array.isArray(body)) return jsonError(400, "Send the parameters as one JSON object", [{ path: "(body)", message: "not an object" }]);
  const r = generateCheckedModel(params.kind, body);
  if (!r.ok) return jsonError(r.status, r.error, r.details);
  return Response.json(r.model, { headers: { "Cache-Control": "no-store" } });
});
