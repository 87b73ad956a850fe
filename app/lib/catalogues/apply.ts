// A model takes its sections from a catalogue: the catalogue's sections (optionally only some
// families) are copied into the model's "sections" list (docs/model-format.md),
// converted from the catalogue's mm to the model's length unit. A copy, not a reference, so a
// stored model stays self-contained: retiring the catalogue later changes no model and no job.
import type { CatalogueSection } from "./types";

const MM_IN: Record<string, number> = { mm: 1, cm: 10, m: 1000, in: 25.4, ft: 304.8 };

export interface ModelSection {
  id: string;
  area: number;
  I: number;
  family: string;
}

export type ApplyResult =
  | { ok: true; model: Record<string, unknown>; sectionCount: number; warnings: { path: string; message: string }[] }
  | { ok: false; error: string; details: { path: string; message: string }[] };

/** The sections in a model's length unit; `lengthUnit` must be one the format allows. */
export function sectionsInUnit(sections: CatalogueSection[], lengthUnit: string): ModelSection[] {
  const mm = MM_IN[lengthUnit];
  if (!mm) throw new RangeError(`"${lengthUnit}" is not a length unit of the model format`);
  return sections.map((s) => ({ id: s.id, area: s.area / mm ** 2, I: s.I / mm ** 4, family: s.family }));
}

/**
 * The model with the catalogue's sections in place. `families` narrows the copy (empty: all).
 * Refuses a model without a readable length unit and a choice that leaves no section; the rest
 * of the model is the engine's to check at upload, as for any file.
 */
export function applyCatalogue(
  model: unknown,
  catalogue: { name: string; sections: CatalogueSection[] },
  families: string[] = [],
): ApplyResult {
  if (!model || typeof model !== "object" || Array.isArray(model)) {
    return { ok: false, error: "The file is not a truss model object", details: [{ path: "(file)", message: "expected a JSON object" }] };
  }
  const m = model as Record<string, unknown>;
  const unit = (m.units as { length?: unknown } | undefined)?.length;
  if (typeof unit !== "string" || !MM_IN[unit]) {
    return {
      ok: false,
      error: `Sections from "${catalogue.name}" need the model's length unit to convert them`,
      details: [{ path: "units.length", message: `must be one of ${Object.keys(MM_IN).join(", ")} to take catalogue sections` }],
    };
  }
  const known = new Set(catalogue.sections.map((s) => s.family));
  const unknown = families.filter((f) => !known.has(f));
  if (unknown.length) {
    return {
      ok: false,
      error: `The catalogue "${catalogue.name}" has no family ${unknown.map((f) => `"${f}"`).join(", ")}`,
      details: unknown.map((f) => ({ path: "catalogueFamilies", message: `"${f}" is not a family of this catalogue (it has ${[...known].join(", ")})` })),
    };
  }
  const chosen = families.length ? catalogue.sections.filter((s) => families.includes(s.family)) : catalogue.sections;
  const warnings: { path: string; message: string }[] = [];
  if (Array.isArray(m.sections) && m.sections.length > 0) {
    warnings.push({ path: "sections", message: `the file's own ${m.sections.length} sections were replaced by ${chosen.length} from the catalogue "${catalogue.name}"` });
  }
  return { ok: true, model: { ...m, sections: sectionsInUnit(chosen, unit) }, sectionCount: chosen.length, warnings };
}
