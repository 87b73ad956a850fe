// Project members: list, add by e-mail, remove. Who may change the list (the project's creator
// and admins) is decided in access.server.ts (managesMembers); the routes call that first.
// Every change goes to the audit trail with who made it.
import { and, asc, eq } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { projectMembers, projects, user } from "~/db/schema";
import { audit } from "~/lib/auth/audit.server";
import { isRole, type Role } from "~/lib/auth/permissions";
import { jsonError } from "~/lib/http.server";

export interface Member {
  userId: string;
  name: string;
  email: string;
  role: Role;
  creator: boolean;
}

export async function listMembers(projectId: string, database: Db = defaultDb()): Promise<Member[]> {
  const [project] = await database.select({ createdBy: projects.createdBy }).from(projects).where(eq(projects.id, projectId)).limit(1);
  const rows = await database
    .select({ userId: user.id, name: user.name, email: user.email, role: user.role })
    .from(projectMembers)
    .innerJoin(user, eq(user.id, projectMembers.userId))
    .where(eq(projectMembers.projectId, projectId))
    .orderBy(asc(user.name), asc(user.email));
  return rows.map((r) => ({ ...r, role: isRole(r.role) ? r.role : "viewer", creator: r.userId === project?.createdBy }));
}

/** Add the account with this e-mail address. Throws 400 (no such account) or 409 (a member already). */
export async function addMember(
  opts: { projectId: string; email: string; by: { id: string; email?: string }; request?: Request },
  database: Db = defaultDb(),
): Promise<Member> {
  const email = opts.email.trim().toLowerCase();
  if (!email || !email.includes("@")) throw jsonError(400, "Give the e-mail address of the person to add", [{ path: "email", message: "an e-mail address is required" }]);
  const person = await database.query.user.findFirst({ where: eq(user.email, email) });
  if (!person) {
    throw jsonError(400, `Nobody has an account with ${email}; an admin invites them first (People and roles)`, [
      { path: "email", message: "no account with this address" },
    ]);
  }
  const added = await database
    .insert(projectMembers)
    .values({ projectId: opts.projectId, userId: person.id, addedBy: opts.by.id })
    .onConflictDoNothing()
    .returning({ userId: projectMembers.userId });
  if (!added.length) throw jsonError(409, `${email} is a member already`, [{ path: "email", message: "a member already" }]);
  await audit(
    { request: opts.request, actor: opts.by, action: "project.member-add", entityType: "project", entityId: opts.projectId, detail: { userId: person.id, email } },
    database,
  );
  const [project] = await database.select({ createdBy: projects.createdBy }).from(projects).where(eq(projects.id, opts.projectId)).limit(1);
  return { userId: person.id, name: person.name, email: person.email, role: isRole(person.role) ? person.role : "viewer", creator: person.id === project?.createdBy };
}

/** Remove a member. Throws 404 (not a member) or 409 (the creator, who keeps the project). */
export async function removeMember(
  opts: { projectId: string; userId: string; by: { id: string; email?: string }; request?: Request },
  database: Db = defaultDb(),
): Promise<void> {
  const [project] = await database.select({ createdBy: projects.createdBy }).from(projects).where(eq(projects.id, opts.projectId)).limit(1);
  if (project?.createdBy === opts.userId) {
    throw jsonError(409, "The project's creator stays a member: they answer for the project and manage its members");
  }
  const gone = await database
    .delete(projectMembers)
    .where(and(eq(projectMembers.projectId, opts.projectId), eq(projectMembers.userId, opts.userId)))
    .returning({ userId: projectMembers.userId });
  if (!gone.length) throw jsonError(404, `Account ${opts.userId} is not a member of this project`);
  const person = await database.query.user.findFirst({ where: eq(user.id, opts.userId) });
  await audit(
    {
      request: opts.request,
      actor: opts.by,
      action: "project.member-remove",
      entityType: "project",
      entityId: opts.projectId,
      detail: { userId: opts.userId, email: person?.email ?? null },
    },
    database,
  );
}
