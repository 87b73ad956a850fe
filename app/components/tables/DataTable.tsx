// A sortable, filterable, paginated table over rows already on the page (headless
// @tanstack/react-table, our own markup). Column headers are buttons, so sorting works from
// the keyboard; aria-sort tells screen readers the order.
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from "@tanstack/react-table";
import { useEffect, useRef, useState, type ReactNode } from "react";
import { EmptyState } from "~/components/ui/States";

/** Per-column options: right-aligned tabular numbers; extra classes (e.g. hide on phones). */
export interface ColumnMeta {
  numeric?: boolean;
  className?: string;
}

export interface DataTableProps<T> {
  data: T[];
  columns: ColumnDef<T, any>[];
  label: string;
  pageSize?: number;
  filterPlaceholder?: string; // shows a quick filter box when given
  initialSort?: SortingState;
  empty?: ReactNode;
  toolbar?: ReactNode;
  rowTestId?: string;
  getRowId?: (row: T) => string;
  /** a row chosen elsewhere (the 3D view): marked, its page shown and scrolled into view */
  selectedRowId?: string | null;
  /** rows become choosable by click, Enter or Space */
  onRowClick?: (row: T) => void;
}

export function DataTable<T>({ data, columns, label, pageSize = 25, filterPlaceholder, initialSort = [], empty, toolbar, rowTestId, getRowId, selectedRowId, onRowClick }: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>(initialSort);
  const [globalFilter, setGlobalFilter] = useState("");
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setGlobalFilter,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    getRowId: getRowId ? (r) => getRowId(r) : undefined,
    initialState: { pagination: { pageSize } },
    autoResetPageIndex: false,
  });
  const rows = table.getRowModel().rows;
  const filtered = table.getFilteredRowModel().rows.length;
  const { pageIndex } = table.getState().pagination;
  const pages = table.getPageCount();
  const body = useRef<HTMLTableSectionElement>(null);
  useEffect(() => {
    if (!selectedRowId) return;
    const at = table.getPrePaginationRowModel().rows.findIndex((r) => r.id === selectedRowId);
    if (at >= 0 && Math.floor(at / table.getState().pagination.pageSize) !== table.getState().pagination.pageIndex) table.setPageIndex(Math.floor(at / table.getState().pagination.pageSize));
    requestAnimationFrame(() => body.current?.querySelector(`tr[data-row-id="${CSS.escape(selectedRowId)}"]`)?.scrollIntoView({ block: "nearest" }));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [selectedRowId]);

  return (
    <div>
      {(filterPlaceholder || toolbar) && (
        <div className="mb-3 flex flex-wrap items-center gap-2">
          {filterPlaceholder && (
            <input
              type="search"
              className="field-input max-w-xs"
              placeholder={filterPlaceholder}
              aria-label={`Filter ${label}`}
              value={globalFilter}
              onChange={(e) => {
                setGlobalFilter(e.target.value);
                table.setPageIndex(0);
              }}
            />
          )}
          <div className="ml-auto flex flex-wrap gap-2">{toolbar}</div>
        </div>
      )}
      {data.length === 0 ? (
        (empty ?? <EmptyState title="Nothing to show" />)
      ) : (
        <>
          <div className="overflow-x-auto rounded-md border border-rule">
            <table className="data-table" aria-label={label}>
              <thead>
                {table.getHeaderGroups().map((hg) => (
                  <tr key={hg.id}>
                    {hg.headers.map((h) => {
                      const sorted = h.column.getIsSorted();
                      const meta = h.column.columnDef.meta as ColumnMeta | undefined;
                      const numeric = meta?.numeric;
                      return (
                        <th
                          key={h.id}
                          className={`${numeric ? "whitespace-nowrap text-right" : "whitespace-nowrap"} ${meta?.className ?? ""}`}
                          aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}
                        >
                          {h.isPlaceholder ? null : h.column.getCanSort() ? (
                            <button
                              type="button"
                              className={`inline-flex items-center gap-1 ${numeric ? "flex-row-reverse" : ""} hover:text-ink`}
                              onClick={h.column.getToggleSortingHandler()}
                            >
                              {flexRender(h.column.columnDef.header, h.getContext())}
                              <span aria-hidden className="w-2 text-ink-soft">
                                {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : ""}
                              </span>
                            </button>
                          ) : (
                            flexRender(h.column.columnDef.header, h.getContext())
                          )}
                        </th>
                      );
                    })}
                  </tr>
                ))}
              </thead>
              <tbody ref={body}>
                {rows.map((r) => (
                  <tr
                    key={r.id}
                    className={`${r.id === selectedRowId ? "bg-brass-wash outline outline-2 -outline-offset-2 outline-brass-strong" : "hover:bg-paper"} ${onRowClick ? "cursor-pointer" : ""}`}
                    data-testid={rowTestId}
                    data-row-id={r.id}
                    aria-selected={onRowClick ? r.id === selectedRowId : undefined}
                    tabIndex={onRowClick ? 0 : undefined}
                    onClick={onRowClick ? () => onRowClick(r.original) : undefined}
                    onKeyDown={
                      onRowClick
                        ? (e) => {
                            if (e.key === "Enter" || e.key === " ") {
                              e.preventDefault();
                              onRowClick(r.original);
                            }
                          }
                        : undefined
                    }
                  >
                    {r.getVisibleCells().map((c) => (
                      <td key={c.id} className={`${(c.column.columnDef.meta as ColumnMeta | undefined)?.numeric ? "num whitespace-nowrap" : "whitespace-nowrap"} ${(c.column.columnDef.meta as ColumnMeta | undefined)?.className ?? ""}`}>
                        {flexRender(c.column.columnDef.cell, c.getContext())}
                      </td>
                    ))}
                  </tr>
                ))}
                {rows.length === 0 && (
                  <tr>
                    <td colSpan={columns.length} className="py-6 text-center text-ink-muted">
                      No rows match the filter.
                    </td>
                  </tr>
                )}
              </tbody>
            </table>
          </div>
          {pages > 1 && (
            <nav className="mt-2 flex items-center justify-between gap-2 text-sm text-ink-muted" aria-label={`${label} pages`}>
              <span>
                {filtered} rows · page {pageIndex + 1} of {pages}
              </span>
              <span className="flex gap-1">
                <button type="button" className="btn btn-secondary px-3 py-1" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
                  Previous
                </button>
                <button type="button" className="btn btn-secondary px-3 py-1" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
                  Next
                </button>
              </span>
            </nav>
          )}
        </>
      )}
    </div>
  );
}
