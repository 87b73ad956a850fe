// An editable table for thousands of rows: only the visible rows are rendered
// (@tanstack/react-virtual). Keyboard: Enter or ArrowDown moves down a row, ArrowUp up, Tab
// across (the browser's own); pasting a block copied from a spreadsheet (tab-separated rows)
// fills the cells from the one pasted into, adding rows as needed.
import { useVirtualizer } from "@tanstack/react-virtual";
import { useEffect, useRef, type ClipboardEvent, type KeyboardEvent } from "react";

export interface GridColumn {
  key: string;
  label: string;
  width?: string;
  numeric?: boolean;
}

export type GridRow = Record<string, string>;

interface Props {
  name: string;
  columns: GridColumn[];
  rows: GridRow[];
  onChange(rows: GridRow[]): void;
  selected?: number | null;
  onSelect?(index: number | null): void;
  /** rows that a validation problem points at */
  flagged?: Set<number>;
  height?: number;
}

const ROW_HEIGHT = 30;

export function EditableGrid({ name, columns, rows, onChange, selected, onSelect, flagged, height = 360 }: Props) {
  const parent = useRef<HTMLDivElement>(null);
  const virtualizer = useVirtualizer({ count: rows.length, getScrollElement: () => parent.current, estimateSize: () => ROW_HEIGHT, overscan: 12 });
  // a row selected from outside (a click in the preview) scrolls into view; one selected by
  // focusing its cells is in view already
  useEffect(() => {
    if (selected === null || selected === undefined || selected >= rows.length) return;
    if (parent.current?.contains(document.activeElement)) return;
    virtualizer.scrollToIndex(selected, { align: "center" });
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [selected]);

  const setCell = (r: number, key: string, value: string) => {
    const next = rows.slice();
    next[r] = { ...next[r], [key]: value };
    onChange(next);
  };
  const focusCell = (r: number, c: number) => {
    virtualizer.scrollToIndex(r);
    requestAnimationFrame(() => parent.current?.querySelector<HTMLInputElement>(`[data-cell="${r}:${c}"]`)?.focus());
  };
  const onKey = (e: KeyboardEvent<HTMLInputElement>, r: number, c: number) => {
    if ((e.key === "Enter" || e.key === "ArrowDown") && r + 1 < rows.length) {
      e.preventDefault();
      focusCell(r + 1, c);
    } else if (e.key === "ArrowUp" && r > 0) {
      e.preventDefault();
      focusCell(r - 1, c);
    }
  };
  const onPaste = (e: ClipboardEvent<HTMLInputElement>, r: number, c: number) => {
    const text = e.clipboardData.getData("text/plain");
    if (!text.includes("\t") && !text.includes("\n")) return; // one value: the input takes it
    e.preventDefault();
    const block = text.replace(/\r/g, "").replace(/\n$/, "").split("\n").map((line) => line.split("\t"));
    const next = rows.slice();
    block.forEach((cells, i) => {
      const row = { ...(next[r + i] ?? Object.fromEntries(columns.map((col) => [col.key, ""]))) };
      cells.forEach((v, j) => {
        const col = columns[c + j];
        if (col) row[col.key] = v.trim();
      });
      next[r + i] = row;
    });
    onChange(next);
  };

  return (
    <div className="rounded-md border border-rule" data-testid={`grid-${name}`}>
      <div className="grid bg-paper-sunk text-xs font-medium text-ink-soft" style={{ gridTemplateColumns: `3rem ${columns.map((c) => c.width ?? "1fr").join(" ")} 2rem` }} role="row">
        <span className="px-2 py-1">#</span>
        {columns.map((c) => (
          <span key={c.key} className={`px-2 py-1 ${c.numeric ? "text-right" : ""}`} role="columnheader">
            {c.label}
          </span>
        ))}
        <span />
      </div>
      <div ref={parent} style={{ height, overflow: "auto" }} role="grid" aria-label={name} aria-rowcount={rows.length}>
        <div style={{ height: virtualizer.getTotalSize(), position: "relative" }}>
          {virtualizer.getVirtualItems().map((v) => {
            const r = v.index;
            const row = rows[r]!;
            return (
              <div
                key={v.key}
                role="row"
                aria-rowindex={r + 1}
                aria-selected={selected === r}
                data-row={r}
                className={`absolute left-0 grid w-full items-center border-b border-rule/60 ${selected === r ? "bg-info-wash" : flagged?.has(r) ? "bg-bad-wash" : ""}`}
                style={{ top: v.start, height: ROW_HEIGHT, gridTemplateColumns: `3rem ${columns.map((c) => c.width ?? "1fr").join(" ")} 2rem` }}
                onFocus={() => onSelect?.(r)}
              >
                <span className="px-2 text-2xs text-ink-muted">{r + 1}</span>
                {columns.map((c, ci) => (
                  <input
                    key={c.key}
                    data-cell={`${r}:${ci}`}
                    aria-label={`${name} row ${r + 1} ${c.label}`}
                    className={`h-full min-w-0 bg-transparent px-2 font-mono text-xs outline-none focus:bg-paper focus:ring-1 focus:ring-info ${c.numeric ? "text-right" : ""}`}
                    value={row[c.key] ?? ""}
                    inputMode={c.numeric ? "decimal" : undefined}
                    onChange={(e) => setCell(r, c.key, e.target.value)}
                    onKeyDown={(e) => onKey(e, r, ci)}
                    onPaste={(e) => onPaste(e, r, ci)}
                  />
                ))}
                <button type="button" className="text-ink-muted hover:text-bad" aria-label={`delete ${name} row ${r + 1}`} onClick={() => onChange(rows.filter((_, i) => i !== r))}>
                  ×
                </button>
              </div>
            );
          })}
        </div>
      </div>
      <div className="flex items-center justify-between border-t border-rule px-2 py-1 text-xs text-ink-muted">
        <span>{rows.length} rows · Enter moves down · paste rows from a spreadsheet</span>
        <button type="button" className="btn btn-secondary px-2 py-0.5 text-xs" onClick={() => onChange([...rows, Object.fromEntries(columns.map((c) => [c.key, ""]))])}>
          Add row
        </button>
      </div>
    </div>
  );
}
