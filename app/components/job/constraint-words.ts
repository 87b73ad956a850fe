// Plain words for a constraint id of the result (docs/model-format.md: "stress:AB:LC1",
// "displacement:C:y:LC2", "volume", "buckling:AB:LC1", "area-min:bottom-chord", ...), for
// results whose shadow prices carry no sentence of their own.
export function describeConstraint(id: string): string {
  const [kind, ...rest] = id.split(":");
  switch (kind) {
    case "stress":
      return rest.length >= 2 ? `stress limit of member ${rest[0]} in load case ${rest[1]}` : `stress limit (${rest.join(", ")})`;
    case "stress-tension":
      return `tension stress limit of member ${rest[0]}${rest[1] ? ` in load case ${rest[1]}` : ""}`;
    case "stress-compression":
      return `compression stress limit of member ${rest[0]}${rest[1] ? ` in load case ${rest[1]}` : ""}`;
    case "buckling":
      return `buckling limit of member ${rest[0]}${rest[1] ? ` in load case ${rest[1]}` : ""}`;
    case "displacement":
      return rest.length >= 3
        ? `displacement limit of node ${rest[0]} in ${rest[1]} under load case ${rest[2]}`
        : `displacement limit (${rest.join(", ")})`;
    case "volume":
      return "total volume limit";
    case "area-min":
      return `minimum area of ${rest[0] ?? "a variable"}`;
    case "area-max":
      return `maximum area of ${rest[0] ?? "a variable"}`;
    case "shape-min":
      return `lower bound of shape variable ${rest[0] ?? ""}`.trim();
    case "shape-max":
      return `upper bound of shape variable ${rest[0] ?? ""}`.trim();
    case "equilibrium":
      return `equilibrium of ${rest.join(" ")}`.trim();
    default:
      return id;
  }
}

/** What the solver outcome means for the engineer, when the result carries no hint. */
export const OUTCOME_WORDS: Record<string, { title: string; tryThis: string }> = {
  optimal: { title: "Converged to an optimum", tryThis: "" },
  analysed: { title: "Analysed as given", tryThis: "" },
  "not-converged": {
    title: "Stopped before converging",
    tryThis: "Raise the iteration cap, loosen the tolerance, or start from areas closer to the expected design.",
  },
  infeasible: {
    title: "No design meets every limit",
    tryThis: "Relax the tightest limits (displacement, volume), widen the area bounds, or add members where the truss is overstressed.",
  },
  failed: {
    title: "The solver could not finish",
    tryThis: "Check the model for nearly unstable parts and very different member sizes; re-run, or queue it with the other formulation.",
  },
};
