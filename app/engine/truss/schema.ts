// The model file format (docs/model-format.md, version 1) as a zod schema, and the types
// inferred from it. Shape and value checks live here; cross-references between items
// (unknown ids, zero-length members, mechanisms, ...) are checked in rules.ts.
import { z } from "zod";

export const LENGTH_UNITS = ["m", "cm", "mm", "ft", "in"] as const;
export const FORCE_UNITS = ["N", "kN", "MN", "lbf", "kip"] as const;
export const MASS_UNITS = ["kg", "t", "lb"] as const;
export const AXES = ["x", "y", "z"] as const;

export type LengthUnit = (typeof LENGTH_UNITS)[number];
export type ForceUnit = (typeof FORCE_UNITS)[number];
export type MassUnit = (typeof MASS_UNITS)[number];
export type Axis = (typeof AXES)[number];

const finite = (what: string) => z.number({ error: `${what} must be a finite number` });
const positive = (what: string) => finite(what).gt(0, { error: `${what} must be greater than zero` });
const nonNegative = (what: string) => finite(what).min(0, { error: `${what} must not be negative` });
const id = (what: string) =>
  z
    .string({ error: `${what} must be a text id` })
    .regex(/\S/, { error: `${what} must not be empty` }) // ids are compared exactly, so no trimming
    .max(100, { error: `${what} must be at most 100 characters` });

export const unitsSchema = z.object({
  length: z.enum(LENGTH_UNITS, { error: `length unit must be one of ${LENGTH_UNITS.join(", ")}` }),
  force: z.enum(FORCE_UNITS, { error: `force unit must be one of ${FORCE_UNITS.join(", ")}` }),
  mass: z.enum(MASS_UNITS, { error: `mass unit must be one of ${MASS_UNITS.join(", ")}` }),
});

export const materialSchema = z.object({
  id: id("material id"),
  name: z.string().optional(),
  E: positive("E (elastic modulus)"),
  density: nonNegative("density"),
  allowableTension: positive("allowableTension").optional(),
  allowableCompression: positive("allowableCompression").optional(),
});

export const nodeSchema = z.object({
  id: id("node id"),
  x: finite("x"),
  y: finite("y"),
  z: finite("z").optional(),
  fixed: z.array(z.enum(AXES, { error: "fixed axes must be x, y or z" }), { error: "fixed must be a list of axes" }).optional(),
});

export const memberSchema = z.object({
  id: id("member id"),
  start: id("start node"),
  end: id("end node"),
  material: id("material"),
  // optional only when `section` is given: the model schema below fills it from the section
  area: positive("area").optional(),
  group: id("group").optional(),
  /** effective-length factor k of this member; overrides design.constraints.buckling.effectiveLengthFactor */
  bucklingFactor: positive("bucklingFactor").optional(),
  /** starting section, an id in `sections` (its area replaces `area`) */
  section: id("section").optional(),
});

/** One catalogue section: area and least second moment of area I, in the model's units. */
export const sectionSchema = z.object({
  id: id("section id"),
  area: positive("section area"),
  I: positive("I (least second moment of area)"),
  family: z.string({ error: "family must be text" }).max(100, { error: "family must be at most 100 characters" }).optional(),
});

export const COMBINATION_USES = ["strength", "service"] as const;

export const combinationSchema = z.object({
  id: id("combination id"),
  name: z.string().max(200, { error: "combination name must be at most 200 characters" }).optional(),
  use: z.enum(COMBINATION_USES, { error: "use must be strength or service" }),
  factors: z.record(z.string(), finite("combination factor"), { error: "factors must map load case ids to numbers" }),
});

export const loadSchema = z.object({
  node: id("loaded node"),
  fx: finite("fx").optional(),
  fy: finite("fy").optional(),
  fz: finite("fz").optional(),
});

export const loadCaseSchema = z.object({
  id: id("load case id"),
  name: z.string().max(200, { error: "load case name must be at most 200 characters" }).optional(),
  loads: z.array(loadSchema, { error: "loads must be a list" }),
  /** factor on the structure's own weight in this case (gravity -y in 2D, -z in 3D) */
  selfWeight: finite("selfWeight").optional(),
});

const boundsSchema = z.object({ min: positive("min"), max: positive("max") });

export const groupSchema = z.object({ id: id("group id"), min: positive("min").optional(), max: positive("max").optional() });

export const shapeMoveSchema = z.object({
  node: id("moved node"),
  axis: z.enum(AXES, { error: "axis must be x, y or z" }),
  factor: finite("factor").default(1),
});

export const shapeVariableSchema = z.object({
  id: id("shape variable id"),
  min: finite("min"),
  max: finite("max"),
  moves: z.array(shapeMoveSchema, { error: "moves must be a list" }).min(1, { error: "a shape variable must move at least one node" }),
});

export const displacementLimitSchema = z.object({
  node: id("node"),
  axis: z.enum(["x", "y", "z", "all"], { error: "axis must be x, y, z or all" }),
  limit: positive("limit"),
});

export const constraintsSchema = z.object({
  stress: z.boolean({ error: "stress must be true or false" }).optional(),
  displacement: z.array(displacementLimitSchema, { error: "displacement must be a list of limits" }).optional(),
  volume: z.object({ max: positive("volume max") }).optional(),
  buckling: z
    .object({
      // not needed when the model lists sections (I then comes from the catalogue)
      sectionRatio: positive("sectionRatio").optional(),
      effectiveLengthFactor: positive("effectiveLengthFactor").default(1),
    })
    .optional(),
});

export const designSchema = z.object({
  objective: z.enum(["mass", "compliance"], { error: "objective must be mass or compliance" }),
  formulation: z.enum(["nested", "simultaneous"], { error: "formulation must be nested or simultaneous" }).default("nested"),
  sizing: z.enum(["continuous", "catalogue"], { error: "sizing must be continuous or catalogue" }).optional(),
  areaBounds: boundsSchema.optional(),
  groups: z.array(groupSchema, { error: "groups must be a list" }).optional(),
  shape: z.array(shapeVariableSchema, { error: "shape must be a list" }).optional(),
  constraints: constraintsSchema.optional(),
  solver: z
    .object({
      maxIterations: z.number().int({ error: "maxIterations must be a whole number" }).min(1).max(100000).optional(),
      tolerance: positive("tolerance").optional(),
    })
    .optional(),
});

const modelObjectSchema = z.object({
  format: z.literal("strutwise.truss", { error: 'format must be exactly "strutwise.truss"' }),
  version: z.literal(1, { error: "version must be 1" }),
  name: z
    .string({ error: "name must be text" })
    .trim()
    .min(1, { error: "name must not be empty" })
    .max(200, { error: "name must be at most 200 characters" }),
  description: z.string({ error: "description must be text" }).optional(),
  units: unitsSchema,
  dimension: z.union([z.literal(2), z.literal(3)], { error: "dimension must be 2 or 3" }),
  materials: z.array(materialSchema, { error: "materials must be a list" }).min(1, { error: "at least one material is needed" }),
  nodes: z.array(nodeSchema, { error: "nodes must be a list" }).min(2, { error: "at least two nodes are needed" }),
  members: z.array(memberSchema, { error: "members must be a list" }).min(1, { error: "at least one member is needed" }),
  loadCases: z.array(loadCaseSchema, { error: "loadCases must be a list" }).min(1, { error: "at least one load case is needed" }),
  sections: z.array(sectionSchema, { error: "sections must be a list" }).optional(),
  combinations: z.array(combinationSchema, { error: "combinations must be a list" }).optional(),
  design: designSchema.optional(),
});

type ParsedModelObject = z.infer<typeof modelObjectSchema>;
export type Member = Omit<ParsedModelObject["members"][number], "area"> & { area: number };
export type TrussModel = Omit<ParsedModelObject, "members"> & { members: Member[] };

/**
 * A member with a section starts from the section's area (docs/model-format.md); the
 * rules (rules.ts) report a member with neither an area nor a known section, so every member of
 * a model that passes them has an area.
 */
function withSectionAreas(m: ParsedModelObject): TrussModel {
  const byId = new Map((m.sections ?? []).map((s) => [s.id, s]));
  const members = m.members.map((mm) => {
    const sec = mm.section !== undefined ? byId.get(mm.section) : undefined;
    return { ...mm, area: sec ? sec.area : (mm.area ?? Number.NaN) };
  });
  return { ...m, members };
}

export const trussModelSchema = modelObjectSchema.transform(withSectionAreas);

export type TrussModelInput = z.input<typeof modelObjectSchema>;
export type Units = z.infer<typeof unitsSchema>;
export type Material = z.infer<typeof materialSchema>;
export type TrussNode = z.infer<typeof nodeSchema>;
export type Load = z.infer<typeof loadSchema>;
export type LoadCase = z.infer<typeof loadCaseSchema>;
export type DesignBlock = z.infer<typeof designSchema>;
export type DesignGroup = z.infer<typeof groupSchema>;
export type ShapeVariable = z.infer<typeof shapeVariableSchema>;
export type DisplacementLimit = z.infer<typeof displacementLimitSchema>;
export type Section = z.infer<typeof sectionSchema>;
export type Combination = z.infer<typeof combinationSchema>;
export type CombinationUse = (typeof COMBINATION_USES)[number];

/** Keys each object may carry; anything else is reported as an ignored field (a typo guard). */
export const KNOWN_KEYS = {
  root: ["format", "version", "name", "description", "units", "dimension", "materials", "nodes", "members", "loadCases", "sections", "combinations", "design"],
  material: ["id", "name", "E", "density", "allowableTension", "allowableCompression"],
  node: ["id", "x", "y", "z", "fixed"],
  member: ["id", "start", "end", "material", "area", "group", "bucklingFactor", "section"],
  loadCase: ["id", "name", "loads", "selfWeight"],
  section: ["id", "area", "I", "family"],
  combination: ["id", "name", "use", "factors"],
  load: ["node", "fx", "fy", "fz"],
  design: ["objective", "formulation", "sizing", "areaBounds", "groups", "shape", "constraints", "solver"],
} as const;
