import { eq } from "drizzle-orm";
import { data, Link, redirect } from "react-router";
import { toJobRows } from "~/components/job/job-rows.server";
import { JobsList } from "~/components/job/JobsList";
import { formatBytes, formatDateTime, shortHash } from "~/lib/format";
import { RouteError } from "~/components/ui/RouteError";
import { EmptyState } from "~/components/ui/States";
import { type UploadResult } from "~/components/ui/UploadBox";
import { ModelUploadWithSections } from "~/components/catalogues/ModelUploadWithSections";
import { listCatalogues, sectionsFromUploadForm } from "~/lib/catalogues/catalogues.server";
import { db } from "~/db/client.server";
import { projects, user as users } from "~/db/schema";
import { forbidden, managesMembers, requireProject } from "~/lib/access.server";
import { addMember, listMembers, removeMember } from "~/lib/members.server";
import { MembersPanel } from "~/components/project/MembersPanel";
import { can } from "~/lib/auth/permissions";
import { config } from "~/lib/config.server";
import { notFound, withDependencies } from "~/lib/http.server";
import { listJobs } from "~/lib/jobs/queue.server";
import { listModels, auditUpload, storeModel, uploadTooLarge } from "~/lib/models.server";
import type { Route } from "./+types/projects.$projectId";
import { plainText } from "~/lib/text-hygiene";

export function meta({ data }: Route.MetaArgs) {
  return [{ title: data ? `${data.project.code} ${plainText(data.project.name)} — Strutwise` : "Project — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  const { user } = await requireProject(request, params.projectId, "read:project");
  const [row] = await db()
    .select({ project: projects, createdByName: users.name })
    .from(projects)
    .leftJoin(users, eq(users.id, projects.createdBy))
    .where(eq(projects.id, params.projectId))
    .limit(1);
  if (!row) notFound(`Project ${params.projectId}`);
  const [models, jobs, members] = await Promise.all([
    listModels({ projectId: row.project.id }),
    listJobs({ projectId: row.project.id, limit: 25 }),
    listMembers(row.project.id),
  ]);
  return {
    project: { ...row.project, createdAt: row.project.createdAt.toISOString(), createdByName: row.createdByName },
    models: models.map((m) => ({ id: m.id, name: m.name, fileName: m.fileName, sha256: m.sha256, sizeBytes: m.sizeBytes, dimension: m.dimension, nodeCount: m.nodeCount, memberCount: m.memberCount, hasDesign: m.hasDesign, createdAt: m.createdAt, warnings: m.warnings.length })),
    jobs: await toJobRows(jobs.jobs),
    moreJobs: jobs.nextCursor !== null,
    uploadLimit: config().UPLOAD_LIMIT_BYTES,
    mayUpload: can(user.role, "create:model"),
    members,
    mayManageMembers: managesMembers(user, row.project),
    catalogues: can(user.role, "create:model") ? (await listCatalogues()).map((c) => ({ id: c.id, name: c.name, sectionCount: c.sectionCount, families: c.families })) : [],
  };
});

// Multipart bodies carry a little framing around the file; allow for it before refusing.
const FRAMING_ALLOWANCE = 64 * 1024;

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  // the members panel posts a plain form; an upload is multipart
  if (/application\/x-www-form-urlencoded/i.test(request.headers.get("content-type") ?? "")) return membersAction(request, params.projectId);
  const { user } = await requireProject(request, params.projectId, "create:model");
  const limit = config().UPLOAD_LIMIT_BYTES;
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > limit + FRAMING_ALLOWANCE) {
    const r = uploadTooLarge("upload", declared - FRAMING_ALLOWANCE, limit);
    return data<UploadResult>({ error: r.ok ? "" : r.error }, { status: 413 });
  }
  const form = await request.formData();
  const file = form.get("file");
  if (!(file instanceof File) || file.size === 0) {
    return data<UploadResult>({ error: "Choose a truss JSON file to upload", details: [{ path: "file", message: "no file was sent" }] }, { status: 400 });
  }
  const withSections = await sectionsFromUploadForm(form, new Uint8Array(await file.arrayBuffer()));
  if (!withSections.ok) return data<UploadResult>({ error: withSections.error, details: withSections.details }, { status: withSections.status });
  const res = await storeModel({ projectId: params.projectId, fileName: file.name, bytes: withSections.bytes, user });
  if (!res.ok) return data<UploadResult>({ error: res.error, details: res.details }, { status: res.status });
  const m = res.model;
  await auditUpload(request, user, m);
  throw redirect(`/models/${m.id}`);
});

async function membersAction(request: Request, projectId: string) {
  const { user, project } = await requireProject(request, projectId, "read:project");
  if (!managesMembers(user, project)) throw forbidden("Only the project's creator or an admin adds and removes members");
  const form = await request.formData();
  const intent = form.get("intent");
  try {
    if (intent === "add-member") {
      const m = await addMember({ projectId: project.id, email: String(form.get("email") ?? ""), by: user, request });
      return { members: { ok: true, message: `${m.email} is a member now` } };
    }
    if (intent === "remove-member") {
      await removeMember({ projectId: project.id, userId: String(form.get("userId") ?? ""), by: user, request });
      return { members: { ok: true, message: "Removed from the project" } };
    }
  } catch (e) {
    if (!(e instanceof Response)) throw e;
    const body = (await e.json().catch(() => null)) as { error?: string } | null;
    return data({ members: { ok: false, message: body?.error ?? "The member list was not changed" } }, { status: e.status });
  }
  return data({ members: { ok: false, message: "Unknown request" } }, { status: 400 });
}

export function ErrorBoundary() {
  return <RouteError what="project" />;
}

export default function ProjectPage({ loaderData }: Route.ComponentProps) {
  const { project, models, jobs, uploadLimit, mayUpload, moreJobs, catalogues, members, mayManageMembers } = loaderData;
  return (
    <div className="space-y-6">
      <header>
        <p className="text-sm text-ink-muted">
          <Link to="/projects" className="hover:underline">
            Projects
          </Link>{" "}
          / <span className="font-mono">{project.code}</span>
        </p>
        <h1 className="mt-1 text-2xl font-semibold sm:text-3xl">{project.name}</h1>
        <p className="mt-2 text-sm text-ink-muted">
          {project.client && <>for {project.client} · </>}
          opened {formatDateTime(project.createdAt)}
          {project.createdByName && <> by {project.createdByName}</>}
        </p>
        {project.description && <p className="mt-2 max-w-3xl text-ink-soft">{project.description}</p>}
      </header>

      {mayUpload && (
        <section className="card" aria-label="Upload a model">
          <h2 className="mb-3 font-semibold">Upload a model</h2>
          <p className="mb-3 text-sm text-ink-soft">
            No file yet?{" "}
            <Link to={`/projects/${project.id}/new-model`} className="font-medium text-info hover:underline" data-testid="new-model-link">
              Build one from a truss type or import a spreadsheet
            </Link>
            .
          </p>
          <ModelUploadWithSections projectId={project.id} limitBytes={uploadLimit} catalogues={catalogues} />
        </section>
      )}

      <section className="card min-w-0" aria-label="Models">
        <h2 className="mb-3 font-semibold">Models</h2>
        {models.length === 0 ? (
          <EmptyState title="No models yet">{mayUpload ? "Drop the first truss JSON above." : "An engineer uploads the truss models of this project."}</EmptyState>
        ) : (
          <div className="overflow-x-auto rounded-md border border-rule">
            <table className="data-table" aria-label="Models">
              <thead>
                <tr>
                  <th>model</th>
                  <th>file</th>
                  <th className="num">dim.</th>
                  <th className="num">nodes</th>
                  <th className="num">members</th>
                  <th>design</th>
                  <th>uploaded</th>
                  <th>SHA-256</th>
                </tr>
              </thead>
              <tbody>
                {models.map((m) => (
                  <tr key={m.id} data-testid="model-row">
                    <td>
                      <Link to={`/models/${m.id}`} className="text-info hover:underline">
                        {m.name}
                      </Link>
                      {m.warnings > 0 && <span className="badge ml-2 bg-warn-wash text-warn">{m.warnings} notes</span>}
                    </td>
                    <td className="text-ink-muted">
                      {m.fileName} <span className="text-2xs">({formatBytes(m.sizeBytes)})</span>
                    </td>
                    <td className="num">{m.dimension}D</td>
                    <td className="num">{m.nodeCount}</td>
                    <td className="num">{m.memberCount}</td>
                    <td>{m.hasDesign ? "yes" : <span className="text-ink-muted">analysis only</span>}</td>
                    <td className="whitespace-nowrap">{formatDateTime(m.createdAt)}</td>
                    <td className="font-mono text-2xs text-ink-muted" title={m.sha256}>
                      {shortHash(m.sha256)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>

      <section className="card min-w-0" aria-label="Jobs">
        <div className="mb-3 flex items-baseline justify-between gap-3">
          <h2 className="font-semibold">Jobs</h2>
          {moreJobs && (
            <Link to={`/jobs?projectId=${project.id}`} className="text-sm text-info hover:underline">
              All jobs of this project
            </Link>
          )}
        </div>
        <JobsList rows={jobs} showProject={false} pollUrl={`/api/jobs?projectId=${project.id}&limit=25`} empty={<EmptyState title="No jobs yet">Open a model and queue a run.</EmptyState>} />
      </section>

      <MembersPanel members={members} mayManage={mayManageMembers} />
    </div>
  );
}
