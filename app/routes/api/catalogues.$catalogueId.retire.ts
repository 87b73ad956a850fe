// POST /api/catalogues/:catalogueId/retire { reason? }: take it out of the pick lists; admin or engineer.
import { requirePermission } from "~/lib/auth/authorize.server";
import { retireCatalogue } from "~/lib/catalogues/catalogues.server";
import { jsonError, readJson, withDependencies } from "~/lib/http.server";
import type { Route } from "./+types/catalogues.$catalogueId.retire";

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST to retire a catalogue`);
  const user = await requirePermission(request, "manage:catalogue");
  const body = (await readJson(request)) as { reason?: unknown } | null;
  const reason = typeof body?.reason === "string" ? body.reason : null;
  const r = await retireCatalogue({ id: params.catalogueId, reason, user, request });
  if (!r.ok) return jsonError(r.status, r.error, r.details.length ? r.details : undefined);
  return Response.json(r.catalogue);
});
