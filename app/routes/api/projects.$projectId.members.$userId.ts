// DELETE /api/projects/:projectId/members/:userId (the project's creator or an admin) — api.md.
import { managesMembers, requireProject } from "~/lib/access.server";
import { jsonError, withDependencies } from "~/lib/http.server";
import { removeMember } from "~/lib/members.server";
import type { Route } from "./+types/projects.$projectId.members.$userId";

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "DELETE") return jsonError(405, `${request.method} is not supported here; use DELETE to remove a member`);
  const { user, project } = await requireProject(request, params.projectId, "read:project");
  if (!managesMembers(user, project)) return jsonError(403, "Only the project's creator or an admin removes members");
  await removeMember({ projectId: project.id, userId: params.userId, by: user, request });
  return new Response(null, { status: 204 });
});
