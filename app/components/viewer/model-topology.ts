// The parts of an uploaded model file the viewer needs (geometry, supports, loads), from
// the file as stored: no validation here, the upload already did that.
import type { ModelLike } from "./truss-view";

/** The file as stored may give a member its catalogue section instead of an area. */
type StoredModel = Partial<Omit<ModelLike, "members">> & {
  members?: (Omit<ModelLike["members"][number], "area"> & { area?: number; section?: string })[];
  sections?: { id: string; area: number }[];
};

export function topologyOf(file: unknown): ModelLike | null {
  const m = file as StoredModel | null;
  if (!m || !Array.isArray(m.nodes) || !Array.isArray(m.members) || !Array.isArray(m.loadCases)) return null;
  const sectionArea = new Map((Array.isArray(m.sections) ? m.sections : []).map((s) => [s.id, s.area]));
  return {
    dimension: m.dimension === 3 ? 3 : 2,
    units: m.units,
    nodes: m.nodes.map((n) => ({ id: n.id, x: n.x, y: n.y, z: n.z, fixed: n.fixed })),
    // a member given by its catalogue section alone takes the section's area (docs/model-format.md)
    members: m.members.map((x) => ({ id: x.id, start: x.start, end: x.end, area: x.area ?? sectionArea.get(x.section ?? "") ?? 0, group: x.group })),
    loadCases: m.loadCases.map((lc) => ({ id: lc.id, name: lc.name, loads: lc.loads })),
    ...(Array.isArray(m.combinations) ? { combinations: m.combinations.map((c) => ({ id: c.id, name: c.name, factors: c.factors ?? {} })) } : {}),
  };
}
