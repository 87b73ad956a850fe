// The licensed-engineer cautions of product.md. Shown wherever results appear; the wording
// is ours, the meaning is the one the product promises in every report.
export const CAUTION_TEXT =
  "Results are a design aid, not a design. A licensed or chartered structural engineer must check " +
  "and take responsibility for any design against the governing local code: load combinations and " +
  "factors, member stability beyond the Euler check (lateral-torsional and local buckling, effective " +
  "lengths), connections, fatigue, dynamic and second-order effects, fabrication and erection.";

export function Cautions({ compact = false }: { compact?: boolean }) {
  return (
    <aside className="caution" role="note" aria-label="Engineering cautions" data-testid="cautions">
      <p className={compact ? "text-xs" : undefined}>
        <strong className="font-semibold text-ink">Check before use. </strong>
        {CAUTION_TEXT}
      </p>
    </aside>
  );
}
