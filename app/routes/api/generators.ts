// GET /api/generators: every generator with the JSON Schema of its parameters.
import { GENERATORS, parameterSchema } from "~/engine/generators";
import { requirePermission } from "~/lib/auth/authorize.server";
import type { Route } from "./+types/generators";
import { withDependencies } from "~/lib/http.server";

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "read:model");
  return Response.json({
    generators: GENERATORS.map((g) => ({ kind: g.kind, name: g.name, description: g.description, parameters: parameterSchema(g) })),
  });
});
