// The editor's catalogue option: replace the model's `sections` with a catalogue's (one family
// or all), converted to the model's length unit, as the upload option does. The list and the
// sections come from the API the page's user may read (/api/catalogues).
import { useEffect, useState } from "react";
import { sectionsInUnit } from "~/lib/catalogues/apply";
import type { Catalogue, CatalogueSummary } from "~/lib/catalogues/types";

export function EditorSections({ lengthUnit, count, onChange }: { lengthUnit: string; count: number; onChange: (sections: ReturnType<typeof sectionsInUnit>) => void }) {
  const [catalogues, setCatalogues] = useState<CatalogueSummary[] | null>(null);
  const [id, setId] = useState("");
  const [family, setFamily] = useState("");
  const [note, setNote] = useState<string | null>(null);
  useEffect(() => {
    fetch("/api/catalogues", { headers: { Accept: "application/json" } })
      .then((r) => (r.ok ? r.json() : Promise.reject(new Error(`catalogues could not be loaded (${r.status})`))))
      .then((b: { catalogues: CatalogueSummary[] }) => setCatalogues(b.catalogues))
      .catch((e: Error) => setNote(e.message));
  }, []);
  const chosen = catalogues?.find((c) => c.id === id);
  const apply = async () => {
    const res = await fetch(`/api/catalogues/${encodeURIComponent(id)}`, { headers: { Accept: "application/json" } });
    if (!res.ok) return setNote(`The catalogue could not be loaded (${res.status})`);
    const c = (await res.json()) as Catalogue;
    const picked = family ? c.sections.filter((s) => s.family === family) : c.sections;
    onChange(sectionsInUnit(picked, lengthUnit));
    setNote(`${picked.length} sections of "${c.name}" are now the model's sections (in ${lengthUnit}); save to keep them.`);
  };
  return (
    <div className="flex flex-wrap items-end gap-3 text-sm" data-testid="editor-sections">
      <p className="w-full text-ink-soft">
        The model lists {count} section{count === 1 ? "" : "s"}. A member's <code className="font-mono">section</code> names one of them. Take them from a catalogue:
      </p>
      <select className="field-input w-auto py-1" value={id} onChange={(e) => (setId(e.target.value), setFamily(""))} aria-label="Catalogue">
        <option value="">choose a catalogue…</option>
        {(catalogues ?? []).map((c) => (
          <option key={c.id} value={c.id}>
            {c.name} ({c.sectionCount})
          </option>
        ))}
      </select>
      {chosen && chosen.families.length > 1 && (
        <select className="field-input w-auto py-1" value={family} onChange={(e) => setFamily(e.target.value)} aria-label="Family">
          <option value="">all families</option>
          {chosen.families.map((f) => (
            <option key={f} value={f}>
              {f}
            </option>
          ))}
        </select>
      )}
      <button type="button" className="btn btn-secondary px-3 py-1" disabled={!id} onClick={() => void apply()}>
        Use these sections
      </button>
      {note && <p className="w-full text-ink-muted" role="status">{note}</p>}
    </div>
  );
}
