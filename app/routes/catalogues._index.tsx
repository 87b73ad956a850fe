// The desk's section catalogues: every signed-in person reads them; admins and engineers
// upload CSV catalogues here and retire them on each catalogue's page.
import { data, Link, redirect, useSearchParams } from "react-router";
import { CatalogueUploadForm, type CatalogueUploadResult } from "~/components/catalogues/CatalogueUploadForm";
import { formatDateTime } from "~/lib/format";
import { RouteError } from "~/components/ui/RouteError";
import { EmptyState } from "~/components/ui/States";
import { requirePermission } from "~/lib/auth/authorize.server";
import { can } from "~/lib/auth/permissions";
import { listCatalogues, storeCatalogue } from "~/lib/catalogues/catalogues.server";
import type { Route } from "./+types/catalogues._index";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Section catalogues — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "read:catalogue");
  const showRetired = new URL(request.url).searchParams.get("retired") === "1";
  return { catalogues: await listCatalogues({ includeRetired: showRetired }), showRetired, mayManage: can(user.role, "manage:catalogue") };
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  const user = await requirePermission(request, "manage:catalogue");
  const form = await request.formData();
  const file = form.get("file");
  if (!(file instanceof File) || file.size === 0) {
    return data<CatalogueUploadResult>({ error: "Choose a CSV file", details: [{ path: "file", message: "no file was sent" }] }, { status: 400 });
  }
  const stored = await storeCatalogue({
    name: String(form.get("name") ?? ""),
    description: String(form.get("description") ?? ""),
    fileName: file.name,
    bytes: new Uint8Array(await file.arrayBuffer()),
    user,
    request,
  });
  if (!stored.ok) return data<CatalogueUploadResult>({ error: stored.error, details: stored.details }, { status: stored.status });
  throw redirect(`/catalogues/${stored.catalogue.id}`);
});

export function ErrorBoundary() {
  return <RouteError what="catalogue list" />;
}

export default function Catalogues({ loaderData }: Route.ComponentProps) {
  const { catalogues, showRetired, mayManage } = loaderData;
  const [sp] = useSearchParams();
  const toggle = new URLSearchParams(sp);
  if (showRetired) toggle.delete("retired");
  else toggle.set("retired", "1");
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold sm:text-3xl">Section catalogues</h1>
        <p className="mt-2 max-w-3xl text-ink-soft">
          The sections your office can buy, each with its area and least second moment of area. A model takes its sections from one of these at
          upload; catalogue sizing then gives every member group one of them, and buckling uses each section's own second moment of area.
        </p>
      </header>

      {mayManage && (
        <section className="card" aria-label="Upload a catalogue">
          <h2 className="mb-3 font-semibold">Upload a catalogue</h2>
          <CatalogueUploadForm />
        </section>
      )}

      <section className="card min-w-0" aria-label="Catalogues">
        <div className="mb-3 flex flex-wrap items-center gap-3">
          <h2 className="mr-auto font-semibold">{showRetired ? "All catalogues, retired ones too" : "Catalogues in use"}</h2>
          <Link to={`?${toggle}`} className="text-sm text-info hover:underline" data-testid="toggle-retired">
            {showRetired ? "Hide retired" : "Show retired"}
          </Link>
        </div>
        {catalogues.length === 0 ? (
          <EmptyState title="No catalogues yet">{mayManage ? "Upload the first one above; the template shows the columns." : "An admin or engineer uploads the office's catalogues."}</EmptyState>
        ) : (
          <div className="overflow-x-auto rounded-md border border-rule">
            <table className="data-table" aria-label="Catalogues">
              <thead>
                <tr>
                  <th>catalogue</th>
                  <th className="num">sections</th>
                  <th>families</th>
                  <th>uploaded</th>
                  <th>state</th>
                </tr>
              </thead>
              <tbody>
                {catalogues.map((c) => (
                  <tr key={c.id} data-testid="catalogue-row">
                    <td>
                      <Link to={`/catalogues/${c.id}`} className="text-info hover:underline">
                        {c.name}
                      </Link>
                      {c.description && <span className="block max-w-md truncate text-xs text-ink-muted">{c.description}</span>}
                    </td>
                    <td className="num">{c.sectionCount}</td>
                    <td>{c.families.join(", ")}</td>
                    <td className="text-sm">{c.builtIn ? "generated by Strutwise" : `${c.createdBy ?? "unknown"} · ${formatDateTime(c.createdAt)}`}</td>
                    <td className="text-sm">{c.retiredAt ? <span className="text-ink-muted">retired {formatDateTime(c.retiredAt)}</span> : "in use"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </div>
  );
}
