// The one gate every loader, action and API route goes through for anything that lives in a
// project (the project itself, its models and versions, jobs, results, progress, reports,
// files). Order of the checks:
//   1. who is calling (requireUser: session cookie, or an API key on /api/* only);
//   2. membership: outside one's projects the thing does not exist for the caller (404, never
//      403, so that ids cannot be probed); admins are members of every project;
//   3. the role's permission (403 naming what was missing).
// Lists filter with memberScope(): a correlated EXISTS on project_members' primary key, so a
// newest-first job list still walks its (created_at, id) index and probes one row per job.
import { and, eq, sql } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { jobs, models, projectMembers, projects } from "~/db/schema";
import { assertPermission, requireUser, type SessionUser } from "~/lib/auth/authorize.server";
import type { Permission } from "~/lib/auth/permissions";
import { jsonError } from "~/lib/http.server";
import { seesEveryProject, type Caller } from "./project-scope.server";

export { assertPermission, forbidden, getUser, requirePermission, requireUser, type SessionUser } from "~/lib/auth/authorize.server";

export { memberScope, seesEveryProject, type Caller } from "./project-scope.server";

/** The same 404 for "no such thing" and "not in your projects": existence is not confirmed. */
function hidden(what: string, id: string): Response {
  return jsonError(404, `${what} ${id} not found`);
}

/** Is the caller a member of the project (admins: always)? */
export async function isMember(user: Caller, projectId: string, database: Db = defaultDb()): Promise<boolean> {
  if (seesEveryProject(user)) return true;
  const rows = await database
    .select({ one: sql<number>`1` })
    .from(projectMembers)
    .where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, user.id)))
    .limit(1);
  return rows.length > 0;
}

/** The ids of the caller's projects (null for admins: all of them). */
export async function memberProjectIds(user: Caller, database: Db = defaultDb()): Promise<string[] | null> {
  if (seesEveryProject(user)) return null;
  const rows = await database.select({ id: projectMembers.projectId }).from(projectMembers).where(eq(projectMembers.userId, user.id));
  return rows.map((r) => r.id);
}

export type ProjectRow = typeof projects.$inferSelect;

/** The project if the caller may see it, else a 404; then the role's permission (403). */
export async function requireProject(
  request: Request,
  projectId: string,
  permission: Permission,
  database: Db = defaultDb(),
): Promise<{ user: SessionUser; project: ProjectRow }> {
  const user = await requireUser(request);
  const project = await database.query.projects.findFirst({ where: eq(projects.id, projectId) });
  if (!project || !(await isMember(user, project.id, database))) throw hidden("Project", projectId);
  assertPermission(user, permission);
  return { user, project };
}

export interface ModelRef {
  id: string;
  projectId: string;
  uploadedBy: string | null;
}

/** The model (its ids) if it is in one of the caller's projects, else a 404; then the permission. */
export async function requireModel(
  request: Request,
  modelId: string,
  permission: Permission,
  database: Db = defaultDb(),
): Promise<{ user: SessionUser; model: ModelRef }> {
  const user = await requireUser(request);
  const [model] = await database
    .select({ id: models.id, projectId: models.projectId, uploadedBy: models.uploadedBy })
    .from(models)
    .where(eq(models.id, modelId))
    .limit(1);
  if (!model || !(await isMember(user, model.projectId, database))) throw hidden("Model", modelId);
  assertPermission(user, permission);
  return { user, model };
}

export interface JobRef {
  id: string;
  projectId: string;
  modelId: string;
  submittedBy: string | null;
}

/** The job (its ids) if it is in one of the caller's projects, else a 404; then the permission. */
export async function requireJob(
  request: Request,
  jobId: string,
  permission: Permission,
  database: Db = defaultDb(),
): Promise<{ user: SessionUser; job: JobRef }> {
  const user = await requireUser(request);
  const [job] = await database
    .select({ id: jobs.id, projectId: jobs.projectId, modelId: jobs.modelId, submittedBy: jobs.submittedBy })
    .from(jobs)
    .where(eq(jobs.id, jobId))
    .limit(1);
  if (!job || !(await isMember(user, job.projectId, database))) throw hidden("Job", jobId);
  assertPermission(user, permission);
  return { user, job };
}

/** For a body that names a project (an upload, an import): the same 404 rule, no request needed. */
export async function assertProjectVisible(user: SessionUser, projectId: string, database: Db = defaultDb()): Promise<void> {
  const found = await database.select({ id: projects.id }).from(projects).where(eq(projects.id, projectId)).limit(1);
  if (!found.length || !(await isMember(user, projectId, database))) throw hidden("Project", projectId);
}

/** For a body that names a model (POST /api/jobs): the same 404 rule. */
export async function assertModelVisible(user: SessionUser, modelId: string, database: Db = defaultDb()): Promise<ModelRef> {
  const [model] = await database
    .select({ id: models.id, projectId: models.projectId, uploadedBy: models.uploadedBy })
    .from(models)
    .where(eq(models.id, modelId))
    .limit(1);
  if (!model || !(await isMember(user, model.projectId, database))) throw hidden("Model", modelId);
  return model;
}

/** May the caller add and remove members of this project? Its creator and admins may. */
export function managesMembers(user: Caller, project: Pick<ProjectRow, "createdBy">): boolean {
  return seesEveryProject(user) || (project.createdBy !== null && project.createdBy === user.id);
}
