// What a bound computation hands back: the bound with the LP's areas, or the reason for none.
import type { LowerBound } from "../design/result-types";

export type BoundOutcome =
  | { kind: "bound"; lowerBound: LowerBound; plasticAreas: Float64Array | null }
  | { kind: "withheld"; reason: string };
