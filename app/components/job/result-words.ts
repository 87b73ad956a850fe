// What the design shown on a job page is, in words that never promise more than the run
// delivered: only an optimum is "the optimized truss".
export function viewerTitle(outcome: string | null | undefined): string {
  switch (outcome) {
    case null:
    case undefined:
      return "Initial geometry";
    case "optimal":
      return "Optimized truss";
    case "analysed":
      return "Truss as given, analysed";
    case "not-converged":
      return "Best design found (the run stopped before converging)";
    case "infeasible":
      return "Least-violating design found — it does not meet every limit";
    case "cancelled":
      return "Best design found before the run was stopped";
    default:
      return "Design of this run";
  }
}

/** "1 limit exceeded", "3 limits exceeded" */
export function countOf(n: number, one: string, many: string): string {
  return `${n} ${n === 1 ? one : many}`;
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

/** The two formulations in a few plain words (the queue form and the job page say the same). */
export const FORMULATION_WORDS: Record<string, string> = {
  nested: "nested — displacements from a stiffness solve",
  simultaneous: "simultaneous — equilibrium as constraints",
};

export function formulationWords(f: string): string {
  return FORMULATION_WORDS[f] ?? f;
}
