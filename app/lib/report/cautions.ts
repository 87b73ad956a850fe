// The licensed-engineer cautions of product.md, in every report (and on the result pages).
export const CAUTION_TITLE = "Check before use";

export const CAUTION_TEXT =
  "Results are a design aid, not a design. A licensed or chartered structural engineer must check " +
  "and take responsibility for any design against the governing local code: load combinations and " +
  "factors, member stability beyond the Euler check (lateral-torsional and local buckling, effective " +
  "lengths), connections, fatigue, dynamic and second-order effects, fabrication and erection.";

export const CAUTION_SHORT = "Design aid, not a design: a licensed structural engineer must check it against the governing code.";
