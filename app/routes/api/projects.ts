// GET /api/projects, POST /api/projects (api.md).
import { requirePermission } from "~/lib/access.server";
import { projectSchema } from "~/lib/auth/forms";
import { createProject, listProjects } from "~/lib/auth/projects.server";
import { jsonError, readJson, zodDetails, withDependencies } from "~/lib/http.server";
import type { Route } from "./+types/projects";

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "read:project");
  const q = new URL(request.url).searchParams.get("q") ?? undefined;
  const rows = await listProjects({ q, visibleTo: user });
  return Response.json({
    projects: rows.map((p) => ({ id: p.id, code: p.code, name: p.name, client: p.client, description: p.description, createdAt: p.createdAt.toISOString() })),
  });
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use GET or POST`);
  const user = await requirePermission(request, "create:project");
  const parsed = projectSchema.safeParse(await readJson(request));
  if (!parsed.success) return jsonError(400, "The project is not valid", zodDetails(parsed.error.issues));
  const res = await createProject(parsed.data, user, { request });
  if (!res.ok) return jsonError(409, res.message, [{ path: res.field, message: res.message }]);
  const p = res.project;
  return Response.json(
    { id: p.id, code: p.code, name: p.name, client: p.client, description: p.description, createdAt: p.createdAt.toISOString() },
    { status: 201 },
  );
});
