// Plain words for why a catalogue variable sits where it does (CatalogueChoice.steppedBy):
// the limit a one-step lighter section would break, by the engine's constraint id.
import { describeConstraint } from "~/components/job/constraint-words";

export function steppedByWords(steppedBy: string): string {
  if (steppedBy === "lightest") return "nothing: the lightest section within its bounds";
  return describeConstraint(steppedBy);
}
