// GET /api/projects/:projectId/members (members and admins), POST { email } (the project's
// creator or an admin) — api.md, Additions.
import { z } from "zod";
import { managesMembers, requireProject } from "~/lib/access.server";
import { jsonError, readJson, zodDetails, withDependencies } from "~/lib/http.server";
import { addMember, listMembers } from "~/lib/members.server";
import type { Route } from "./+types/projects.$projectId.members";

const addSchema = z.object({ email: z.string({ error: "email is required" }).trim().min(3, "email is required").max(320) });

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireProject(request, params.projectId, "read:project");
  const members = await listMembers(project.id);
  return Response.json({ members: members.map(({ userId, name, email, role }) => ({ userId, name, email, role })) }, { headers: { "Cache-Control": "no-store" } });
});

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, `${request.method} is not supported here; use POST to add a member`);
  const { user, project } = await requireProject(request, params.projectId, "read:project");
  if (!managesMembers(user, project)) return jsonError(403, "Only the project's creator or an admin adds members");
  const body = addSchema.safeParse(await readJson(request));
  if (!body.success) return jsonError(400, "The member request is not valid", zodDetails(body.error.issues));
  const m = await addMember({ projectId: project.id, email: body.data.email, by: user, request });
  return Response.json({ userId: m.userId, name: m.name, email: m.email, role: m.role }, { status: 201 });
});
