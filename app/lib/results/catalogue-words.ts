// Plain words for why a catalogue variable sits where it does (CatalogueChoice.steppedBy):
// the limit a one-step lighter section would break, by the engine's constraint id.
import { constraintWords, type ConstraintContext } from "~/engine/design/constraint-words";

export function steppedByWords(steppedBy: string, ctx?: ConstraintContext): string {
  if (steppedBy === "lightest") return "nothing: the lightest section within its bounds";
  return constraintWords(steppedBy, ctx);
}
