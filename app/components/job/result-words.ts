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
