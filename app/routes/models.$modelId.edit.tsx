// The editor page: a version of a model (the latest, or ?version=N, e.g. from "edit and run
// again" on a job page) in editable tables with a live preview; saving adds a new version.
// The model itself is not in the page's data: the page fetches the version's file, preloaded
// from its head (use-model-file.ts, docs/decisions/0021).
import { useEffect } from "react";
import { data, Link, redirect, useNavigation } from "react-router";
import { ModelEditor } from "~/components/editor/ModelEditor";
import { modelFileUrl, preloadModelFile, useModelFile } from "~/components/editor/use-model-file";
import { RouteError } from "~/components/ui/RouteError";
import { audit } from "~/lib/auth/audit.server";
import { requireModel } from "~/lib/access.server";
import { badRequest, notFound, withDependencies } from "~/lib/http.server";
import { getModel } from "~/lib/models.server";
import { markOnce, PAGE_MARKS } from "~/lib/page-timing";
import { createModelVersion, getModelVersion } from "~/lib/models/versions.server";
import type { Route } from "./+types/models.$modelId.edit";

export function meta({ data }: Route.MetaArgs) {
  return [{ title: data ? `Edit ${data.name} — Strutwise` : "Edit model — Strutwise" }];
}

/** ?answers=<job>: the returned run this edit answers; carried to the version page's run buttons. */
function answersParam(request: Request): string | null {
  const v = new URL(request.url).searchParams.get("answers");
  return v && /^[\w-]{1,64}$/.test(v) ? v : null;
}

function versionParam(request: Request): number | null {
  const raw = new URL(request.url).searchParams.get("version");
  if (!raw) return null;
  const v = Number(raw);
  if (!Number.isInteger(v) || v < 1) badRequest("version must be a whole number from 1");
  return v;
}

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  await requireModel(request, params.modelId, "create:model");
  const model = await getModel(params.modelId);
  if (!model) notFound(`Model ${params.modelId}`);
  const version = await getModelVersion(model.id, versionParam(request));
  if (!version) notFound(`That version of model ${params.modelId}`);
  return { id: model.id, name: model.name, version: version.version, answers: answersParam(request) };
});

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  const { user } = await requireModel(request, params.modelId, "create:model");
  const form = await request.formData();
  const text = form.get("model");
  const note = form.get("note");
  if (typeof text !== "string") return data({ error: "The edited model did not arrive; save again" }, { status: 400 });
  const created = await createModelVersion({ modelId: params.modelId, fileName: "edited.truss.json", bytes: new TextEncoder().encode(`${JSON.stringify(JSON.parse(text), null, 2)}\n`), note: typeof note === "string" ? note : null, user });
  if (!created.ok) return data({ error: `${created.error}${created.details[0] ? ` — ${created.details[0].path}: ${created.details[0].message}` : ""}` }, { status: created.status });
  await audit({ request, actor: user, action: "model.version", entityType: "model", entityId: created.modelId, detail: { version: created.version.version, sha256: created.version.sha256, note: created.version.note } });
  const answers = answersParam(request);
  throw redirect(`/models/${created.modelId}/versions/${created.version.version}${answers ? `?answers=${answers}` : ""}`);
});

export function ErrorBoundary() {
  return <RouteError what="model" />;
}

type Units = { length: string; force: string; mass: string };

export default function EditModelPage({ loaderData, actionData }: Route.ComponentProps) {
  const nav = useNavigation();
  const fileUrl = modelFileUrl(loaderData.id, loaderData.version);
  preloadModelFile(fileUrl);
  const file = useModelFile(fileUrl);
  useEffect(() => markOnce(PAGE_MARKS.pageHydrated), []);
  const units = file.status === "loaded" ? (file.model.units as Units | undefined) : undefined;
  return (
    <div className="space-y-4">
      <header>
        <p className="text-sm text-ink-muted">
          <Link to={`/models/${loaderData.id}`} className="hover:underline">
            {loaderData.name}
          </Link>{" "}
          · editing version {loaderData.version}
        </p>
        <h1 className="mt-1 text-2xl font-semibold">Edit the model</h1>
        {loaderData.answers && (
          <p className="mt-2 max-w-3xl rounded-md border border-warn/30 bg-warn-wash px-3 py-2 text-sm" data-testid="answers-note">
            Making the changes a checker asked for on job{" "}
            <Link to={`/jobs/${loaderData.answers}`} className="font-mono text-info hover:underline">
              {loaderData.answers.slice(0, 8)}
            </Link>
            . Save, then run the new version: that run will link to the returned one, and back.
          </p>
        )}
        <p className="mt-1 max-w-3xl text-sm text-ink-soft">
          {units ? `Units of this model: lengths in ${units.length}, forces in ${units.force}, masses in ${units.mass}. ` : ""}Saving keeps version {loaderData.version} as it is and adds the next version.
        </p>
      </header>
      {file.status === "loaded" && units ? (
        <ModelEditor key={fileUrl} initial={file.model} units={units} baseVersion={loaderData.version} saving={nav.state === "submitting"} saveError={actionData?.error ?? null} />
      ) : file.status === "failed" ? (
        <p className="max-w-3xl rounded-md bg-bad-wash px-3 py-2 text-sm text-bad" role="alert">
          Version {loaderData.version} of this model could not be loaded ({file.message}). Reload the page to try again.
        </p>
      ) : file.status === "loaded" ? (
        <p className="max-w-3xl rounded-md bg-bad-wash px-3 py-2 text-sm text-bad" role="alert">
          Version {loaderData.version} of this model has no units block, so its tables cannot be labelled. See docs/model-format.md (units).
        </p>
      ) : (
        <p className="rounded-md bg-paper-sunk px-3 py-2 text-sm text-ink-muted" role="status">
          Loading version {loaderData.version} of the model…
        </p>
      )}
    </div>
  );
}
