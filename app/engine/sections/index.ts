export { fitSecondMoment, type SectionFit, type SectionLike } from "./fit";
export { genericCatalogue, circularHollow, squareHollow, solidRound, CHS_DIAMETERS, SHS_WIDTHS, HOLLOW_WALLS, ROUND_DIAMETERS, type CatalogueSection, type GenericFamily } from "./generic";
export { sectionLadder, type LadderStep } from "./ladder";
