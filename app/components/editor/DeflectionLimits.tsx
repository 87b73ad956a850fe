// The design form's deflection limits: one row per limit (a node or "*" for every node, a
// direction, the limit in the model's length), each also read as span / ratio (height / ratio
// for a sideways limit), where typing a ratio sets the limit. span / 250 is the proposed
// default: common practice for service deflection, not a code rule.
import { useState } from "react";
import { formatNumber } from "~/lib/format";
import { DEFAULT_DEFLECTION_RATIO, limitForRatio, ratioOfLimit, referenceLength, type GravityAxis } from "./design-fields";
import type { GridRow } from "./EditableGrid";
import { FieldProblems, problemsAt, type Problem } from "./field-problems";

type Nodes = { x: number; y: number; z?: number }[];

interface Props {
  rows: GridRow[];
  onChange(rows: GridRow[]): void;
  nodes: Nodes;
  nodeIds: string[];
  dimension: 2 | 3;
  gravity: GravityAxis;
  lengthUnit: string;
  problems: Problem[];
}

export function DeflectionLimits({ rows, onChange, nodes, nodeIds, dimension, gravity, lengthUnit: L, problems }: Props) {
  const axes = dimension === 3 ? ["x", "y", "z", "all"] : ["x", "y", "all"];
  const set = (i: number, patch: GridRow) => onChange(rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  const span = referenceLength(nodes, gravity, gravity).length;
  const add = () => onChange([...rows, { node: "*", axis: gravity, limit: limitForRatio(span, DEFAULT_DEFLECTION_RATIO) }]);
  return (
    <fieldset className="space-y-2" data-testid="deflection-limits">
      <legend className="text-sm font-medium">Deflection limits</legend>
      <p className="text-xs text-ink-muted">
        Each limit bounds a node's displacement along one direction in every load case ("all": each direction separately). Node <span className="font-mono">*</span> is every node. The
        proposed limit is span / {DEFAULT_DEFLECTION_RATIO} ({formatNumber(span)} {L} / {DEFAULT_DEFLECTION_RATIO}) — common practice for service deflection, not a code rule: set what your code and client ask for.
      </p>
      {rows.length > 0 && (
        <table className="w-full text-sm">
          <thead className="text-left text-xs text-ink-soft">
            <tr>
              <th className="py-1 pr-2 font-medium">node</th>
              <th className="py-1 pr-2 font-medium">direction</th>
              <th className="py-1 pr-2 font-medium">limit ({L})</th>
              <th className="py-1 pr-2 font-medium">as a fraction</th>
              <th className="sr-only">remove</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r, i) => {
              const ref = referenceLength(nodes, r.axis ?? "", gravity);
              const at = `design.constraints.displacement[${i}]`;
              return (
                <tr key={i} className="align-top">
                  <td className="py-1 pr-2">
                    <input className="field-input py-1 font-mono" list="design-node-ids" aria-label={`deflection limit ${i + 1} node`} aria-invalid={problemsAt(problems, `${at}.node`).length > 0} value={r.node ?? ""} onChange={(e) => set(i, { node: e.target.value })} />
                  </td>
                  <td className="py-1 pr-2">
                    <select className="field-input py-1" aria-label={`deflection limit ${i + 1} direction`} value={r.axis ?? ""} onChange={(e) => set(i, { axis: e.target.value })}>
                      {!axes.includes(r.axis ?? "") && <option value={r.axis ?? ""}>{r.axis || "choose…"}</option>}
                      {axes.map((a) => (
                        <option key={a} value={a}>
                          {a === "all" ? "all directions" : a}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td className="py-1 pr-2">
                    <input className="field-input py-1 text-right font-mono" inputMode="decimal" aria-label={`deflection limit ${i + 1} limit (${L})`} aria-invalid={problemsAt(problems, `${at}.limit`).length > 0} value={r.limit ?? ""} onChange={(e) => set(i, { limit: e.target.value })} />
                  </td>
                  <td className="py-1 pr-2">
                    <RatioInput label={`deflection limit ${i + 1} as ${ref.basis} divided by`} basis={ref.basis} length={ref.length} limit={r.limit ?? ""} onLimit={(limit) => set(i, { limit })} />
                  </td>
                  <td className="py-1">
                    <button type="button" className="px-2 py-1 text-ink-muted hover:text-bad" aria-label={`remove deflection limit ${i + 1}`} onClick={() => onChange(rows.filter((_, k) => k !== i))}>
                      ×
                    </button>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
      {rows.map((_, i) => (
        <FieldProblems key={i} problems={problemsAt(problems, `design.constraints.displacement[${i}]`)} />
      ))}
      <datalist id="design-node-ids">
        <option value="*">every node</option>
        {nodeIds.slice(0, 2000).map((id) => (
          <option key={id} value={id} />
        ))}
      </datalist>
      <button type="button" className="btn btn-secondary px-3 py-1 text-sm" onClick={add}>
        Add a limit (span / {DEFAULT_DEFLECTION_RATIO})
      </button>
    </fieldset>
  );
}

/** The limit as span / ratio; the typed text is kept while the field has focus, so typing "36" on the way to "360" does not jump. */
function RatioInput({ label, basis, length, limit, onLimit }: { label: string; basis: string; length: number; limit: string; onLimit(limit: string): void }) {
  const [typing, setTyping] = useState<string | null>(null);
  const ratio = ratioOfLimit(length, limit);
  const shown = typing ?? (ratio === null ? "" : String(Number(ratio.toPrecision(4))));
  return (
    <span className="flex items-center gap-1 whitespace-nowrap text-ink-soft">
      {basis} /
      <input
        className="field-input w-24 py-1 text-right font-mono"
        inputMode="decimal"
        aria-label={label}
        value={shown}
        disabled={!(length > 0)}
        onFocus={() => setTyping(shown)}
        onBlur={() => setTyping(null)}
        onChange={(e) => {
          setTyping(e.target.value);
          const n = Number(e.target.value);
          if (e.target.value.trim() && n > 0) onLimit(limitForRatio(length, n));
        }}
      />
    </span>
  );
}
