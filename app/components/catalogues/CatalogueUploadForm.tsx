// Upload a CSV section catalogue: name, optional description, the file. Problems come back
// listed with their row and column; nothing is stored while any remains.
import { useRef } from "react";
import { useFetcher } from "react-router";
import { downloadText } from "~/components/tables/csv";
import { ErrorNote, IssueList, type Issue } from "~/components/ui/States";
import { catalogueTemplateCsv } from "~/lib/catalogues/csv";
import { TextField } from "~/lib/auth/text-field";

export interface CatalogueUploadResult {
  error?: string;
  details?: Issue[];
}

export function CatalogueUploadForm() {
  const fetcher = useFetcher<CatalogueUploadResult>();
  const busy = fetcher.state !== "idle";
  const form = useRef<HTMLFormElement>(null);
  const fieldError = (path: string) => fetcher.data?.details?.find((d) => d.path === path)?.message;
  const rowIssues = (fetcher.data?.details ?? []).filter((d) => d.path !== "name" && d.path !== "description");
  return (
    <fetcher.Form method="post" encType="multipart/form-data" ref={form} className="space-y-4" data-testid="catalogue-upload" noValidate>
      <input type="hidden" name="intent" value="upload" />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Name" name="name" placeholder="e.g. Yard stock, round tubes 2027" error={fieldError("name")} required />
        <TextField label="Description (optional)" name="description" placeholder="where the figures come from" error={fieldError("description")} />
      </div>
      <div>
        <label htmlFor="catalogue-file" className="field-label">
          CSV file
        </label>
        <input id="catalogue-file" name="file" type="file" accept=".csv,text/csv" className="field-input" required />
        <p className="mt-1 text-xs text-ink-muted">
          One section a row. Columns: <code className="font-mono">id</code>, <code className="font-mono">family</code>, <code className="font-mono">area_mm2</code>,{" "}
          <code className="font-mono">I_mm4</code> (least second moment of area), then optional dimensions such as <code className="font-mono">D_mm</code>,{" "}
          <code className="font-mono">t_mm</code> and <code className="font-mono">mass_kg_per_m</code>. The unit is part of each column name (cm, m, in and ft work too).{" "}
          <button type="button" className="text-info hover:underline" onClick={() => downloadText("section-catalogue-template.csv", catalogueTemplateCsv())}>
            Download a template
          </button>
        </p>
      </div>
      <button type="submit" className="btn btn-primary" disabled={busy}>
        {busy ? "Checking every row…" : "Upload catalogue"}
      </button>
      {fetcher.data?.error && !busy && (
        <>
          {rowIssues.length ? (
            <IssueList title="Nothing was stored: fix these rows and upload the file again" issues={rowIssues} />
          ) : (
            !fieldError("name") && <ErrorNote title="The catalogue was not stored">{fetcher.data.error}</ErrorNote>
          )}
        </>
      )}
    </fetcher.Form>
  );
}
