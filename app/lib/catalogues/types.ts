// A section catalogue as the desk keeps it. Every stored figure is in one fixed unit system,
// whatever the uploaded file used: lengths in mm, areas in mm², second moments in mm⁴, mass
// per length in kg/m. A model takes a copy converted to its own length unit (apply.ts).

export const CATALOGUE_UNITS = { length: "mm", area: "mm²", I: "mm⁴", massPerLength: "kg/m" } as const;

export interface CatalogueSection {
  id: string;
  family: string;
  /** cross-section area, mm² */
  area: number;
  /** least second moment of area, mm⁴ */
  I: number;
  /** named dimensions (outer diameter, wall...), mm */
  dimensions?: Record<string, number>;
  /** kg/m */
  massPerLength?: number;
}

/** The id of the generated catalogue every desk has; stored catalogues have UUIDs. */
export const BUILT_IN_CATALOGUE_ID = "built-in";

export interface CatalogueSummary {
  id: string;
  name: string;
  description: string | null;
  builtIn: boolean;
  sectionCount: number;
  families: string[];
  fileName: string | null;
  sha256: string | null;
  createdAt: string | null;
  createdBy: string | null; // name or e-mail of the uploader
  retiredAt: string | null;
  retiredBy: string | null;
  retireReason: string | null;
}

export interface Catalogue extends CatalogueSummary {
  sections: CatalogueSection[];
  /** names of the dimension columns the sections carry, in file order */
  dimensionNames: string[];
}
