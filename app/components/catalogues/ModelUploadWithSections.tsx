// The project page's model upload with its one option: take the members' sections from one of
// the desk's catalogues (copied into the model at upload, in the model's units).
import { useMemo, useState } from "react";
import { Link } from "react-router";
import { UploadBox } from "~/components/ui/UploadBox";

export interface CatalogueChoice {
  id: string;
  name: string;
  sectionCount: number;
  families: string[];
}

export function ModelUploadWithSections({ projectId, limitBytes, catalogues }: { projectId: string; limitBytes: number; catalogues: CatalogueChoice[] }) {
  const [catalogueId, setCatalogueId] = useState("");
  const [family, setFamily] = useState("");
  const chosen = catalogues.find((c) => c.id === catalogueId);
  const fields = useMemo(() => ({ catalogueId, catalogueFamilies: family }), [catalogueId, family]);
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-4 text-sm">
        <label className="flex flex-col gap-1">
          <span className="field-label">Sections from a catalogue</span>
          <select
            className="field-input w-auto py-1"
            value={catalogueId}
            onChange={(e) => {
              setCatalogueId(e.target.value);
              setFamily("");
            }}
            data-testid="upload-catalogue"
          >
            <option value="">none: as in the file</option>
            {catalogues.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name} ({c.sectionCount} sections)
              </option>
            ))}
          </select>
        </label>
        {chosen && chosen.families.length > 1 && (
          <label className="flex flex-col gap-1">
            <span className="field-label">Family</span>
            <select className="field-input w-auto py-1" value={family} onChange={(e) => setFamily(e.target.value)} data-testid="upload-catalogue-family">
              <option value="">all {chosen.families.length} families</option>
              {chosen.families.map((f) => (
                <option key={f} value={f}>
                  {f}
                </option>
              ))}
            </select>
          </label>
        )}
        <p className="max-w-md text-xs text-ink-muted">
          The chosen sections are copied into the model, converted to its length unit; a later change to the catalogue changes no stored model.{" "}
          <Link to="/catalogues" className="text-info hover:underline">
            Catalogues
          </Link>
        </p>
      </div>
      <UploadBox projectId={projectId} limitBytes={limitBytes} fields={fields} />
    </div>
  );
}
