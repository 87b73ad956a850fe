import { useState } from "react";
import { Form, Link, data, useActionData, useNavigation, useSearchParams } from "react-router";
import { requirePermission } from "~/lib/access.server";
import { fieldErrors, formObject, projectSchema, type FieldErrors } from "~/lib/auth/forms";
import { can } from "~/lib/auth/permissions";
import { createProject, listProjects } from "~/lib/auth/projects.server";
import { TextField } from "~/lib/auth/text-field";
import type { Route } from "./+types/projects._index";
import { RouteError } from "~/components/ui/RouteError";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Projects — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "read:project");
  const q = new URL(request.url).searchParams.get("q") ?? "";
  const rows = await listProjects({ q, visibleTo: user });
  return {
    q,
    canCreate: can(user.role, "create:project"),
    projects: rows.map((p) => ({
      id: p.id,
      code: p.code,
      name: p.name,
      client: p.client,
      description: p.description,
      createdAt: p.createdAt.toISOString(),
      createdByName: p.createdByName,
    })),
  };
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  const user = await requirePermission(request, "create:project");
  const values = formObject(await request.formData());
  const parsed = projectSchema.safeParse(values);
  if (!parsed.success) return data({ ok: false as const, errors: fieldErrors(parsed.error), values }, { status: 400 });
  const res = await createProject(parsed.data, user, { request });
  if (!res.ok) return data({ ok: false as const, errors: { [res.field]: res.message } as FieldErrors, values }, { status: 409 });
  return { ok: true as const, created: res.project.code, errors: {} as FieldErrors, values: {} as Record<string, string> };
});

export default function Projects({ loaderData }: Route.ComponentProps) {
  const { projects, q, canCreate } = loaderData;
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state === "submitting";
  const [clientErrors, setClientErrors] = useState<FieldErrors | null>(null);
  const errors = clientErrors ?? result?.errors ?? {};
  const values = result && !result.ok ? result.values : {};

  return (
    <section>
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-3xl font-semibold tracking-tight">Projects</h1>
          <p className="mt-1 text-ink-soft">Each project keeps its truss models, optimization runs and their reviews together.</p>
        </div>
        <Form method="get" role="search" className="flex items-end gap-2">
          <div>
            <label htmlFor="project-filter" className="field-label">Filter by code, name or client</label>
            <input id="project-filter" name="q" type="search" defaultValue={q} className="field-input w-64" />
          </div>
          <button type="submit" className="btn btn-secondary">Filter</button>
          {params.get("q") && <Link to="/projects" className="btn btn-secondary">Clear</Link>}
        </Form>
      </div>

      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_22rem]">
        <div className="card overflow-x-auto p-0">
          {projects.length === 0 ? (
            <p className="px-5 py-10 text-center text-ink-muted">
              {q ? `No project matches "${q}".` : canCreate ? "No projects yet. Create the first one with the form." : "No projects yet."}
            </p>
          ) : (
            <table className="data-table">
              <caption className="sr-only">Projects{q ? ` matching ${q}` : ""}</caption>
              <thead>
                <tr>
                  <th scope="col">Code</th>
                  <th scope="col">Name</th>
                  <th scope="col">Client</th>
                  <th scope="col">Created</th>
                </tr>
              </thead>
              <tbody>
                {projects.map((p) => (
                  <tr key={p.id}>
                    <td className="whitespace-nowrap font-mono"><Link to={`/projects/${p.id}`} className="text-info underline">{p.code}</Link></td>
                    <td>
                      {p.name}
                      {p.description && <p className="text-xs text-ink-muted">{p.description}</p>}
                    </td>
                    <td>{p.client ?? "—"}</td>
                    <td className="whitespace-nowrap text-ink-muted">
                      {p.createdAt.slice(0, 10)}
                      {p.createdByName ? ` · ${p.createdByName}` : ""}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </div>

        {canCreate && (
          <Form
            method="post"
            className="card space-y-4 self-start"
            noValidate
            aria-labelledby="new-project-title"
            onSubmit={(e) => {
              // the same schema as the server: quick feedback here, the real check there
              const parsed = projectSchema.safeParse(formObject(new FormData(e.currentTarget)));
              if (!parsed.success) {
                e.preventDefault();
                setClientErrors(fieldErrors(parsed.error));
              } else setClientErrors(null);
            }}
          >
            <h2 id="new-project-title" className="text-lg font-semibold">New project</h2>
            {result?.ok && <p role="status" className="rounded-md bg-ok-wash px-3 py-2 text-sm text-ok">Project {result.created} created.</p>}
            <TextField label="Code" name="code" defaultValue={values.code} error={errors.code} hint="Short reference, e.g. HALL-07" required />
            <TextField label="Name" name="name" defaultValue={values.name} error={errors.name} required />
            <TextField label="Client" name="client" defaultValue={values.client} error={errors.client} />
            <div>
              <label htmlFor="project-description" className="field-label">Description</label>
              <textarea id="project-description" name="description" rows={3} defaultValue={values.description} className="field-input" aria-invalid={errors.description ? true : undefined} />
              {errors.description && <p className="field-error">{errors.description}</p>}
            </div>
            <button type="submit" className="btn btn-primary" disabled={busy}>Create project</button>
          </Form>
        )}
      </div>
    </section>
  );
}

// errors render inside the shell, so the navigation stays
export function ErrorBoundary() {
  return <RouteError what="project list" />;
}
