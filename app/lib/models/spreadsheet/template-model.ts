// The example the import templates are filled with: a small roof truss of our own (the
// invented Pellow Lane cycle shelter), so every column shows a value in its place.
import { generateModel } from "~/engine/generators";

export function templateModel(): Record<string, unknown> {
  const r = generateModel("planar-truss", { name: "Pellow Lane cycle shelter truss", pattern: "pratt", chord: "duo-pitch", span: 9, panels: 6, depth: 0.6, ridgeDepth: 1.5, lineLoad: 4 });
  if (!r || !r.ok) throw new Error("the template generator parameters are refused");
  return r.model as Record<string, unknown>;
}
