// One section catalogue: who uploaded it, its sections, and (admins and engineers) retiring it.
import { data, Form, Link, useNavigation } from "react-router";
import { SectionsTable } from "~/components/catalogues/SectionsTable";
import { formatDateTime, shortHash } from "~/lib/format";
import { RouteError } from "~/components/ui/RouteError";
import { ErrorNote, Stat } from "~/components/ui/States";
import { requirePermission } from "~/lib/auth/authorize.server";
import { can } from "~/lib/auth/permissions";
import { getCatalogue, retireCatalogue } from "~/lib/catalogues/catalogues.server";
import { notFound, withDependencies } from "~/lib/http.server";
import type { Route } from "./+types/catalogues.$catalogueId";
import { plainText } from "~/lib/text-hygiene";

export function meta({ data }: Route.MetaArgs) {
  return [{ title: data ? `${plainText(data.catalogue.name)} — section catalogue — Strutwise` : "Section catalogue — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "read:catalogue");
  const catalogue = await getCatalogue(params.catalogueId);
  if (!catalogue) notFound(`Catalogue ${params.catalogueId}`);
  return { catalogue, mayRetire: can(user.role, "manage:catalogue") && !catalogue.builtIn && !catalogue.retiredAt };
});

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  const user = await requirePermission(request, "manage:catalogue");
  const form = await request.formData();
  const r = await retireCatalogue({ id: params.catalogueId, reason: String(form.get("reason") ?? ""), user, request });
  if (!r.ok) return data({ error: r.error }, { status: r.status });
  return { ok: true as const };
});

export function ErrorBoundary() {
  return <RouteError what="catalogue" />;
}

export default function CataloguePage({ loaderData, actionData }: Route.ComponentProps) {
  const { catalogue: c, mayRetire } = loaderData;
  const busy = useNavigation().state !== "idle";
  return (
    <div className="space-y-6">
      <header>
        <p className="text-sm text-ink-muted">
          <Link to="/catalogues" className="hover:underline">
            Section catalogues
          </Link>{" "}
          / {c.name}
        </p>
        <h1 className="mt-1 text-2xl font-semibold sm:text-3xl">{c.name}</h1>
        {c.description && <p className="mt-2 max-w-3xl text-ink-soft">{c.description}</p>}
        {c.retiredAt && (
          <p className="mt-2 text-sm text-warn" data-testid="retired-note">
            Retired {formatDateTime(c.retiredAt)}
            {c.retiredBy && <> by {c.retiredBy}</>}
            {c.retireReason && <>: {c.retireReason}</>}. It is no longer offered to new models; models that took its sections keep their copy.
          </p>
        )}
      </header>

      <section className="card" aria-label="About this catalogue">
        <dl className="grid grid-cols-2 gap-x-6 gap-y-4 sm:grid-cols-4">
          <Stat label="sections" value={c.sectionCount} />
          <Stat label="families" value={c.families.join(", ")} wrap />
          <Stat label="uploaded" value={c.builtIn ? "generated" : formatDateTime(c.createdAt)} hint={c.createdBy ?? undefined} />
          {c.fileName && <Stat label="file" value={c.fileName} hint={c.sha256 ? `SHA-256 ${c.sha256}` : undefined} />}
        </dl>
        {c.sha256 && <p className="mt-3 font-mono text-2xs text-ink-muted">SHA-256 {shortHash(c.sha256, 64)}</p>}
      </section>

      <section className="card min-w-0" aria-label="Sections">
        <h2 className="mb-1 font-semibold">Sections</h2>
        <p className="mb-3 text-sm text-ink-muted">Stored in mm whatever units the file used; a model gets them converted to its own length unit.</p>
        <SectionsTable name={c.name} sections={c.sections} dimensionNames={c.dimensionNames} />
      </section>

      {mayRetire && (
        <section className="card" aria-label="Retire">
          <h2 className="mb-1 font-semibold">Retire this catalogue</h2>
          <p className="mb-3 text-sm text-ink-muted">It leaves the pick lists for new models. Stored models and finished runs keep the sections they copied.</p>
          <Form method="post" className="flex flex-wrap items-end gap-3">
            <div className="min-w-64 flex-1">
              <label htmlFor="retire-reason" className="field-label">
                Reason (optional)
              </label>
              <input id="retire-reason" name="reason" className="field-input" placeholder="e.g. superseded by the 2028 stock list" maxLength={500} />
            </div>
            <button type="submit" className="btn btn-danger" disabled={busy} data-testid="retire-catalogue">
              Retire
            </button>
          </Form>
          {actionData && "error" in actionData && <div className="mt-3"><ErrorNote title="Not retired">{actionData.error}</ErrorNote></div>}
        </section>
      )}
    </div>
  );
}
