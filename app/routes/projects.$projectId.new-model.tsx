// A new model without a text editor: from a generator (a truss type and its dimensions) or
// from a spreadsheet (CSV files or one workbook, with templates to start from).
import { useState } from "react";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import { RouteError } from "~/components/ui/RouteError";
import { GENERATORS, parameterSchema } from "~/engine/generators";
import { requireProject } from "~/lib/access.server";
import { auditUpload, storeModel } from "~/lib/models.server";
import { generateCheckedModel } from "~/lib/models/generate";
import { importModel } from "~/lib/models/import.server";
import type { SpreadsheetFiles } from "~/lib/models/spreadsheet";
import type { Route } from "./+types/projects.$projectId.new-model";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "New model — Strutwise" }];
}

interface Field {
  key: string;
  type: "number" | "enum" | "boolean" | "text";
  options?: (string | number)[];
  default?: unknown;
  description?: string;
  unit?: string;
}

function fieldsOf(schema: Record<string, unknown>): Field[] {
  const props = (schema.properties ?? {}) as Record<string, Record<string, unknown>>;
  return Object.entries(props).map(([key, p]) => {
    const options = (p.enum as string[] | undefined) ?? (p.anyOf as { const: number }[] | undefined)?.map((a) => a.const);
    const type = options ? "enum" : p.type === "boolean" ? "boolean" : p.type === "number" || p.type === "integer" ? "number" : "text";
    return { key, type, options, default: p.default, description: p.description as string | undefined, unit: p.unit as string | undefined };
  });
}

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireProject(request, params.projectId, "create:model");
  return {
    project: { id: project.id, code: project.code, name: project.name },
    generators: GENERATORS.map((g) => ({ kind: g.kind, name: g.name, description: g.description, fields: fieldsOf(parameterSchema(g)) })),
  };
});

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  const { user, project } = await requireProject(request, params.projectId, "create:model");
  const form = await request.formData();
  const intent = form.get("intent");
  if (intent === "generate") {
    const kind = String(form.get("kind") ?? "");
    const g = GENERATORS.find((x) => x.kind === kind);
    if (!g) return data({ error: `There is no generator "${kind}"`, details: [] }, { status: 400 });
    const values: Record<string, unknown> = {};
    for (const f of fieldsOf(parameterSchema(g))) {
      const raw = form.get(f.key);
      if (f.type === "boolean") values[f.key] = raw === "on";
      else if (typeof raw !== "string" || raw.trim() === "") continue;
      else if (f.type === "number" || (f.type === "enum" && typeof f.options?.[0] === "number")) values[f.key] = Number(raw);
      else values[f.key] = raw;
    }
    const r = generateCheckedModel(kind, values);
    if (!r.ok) return data({ error: r.error, details: r.details }, { status: r.status });
    const name = String(r.model.name);
    const stored = await storeModel({ projectId: project.id, fileName: `${name.replace(/[^\w.\- ]+/g, "_").slice(0, 100)}.truss.json`, bytes: new TextEncoder().encode(`${JSON.stringify(r.model, null, 2)}\n`), user, note: `generated: ${kind}` });
    if (!stored.ok) return data({ error: stored.error, details: stored.details }, { status: stored.status });
    await auditUpload(request, user, stored.model);
    throw redirect(`/models/${stored.model.id}`);
  }
  if (intent === "import") {
    const files: SpreadsheetFiles = {};
    for (const key of ["nodes", "members", "loads", "workbook"] as const) {
      const f = form.get(key);
      if (f instanceof File && f.size > 0) files[key] = { name: f.name, bytes: new Uint8Array(await f.arrayBuffer()) };
    }
    const s = form.get("settings");
    if (s instanceof File && s.size > 0) files.settings = { name: s.name, text: await s.text() };
    const stored = await importModel({ projectId: project.id, files, user });
    if (!stored.ok) return data({ error: stored.error, details: stored.details }, { status: stored.status });
    await auditUpload(request, user, stored.model);
    throw redirect(`/models/${stored.model.id}`);
  }
  return data({ error: "Choose a generator or a spreadsheet", details: [] }, { status: 400 });
});

export function ErrorBoundary() {
  return <RouteError what="project" />;
}

export default function NewModelPage({ loaderData, actionData }: Route.ComponentProps) {
  const { project, generators } = loaderData;
  const [kind, setKind] = useState(generators[0]!.kind);
  const g = generators.find((x) => x.kind === kind)!;
  const busy = useNavigation().state === "submitting";
  return (
    <div className="space-y-6">
      <header>
        <p className="text-sm text-ink-muted">
          <Link to={`/projects/${project.id}`} className="hover:underline">
            {project.code} · {project.name}
          </Link>
        </p>
        <h1 className="mt-1 text-2xl font-semibold">New model</h1>
      </header>
      {actionData?.error && (
        <div className="rounded-md bg-bad-wash px-3 py-2 text-sm text-bad" role="alert" data-testid="new-model-error">
          <p>{actionData.error}</p>
          <ul className="mt-1 list-disc pl-5">
            {actionData.details.slice(0, 30).map((d, i) => (
              <li key={i}>
                <span className="font-mono text-xs">{d.path}</span>: {d.message}
              </li>
            ))}
          </ul>
        </div>
      )}

      <section className="card space-y-4" aria-label="From a truss type">
        <h2 className="text-lg font-medium">From a truss type</h2>
        <Form method="post" className="space-y-4">
          <input type="hidden" name="intent" value="generate" />
          <label className="block text-sm">
            <span className="text-ink-soft">Type</span>
            <select name="kind" value={kind} onChange={(e) => setKind(e.target.value)} className="mt-1 block w-full rounded-md border border-rule bg-paper px-2 py-1.5">
              {generators.map((x) => (
                <option key={x.kind} value={x.kind}>
                  {x.name}
                </option>
              ))}
            </select>
          </label>
          <p className="text-sm text-ink-soft">{g.description}</p>
          <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3" key={kind}>
            {g.fields.map((f) => (
              <label key={f.key} className="block text-sm" title={f.description}>
                <span className="text-ink-soft">
                  {f.key}
                  {f.unit && f.unit !== "count" ? ` (${f.unit})` : ""}
                </span>
                {f.type === "enum" ? (
                  <select name={f.key} defaultValue={String(f.default)} className="mt-1 block w-full rounded-md border border-rule bg-paper px-2 py-1.5">
                    {f.options!.map((o) => (
                      <option key={String(o)} value={String(o)}>
                        {String(o)}
                      </option>
                    ))}
                  </select>
                ) : f.type === "boolean" ? (
                  <input type="checkbox" name={f.key} defaultChecked={f.default === true} className="mt-2 block" />
                ) : (
                  <input name={f.key} defaultValue={f.default === undefined ? "" : String(f.default)} inputMode={f.type === "number" ? "decimal" : undefined} className="mt-1 block w-full rounded-md border border-rule bg-paper px-2 py-1.5 font-mono" />
                )}
                {f.description && <span className="mt-0.5 block text-2xs text-ink-muted">{f.description}</span>}
              </label>
            ))}
          </div>
          <button className="btn btn-primary" disabled={busy}>
            Build the model
          </button>
        </Form>
      </section>

      <section className="card space-y-3" aria-label="From a spreadsheet">
        <h2 className="text-lg font-medium">From a spreadsheet</h2>
        <p className="text-sm text-ink-soft">
          Three CSV files (nodes, members, loads) and a settings file, or one .xlsx workbook with sheets of those names. Rows with a problem are named by file, row and column; nothing is stored until every row is right. Start from a template:{" "}
          {["nodes.csv", "members.csv", "loads.csv", "settings.json", "model.xlsx"].map((f, i) => (
            <span key={f}>
              {i > 0 && ", "}
              <a className="underline" href={`/api/models/templates/${f}`}>
                {f}
              </a>
            </span>
          ))}
          .
        </p>
        <Form method="post" encType="multipart/form-data" className="grid gap-3 sm:grid-cols-2">
          <input type="hidden" name="intent" value="import" />
          {["nodes", "members", "loads", "settings", "workbook"].map((k) => (
            <label key={k} className="block text-sm">
              <span className="text-ink-soft">{k === "workbook" ? "or one workbook (.xlsx)" : k === "settings" ? "settings (.json)" : `${k} (.csv)`}</span>
              <input type="file" name={k} accept={k === "workbook" ? ".xlsx" : k === "settings" ? ".json,application/json" : ".csv,text/csv"} className="mt-1 block w-full text-sm" />
            </label>
          ))}
          <div className="sm:col-span-2">
            <button className="btn btn-primary" disabled={busy}>
              Import
            </button>
          </div>
        </Form>
      </section>
    </div>
  );
}
