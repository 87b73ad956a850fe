// The sections one area variable may take, lightest first: those whose area lies within the
// variable's bounds, without the dominated ones (a section no lighter than another and no
// stiffer against buckling is never worth choosing), so that each step up adds area and I.
import type { SectionLike } from "./fit";

export interface LadderStep {
  section: number; // index into the catalogue
  area: number;
  I: number;
}

export function sectionLadder(sections: readonly SectionLike[], min: number, max: number): LadderStep[] {
  const inBounds = sections
    .map((s, k) => ({ section: k, area: s.area, I: s.I }))
    .filter((s) => s.area >= min && s.area <= max)
    .sort((a, b) => a.area - b.area || b.I - a.I);
  const out: LadderStep[] = [];
  for (const s of inBounds) {
    const last = out[out.length - 1];
    if (last && s.I <= last.I) continue; // dominated: as heavy or heavier, no stiffer
    if (last && s.area === last.area) continue;
    out.push(s);
  }
  return out;
}
