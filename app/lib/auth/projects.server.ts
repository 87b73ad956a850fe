// Projects group models and jobs: create (engineer or admin) and list with a text filter.
import { randomUUID } from "node:crypto";
import { and, desc, eq, like, or } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { projectMembers, projects, user } from "~/db/schema";
import { memberScope, type Caller } from "~/lib/project-scope.server";
import { audit } from "./audit.server";
import type { SessionUser } from "./authorize.server";
import type { ProjectInput } from "./forms";

export type Project = typeof projects.$inferSelect;

export async function createProject(
  input: ProjectInput,
  creator: SessionUser,
  opts: { request?: Request } = {},
  database: Db = defaultDb(),
): Promise<{ ok: true; project: Project } | { ok: false; field: "code"; message: string }> {
  const code = input.code.toUpperCase();
  const clash = await database.query.projects.findFirst({ where: eq(projects.code, code) });
  if (clash) return { ok: false, field: "code", message: `Code ${code} is taken by project "${clash.name}"` };
  // the creator is the project's first member (and may add others: access.server.ts)
  const project = await database.transaction(async (tx) => {
    const [row] = await tx
      .insert(projects)
      .values({ id: randomUUID(), code, name: input.name, client: input.client ?? null, description: input.description ?? null, createdBy: creator.id })
      .returning();
    await tx.insert(projectMembers).values({ projectId: row!.id, userId: creator.id, addedBy: creator.id });
    return row;
  });
  await audit(
    { request: opts.request, actor: creator, action: "project.create", entityType: "project", entityId: project!.id, detail: { code } },
    database,
  );
  return { ok: true, project: project! };
}

export interface ProjectListItem extends Project {
  createdByName: string | null;
}

/**
 * The projects the caller belongs to (admins: all), newest first; `q` matches code, name or
 * client (case-insensitive).
 */
export async function listProjects(filter: { q?: string; visibleTo: Caller }, database: Db = defaultDb()): Promise<ProjectListItem[]> {
  const q = filter.q?.trim().replace(/[%_]/g, "");
  const text = q ? or(like(projects.code, `%${q}%`), like(projects.name, `%${q}%`), like(projects.client, `%${q}%`)) : undefined;
  const rows = await database
    .select({ project: projects, createdByName: user.name })
    .from(projects)
    .leftJoin(user, eq(user.id, projects.createdBy))
    .where(and(text, memberScope(filter.visibleTo, projects.id)))
    .orderBy(desc(projects.createdAt));
  return rows.map((r) => ({ ...r.project, createdByName: r.createdByName }));
}
