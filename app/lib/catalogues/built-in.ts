// The catalogue every desk has: the engine's generic sections (app/engine/sections/generic.ts,
// circular and square hollow sections and solid rounds worked out from their dimensions),
// offered beside the stored catalogues under a fixed id. Generated once per process.
import { genericCatalogue } from "~/engine/sections";
import { BUILT_IN_CATALOGUE_ID, type Catalogue, type CatalogueSection } from "./types";

let cached: Catalogue | null = null;

export function builtInCatalogue(): Catalogue {
  if (cached) return cached;
  const sections: CatalogueSection[] = genericCatalogue("mm").map((s) => {
    const dimensions: Record<string, number> = { outer: s.dimensions.outer };
    if (s.dimensions.wall !== undefined) dimensions.wall = s.dimensions.wall;
    return { id: s.id, family: s.family, area: s.area, I: s.I, dimensions };
  });
  const catalogue: Catalogue = {
    id: BUILT_IN_CATALOGUE_ID,
    name: "Strutwise generic sections",
    description:
      "Circular hollow (CHS), square hollow (SHS, sharp corners) and solid round (RND) sections over a common series of outer sizes and wall thicknesses, each worked out from its dimensions. For studies: a project's own catalogue replaces it for construction.",
    builtIn: true,
    sectionCount: sections.length,
    families: [...new Set(sections.map((s) => s.family))],
    fileName: null,
    sha256: null,
    createdAt: null,
    createdBy: null,
    retiredAt: null,
    retiredBy: null,
    retireReason: null,
    sections,
    dimensionNames: ["outer", "wall"],
  };
  cached = catalogue;
  return catalogue;
}
