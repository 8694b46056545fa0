import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type FilterFn,
  type SortingState,
} from "@tanstack/react-table";
import { useId, useMemo, useState, type ReactNode } from "react";
import { Button } from "../ui/button";
import { downloadFile } from "./download-file";
import { toCsv, type CsvValue } from "./to-csv";

export type DataTableColumn<Row> = {
  id: string;
  header: string;
  /** The cell's value: what sorting, filtering and CSV export use. null means "no value". */
  value: (row: Row) => CsvValue;
  /** How the cell looks; defaults to the value, with an en dash for no value. */
  cell?: (row: Row) => ReactNode;
  align?: "start" | "end";
  sortable?: boolean;
  /** In the CSV export only, not on screen (e.g. a code already shown inside another column). */
  csvOnly?: boolean;
};

type DataTableProps<Row> = {
  /** Visible title and accessible name of the table. */
  caption: string;
  rows: Row[];
  columns: DataTableColumn<Row>[];
  rowKey: (row: Row) => string;
  /** File name of the CSV export, e.g. "portfolio-cells.csv". */
  csvFileName: string;
  emptyMessage?: string;
  initialSort?: { id: string; desc?: boolean };
  filterable?: boolean;
  /** Rows per page; without it every row is shown. */
  pageSize?: number;
  /** Narrower cell padding, for tables with many numeric columns. */
  compact?: boolean;
  /**
   * The server's CSV of the same table: the export then downloads it (every row, with the
   * market scope enforced by the server) instead of writing the rows on screen.
   */
  csvHref?: string;
};

const matchesText: FilterFn<unknown> = (row, _columnId, query: string) => {
  const needle = query.trim().toLowerCase();
  if (needle === "") return true;
  return row.getAllCells().some((cell) => String(cell.getValue() ?? "").toLowerCase().includes(needle));
};

function SortMark({ direction }: { direction: false | "asc" | "desc" }) {
  return (
    <svg viewBox="0 0 10 14" className="h-3.5 w-2.5 shrink-0" aria-hidden="true">
      <path d="M5 1 9 6H1z" fill={direction === "asc" ? "currentColor" : "var(--color-ink-300)"} />
      <path d="M5 13 1 8h8z" fill={direction === "desc" ? "currentColor" : "var(--color-ink-300)"} />
    </svg>
  );
}

export function DataTable<Row>({
  caption,
  rows,
  columns,
  rowKey,
  csvFileName,
  emptyMessage = "No rows to show.",
  initialSort,
  filterable = true,
  pageSize,
  compact = false,
  csvHref,
}: DataTableProps<Row>) {
  const cellPadding = compact ? "px-2.5 py-2" : "px-4 py-2";
  const filterId = useId();
  const [sorting, setSorting] = useState<SortingState>(initialSort ? [{ id: initialSort.id, desc: initialSort.desc ?? false }] : []);
  const [filter, setFilter] = useState("");
  const [pagination, setPagination] = useState({ pageIndex: 0, pageSize: pageSize ?? Number.MAX_SAFE_INTEGER });
  // A new filter starts again at the first page.
  const changeFilter = (value: string) => {
    setFilter(value);
    setPagination((current) => ({ ...current, pageIndex: 0 }));
  };

  const columnDefs = useMemo<ColumnDef<Row, CsvValue | undefined>[]>(
    () =>
      columns.map((column) => ({
        id: column.id,
        header: column.header,
        // undefined lets the table keep empty values last in either direction.
        accessorFn: (row: Row) => column.value(row) ?? undefined,
        enableSorting: column.sortable ?? true,
        sortUndefined: "last",
        sortDescFirst: false,
        sortingFn: "basic",
        cell: (context) => {
          if (column.cell) return column.cell(context.row.original);
          const value = context.getValue();
          return value === undefined ? <span className="text-ink-500">–</span> : String(value);
        },
      })),
    [columns],
  );

  const table = useReactTable<Row>({
    data: rows,
    columns: columnDefs,
    state: { sorting, globalFilter: filter, pagination, columnVisibility: Object.fromEntries(columns.filter((c) => c.csvOnly).map((c) => [c.id, false])) },
    onSortingChange: setSorting,
    onGlobalFilterChange: (value: string) => changeFilter(value),
    onPaginationChange: setPagination,
    globalFilterFn: matchesText as FilterFn<Row>,
    getRowId: (row) => rowKey(row),
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
  });

  // Every row that passes the filter, in sort order; the page shows a slice of them.
  const visibleRows = table.getPrePaginationRowModel().rows;
  const pageRows = table.getRowModel().rows;
  const pageCount = table.getPageCount();
  const shownColumns = columns.filter((column) => !column.csvOnly);

  function exportCsv() {
    const csv = toCsv(
      columns.map((column) => column.header),
      visibleRows.map((row) => columns.map((column) => column.value(row.original))),
    );
    downloadFile(csvFileName, csv, "text/csv;charset=utf-8");
  }

  return (
    <section aria-label={caption} className="rounded-lg border border-line bg-surface shadow-card">
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-line px-4 py-3">
        <h2 className="text-body font-semibold text-ink-900">{caption}</h2>
        <div className="flex items-center gap-3">
          {filterable ? (
            <div className="flex items-center gap-2">
              <label htmlFor={filterId} className="text-small text-ink-700">
                Filter rows
              </label>
              <input
                id={filterId}
                type="search"
                value={filter}
                onChange={(event) => changeFilter(event.target.value)}
                className="w-48 rounded-md border border-field bg-surface px-2.5 py-1.5 text-small text-ink-900 placeholder:text-ink-500"
                placeholder="Type to filter"
              />
            </div>
          ) : null}
          {csvHref ? (
            <a
              href={csvHref}
              download={csvFileName}
              title="Every row of the table, as the server holds it"
              className="inline-flex items-center justify-center gap-2 rounded-md border border-field bg-surface px-3.5 py-2 text-small font-medium text-ink-900 hover:bg-ink-50"
            >
              Export CSV
            </a>
          ) : (
            <Button variant="secondary" onClick={exportCsv} disabled={visibleRows.length === 0}>
              Export CSV
            </Button>
          )}
        </div>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-small">
          <caption className="sr-only">{caption}</caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-line bg-ink-50">
                {group.headers.map((header) => {
                  const spec = columns.find((column) => column.id === header.column.id);
                  const sorted = header.column.getIsSorted();
                  const alignEnd = spec?.align === "end";
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}
                      className={`${cellPadding} font-semibold text-ink-800 ${compact ? "whitespace-nowrap" : ""} ${alignEnd ? "text-right" : "text-left"}`}
                    >
                      {header.column.getCanSort() ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className={`inline-flex items-center gap-1.5 rounded-sm align-middle hover:text-stream-700 ${alignEnd ? "flex-row-reverse" : ""}`}
                        >
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <SortMark direction={sorted} />
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {visibleRows.length === 0 ? (
              <tr>
                <td colSpan={shownColumns.length} className="px-4 py-6 text-center text-ink-600">
                  {filter ? "No rows match the filter." : emptyMessage}
                </td>
              </tr>
            ) : (
              pageRows.map((row) => (
                <tr key={row.id} className="border-b border-line last:border-b-0 hover:bg-stream-50/60">
                  {row.getVisibleCells().map((cell) => {
                    const alignEnd = columns.find((column) => column.id === cell.column.id)?.align === "end";
                    return (
                      <td key={cell.id} className={`${cellPadding} text-ink-900 ${alignEnd ? "text-right tabular-nums" : ""}`}>
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    );
                  })}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap items-center justify-between gap-3 border-t border-line px-4 py-2">
        <p className="text-caption text-ink-600" aria-live="polite">
          {visibleRows.length === rows.length
            ? `${rows.length} ${rows.length === 1 ? "row" : "rows"}`
            : `Showing ${visibleRows.length} of ${rows.length} rows`}
          {pageCount > 1 ? ` · page ${pagination.pageIndex + 1} of ${pageCount}` : ""}
        </p>
        {pageCount > 1 ? (
          <nav aria-label={`Pages of ${caption}`} className="flex items-center gap-2">
            <Button variant="secondary" className="px-2.5! py-1!" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
              Previous page
            </Button>
            <Button variant="secondary" className="px-2.5! py-1!" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
              Next page
            </Button>
          </nav>
        ) : null}
      </div>
    </section>
  );
}
