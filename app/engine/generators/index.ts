// The generators: parametric trusses an engineer asks for every week. Each has a kind, words
// for the form, a zod schema of its parameters (defaults and units included) and a pure build
// function returning a complete model (or the parameters it refuses, by name).
import { z } from "zod";
import type { TrussModelInput } from "../truss";
import { planarParameters, planarTruss } from "./planar";
import { spaceGrid, spaceGridParameters } from "./space-grid";
import { latticeTower, towerParameters } from "./tower";

export interface ParameterProblem {
  path: string;
  message: string;
}

export type GenerateResult = { ok: true; model: TrussModelInput } | { ok: false; errors: ParameterProblem[] };

export interface Generator {
  kind: string;
  name: string;
  description: string;
  parameters: z.ZodType;
  build(params: never): GenerateResult;
}

function generator<S extends z.ZodType>(g: { kind: string; name: string; description: string; parameters: S; build(p: z.output<S>): GenerateResult }): Generator {
  return g as unknown as Generator;
}

export const GENERATORS: readonly Generator[] = [
  generator({
    kind: "planar-truss",
    name: "Girder or roof truss (2D)",
    description: "Pratt, Howe or Warren web (with or without verticals) over a flat, duo-pitch or mono-pitch top chord; pinned and roller or two pinned supports; a line load on the top chord.",
    parameters: planarParameters,
    build: planarTruss,
  }),
  generator({
    kind: "lattice-tower",
    name: "Lattice tower or mast (3D)",
    description: "3 or 4 legs, tapered or straight, single-diagonal, X or K face bracing, plan bracing every n panels; pinned base and a load at the top.",
    parameters: towerParameters,
    build: latticeTower,
  }),
  generator({
    kind: "space-grid",
    name: "Double-layer space grid (3D)",
    description: "Offset or aligned layers over a rectangle of modules, supported along the edges or at the corners, with an area load on the top layer.",
    parameters: spaceGridParameters,
    build: spaceGrid,
  }),
];

export function findGenerator(kind: string): Generator | undefined {
  return GENERATORS.find((g) => g.kind === kind);
}

/** Parameters in, a model out; every bad parameter named (unknown ones too). */
export function generateModel(kind: string, params: unknown): GenerateResult | null {
  const g = findGenerator(kind);
  if (!g) return null;
  const parsed = g.parameters.safeParse(params ?? {});
  if (!parsed.success) {
    const errors: ParameterProblem[] = [];
    for (const issue of parsed.error.issues) {
      if (issue.code === "unrecognized_keys") for (const key of issue.keys) errors.push({ path: key, message: `"${key}" is not a parameter of ${kind}` });
      else errors.push({ path: issue.path.map(String).join(".") || "(parameters)", message: issue.message });
    }
    return { ok: false, errors };
  }
  return g.build(parsed.data as never);
}

/** The JSON Schema of a generator's parameters (what the form and GET /api/generators show). */
export function parameterSchema(g: Generator): Record<string, unknown> {
  return z.toJSONSchema(g.parameters, { io: "input" }) as Record<string, unknown>;
}

export { planarParameters, towerParameters, spaceGridParameters };
