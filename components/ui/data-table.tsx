"use client";

import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
  type VisibilityState,
} from "@tanstack/react-table";
import { useId, useState } from "react";
import { toCsv } from "@/lib/csv";
import { ScrollFrame } from "./scroll-frame";

export interface DataTableProps<Row> {
  /** Accessible name of the table, also used for the CSV file name. */
  caption: string;
  columns: ColumnDef<Row, unknown>[];
  rows: Row[];
  /** Shown when there are no rows at all. */
  emptyMessage: string;
  pageSize?: number;
  /** Offer a CSV download of the filtered rows (formula injection neutralised). */
  csvFileName?: string;
  /** Columns only the CSV has, the same on every row (e.g. which release the figures come from). */
  csvConstants?: { header: string; value: string }[];
  /**
   * Ids of the columns a phone shows first; the others appear on wider screens, or on a phone after
   * one tap on "Show all columns". Without it every column shows at every width.
   */
  firstColumns?: readonly string[];
  /** False where the page searches on the server instead (its own form), so there is one search box, not two. */
  filterable?: boolean;
}

/** Sort, filter, hide columns, page through and export: the one table every list in the app uses. */
export function DataTable<Row>({
  caption,
  columns,
  rows,
  emptyMessage,
  pageSize = 25,
  csvFileName,
  csvConstants = [],
  firstColumns,
  filterable = true,
}: DataTableProps<Row>) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const [allColumnsOnPhone, setAllColumnsOnPhone] = useState(false);
  const tableId = useId();
  const [filter, setFilter] = useState("");
  const [columnVisibility, setColumnVisibility] = useState<VisibilityState>({});
  // TanStack Table's instance is not memoisable; the React Compiler skips this component, as it should.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting, globalFilter: filter, columnVisibility },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    onColumnVisibilityChange: setColumnVisibility,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize } },
  });

  function downloadCsv() {
    const visible = table.getVisibleLeafColumns();
    const constants = csvConstants.map((constant, index) => ({ key: `constant-${index}`, ...constant }));
    const csv = toCsv(
      table.getFilteredRowModel().rows.map((row) => ({
        ...Object.fromEntries(visible.map((column) => [column.id, row.getValue(column.id)])),
        ...Object.fromEntries(constants.map((constant) => [constant.key, constant.value])),
      })),
      [
        ...visible.map((column) => ({
          key: column.id,
          header: typeof column.columnDef.header === "string" ? column.columnDef.header : column.id,
        })),
        ...constants.map(({ key, header }) => ({ key, header })),
      ],
    );
    const link = document.createElement("a");
    link.href = URL.createObjectURL(new Blob([csv], { type: "text/csv;charset=utf-8" }));
    link.download = csvFileName ?? `${caption}.csv`;
    link.click();
    URL.revokeObjectURL(link.href);
  }

  if (rows.length === 0) return <p className="rounded-lg border border-oat-300 bg-white p-4 text-ink-soft">{emptyMessage}</p>;

  const pageCount = table.getPageCount();
  const laterColumns = firstColumns ? table.getVisibleLeafColumns().filter((column) => !firstColumns.includes(column.id)) : [];
  // A later column is hidden below the md breakpoint by a class, not by the table's state, so the
  // server's page and the phone's agree and nothing jumps once the script runs.
  const widthClass = (columnId: string) =>
    firstColumns ? `px-2 md:px-3 ${!allColumnsOnPhone && !firstColumns.includes(columnId) ? "hidden md:table-cell" : ""}` : "px-3";
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3">
        {filterable ? (
          <label className="text-sm">
            <span className="block font-medium">Filter</span>
            <input
              value={filter}
              onChange={(event) => setFilter(event.target.value)}
              placeholder="Type to filter rows"
              className="min-h-11 rounded-lg border border-oat-300 bg-white px-3"
            />
          </label>
        ) : null}
        {laterColumns.length > 0 ? (
          <button
            type="button"
            aria-pressed={allColumnsOnPhone}
            aria-controls={tableId}
            onClick={() => setAllColumnsOnPhone((shown) => !shown)}
            className="min-h-11 rounded-lg border border-moss-600 bg-white px-3 text-sm font-semibold text-moss-700 md:hidden"
          >
            {allColumnsOnPhone ? "Show fewer columns" : `Show all columns (${laterColumns.length} more)`}
          </button>
        ) : null}
        <details className="text-sm">
          <summary className="min-h-11 cursor-pointer content-center rounded-lg border border-oat-300 bg-white px-3">Columns</summary>
          <div className="absolute z-10 mt-1 space-y-1 rounded-lg border border-oat-300 bg-white p-3 shadow">
            {table.getAllLeafColumns().map((column) => (
              <label key={column.id} className="flex items-center gap-2">
                <input type="checkbox" checked={column.getIsVisible()} onChange={column.getToggleVisibilityHandler()} />
                {typeof column.columnDef.header === "string" ? column.columnDef.header : column.id}
              </label>
            ))}
          </div>
        </details>
        {csvFileName !== undefined ? (
          <button
            type="button"
            onClick={downloadCsv}
            className="min-h-11 rounded-lg border border-moss-600 bg-white px-3 text-sm font-semibold text-moss-700"
          >
            Download CSV
          </button>
        ) : null}
      </div>
      <ScrollFrame label={caption} className="rounded-lg border border-oat-300 bg-white">
        <table id={tableId} className="min-w-full text-sm">
          <caption className="sr-only">{caption}</caption>
          <thead className="bg-oat-200 text-left">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}
                      className={`py-2 font-semibold ${widthClass(header.column.id)}`}
                    >
                      {header.column.getCanSort() ? (
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className="flex items-center gap-1">
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
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
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-t border-oat-200 even:bg-oat-50">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={`py-2 align-top ${widthClass(cell.column.id)}`}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollFrame>
      {filterable && table.getFilteredRowModel().rows.length === 0 ? (
        <p className="text-sm text-ink-soft">No rows match “{filter}”.</p>
      ) : null}
      {pageCount > 1 ? (
        <nav aria-label={`${caption} pages`} className="flex items-center gap-3 text-sm">
          <button
            type="button"
            onClick={() => table.previousPage()}
            disabled={!table.getCanPreviousPage()}
            className="min-h-11 rounded-lg border border-oat-300 bg-white px-3 disabled:opacity-50"
          >
            Previous
          </button>
          <span>
            Page {table.getState().pagination.pageIndex + 1} of {pageCount}
          </span>
          <button
            type="button"
            onClick={() => table.nextPage()}
            disabled={!table.getCanNextPage()}
            className="min-h-11 rounded-lg border border-oat-300 bg-white px-3 disabled:opacity-50"
          >
            Next
          </button>
        </nav>
      ) : null}
    </div>
  );
}
