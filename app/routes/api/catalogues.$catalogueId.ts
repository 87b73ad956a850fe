// GET /api/catalogues/:catalogueId: one catalogue with every section (mm, mm², mm⁴, kg/m).
import { requirePermission } from "~/lib/auth/authorize.server";
import { getCatalogue } from "~/lib/catalogues/catalogues.server";
import { CATALOGUE_UNITS } from "~/lib/catalogues/types";
import { notFound, withDependencies } from "~/lib/http.server";
import type { Route } from "./+types/catalogues.$catalogueId";

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "read:catalogue");
  const catalogue = await getCatalogue(params.catalogueId);
  if (!catalogue) notFound(`Catalogue ${params.catalogueId}`);
  return Response.json({ ...catalogue, units: CATALOGUE_UNITS });
});
