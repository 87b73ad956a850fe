// optimizeModel: a validated model in, the result JSON of docs/model-format.md out; continuous
// sizing (result.ts) or catalogue sizing (catalogue-run.ts) as the design block asks.
import type { TrussModel } from "../truss";
import type { DesignModel } from "./model-shape";
import type { TrussResult } from "./result-types";
import { optimizeContinuous, type OptimizeOptions } from "./result";
import { optimizeCatalogue } from "./catalogue-run";

export function optimizeModel(model: TrussModel | DesignModel, options: OptimizeOptions = {}): TrussResult {
  return model.design?.sizing === "catalogue" ? optimizeCatalogue(model, options) : optimizeContinuous(model, options);
}
