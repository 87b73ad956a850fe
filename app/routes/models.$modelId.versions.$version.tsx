// One version of a model: what changed from the version before, in words; its file; and runs
// of exactly this version (an analysis, or a design when it has a design block).
import { data, Form, Link, redirect } from "react-router";
import { RouteError } from "~/components/ui/RouteError";
import { audit } from "~/lib/auth/audit.server";
import { requireModel } from "~/lib/access.server";
import { can } from "~/lib/auth/permissions";
import { formatDateTime } from "~/lib/format";
import { notFound, withDependencies } from "~/lib/http.server";
import { enqueueJob } from "~/lib/jobs/queue.server";
import { getModel } from "~/lib/models.server";
import { describeChanges } from "~/lib/models/describe-changes";
import { getModelVersionFile, listModelVersions } from "~/lib/models/versions.server";
import type { Route } from "./+types/models.$modelId.versions.$version";

export function meta({ data }: Route.MetaArgs) {
  return [{ title: data ? `${data.name}, version ${data.version.version} — Strutwise` : "Model version — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  const { user } = await requireModel(request, params.modelId, "read:model");
  const model = await getModel(params.modelId);
  const n = Number(params.version);
  if (!model || !Number.isInteger(n) || n < 1) notFound(`Version ${params.version} of model ${params.modelId}`);
  const versions = await listModelVersions(model.id);
  const version = versions.find((v) => v.version === n);
  if (!version) notFound(`Version ${n} of model ${params.modelId}`);
  const previous = versions.filter((v) => v.version < n).at(-1) ?? null;
  const [cur, prev] = await Promise.all([getModelVersionFile(model.id, n), previous ? getModelVersionFile(model.id, previous.version) : null]);
  const changes = prev && cur ? describeChanges(JSON.parse(prev.text), JSON.parse(cur.text)) : null;
  return {
    id: model.id,
    name: model.name,
    version,
    previous: previous?.version ?? null,
    latest: versions.at(-1)!.version,
    changes,
    may: { run: can(user.role, "create:job"), edit: can(user.role, "create:model") },
    answers: new URL(request.url).searchParams.get("answers"),
  };
});

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  const { user } = await requireModel(request, params.modelId, "create:job");
  const form = await request.formData();
  const kind = form.get("kind") === "analysis" ? "analysis" : "design";
  try {
    const answers = form.get("answers");
    const job = await enqueueJob({ modelId: params.modelId, version: Number(params.version), kind, user, answers: typeof answers === "string" && answers ? answers : null });
    await audit({ request, actor: user, action: "job.submit", entityType: "job", entityId: job.id, detail: { modelId: job.modelId, version: job.modelVersion, kind } });
    throw redirect(`/jobs/${job.id}`);
  } catch (e) {
    if (e instanceof Response && e.status >= 400) {
      const body = (await e.json().catch(() => null)) as { error?: string } | null;
      return data({ error: body?.error ?? "The run was not queued" }, { status: e.status });
    }
    throw e;
  }
});

export function ErrorBoundary() {
  return <RouteError what="model version" />;
}

export default function VersionPage({ loaderData, actionData }: Route.ComponentProps) {
  const { id, name, version: v, previous, latest, changes, may } = loaderData;
  return (
    <div className="space-y-5">
      <header>
        <p className="text-sm text-ink-muted">
          <Link to={`/models/${id}`} className="hover:underline">
            {name}
          </Link>
        </p>
        <h1 className="mt-1 text-2xl font-semibold">
          Version {v.version} {v.version === latest && <span className="badge bg-ok-wash text-ok align-middle text-xs">latest</span>}
        </h1>
        <p className="mt-1 text-sm text-ink-muted">
          saved {formatDateTime(v.createdAt)} · {v.nodeCount} nodes · {v.memberCount} members · {v.hasDesign ? "with a design block" : "analysis only (no design block)"}
        </p>
        {v.note && <p className="mt-2 text-ink-soft">“{v.note}”</p>}
        {loaderData.answers && (
          <p className="mt-2 max-w-3xl rounded-md border border-warn/30 bg-warn-wash px-3 py-2 text-sm" data-testid="answers-note">
            A run of this version will answer job{" "}
            <Link to={`/jobs/${loaderData.answers}`} className="font-mono text-info hover:underline">
              {loaderData.answers.slice(0, 8)}
            </Link>
            , which a checker returned with changes requested.
          </p>
        )}
      </header>

      <section className="card" aria-label="Changes">
        <h2 className="text-lg font-medium">{previous ? `What changed from version ${previous}` : "The first version"}</h2>
        {changes ? (
          <ul className="mt-2 list-disc space-y-1 pl-5 text-sm" data-testid="version-changes">
            {changes.map((c, i) => (
              <li key={i}>{c}</li>
            ))}
          </ul>
        ) : (
          <p className="mt-2 text-sm text-ink-soft">This is where the model started.</p>
        )}
      </section>

      <div className="flex flex-wrap gap-2">
        <a className="btn btn-secondary" href={`/api/models/${id}/file?version=${v.version}`}>
          Download version {v.version}
        </a>
        {may.edit && (
          <Link className="btn btn-secondary" to={`/models/${id}/edit?version=${v.version}`}>
            Edit from this version
          </Link>
        )}
        {may.run && (
          <Form method="post" className="flex gap-2">
            {loaderData.answers && <input type="hidden" name="answers" value={loaderData.answers} />}
            <button className="btn btn-secondary" name="kind" value="analysis">
              Analyse version {v.version}
            </button>
            {v.hasDesign && (
              <button className="btn btn-primary" name="kind" value="design">
                Optimize version {v.version}
              </button>
            )}
          </Form>
        )}
        {previous && (
          <Link className="btn btn-secondary" to={`/models/${id}/versions/${previous}`}>
            Version {previous}
          </Link>
        )}
        {v.version < latest && (
          <Link className="btn btn-secondary" to={`/models/${id}/versions/${v.version + 1}`}>
            Version {v.version + 1}
          </Link>
        )}
      </div>
      {actionData?.error && <p className="text-sm text-bad">{actionData.error}</p>}
    </div>
  );
}
