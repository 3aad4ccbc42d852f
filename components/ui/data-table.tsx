"use client";
import { useState } from "react";
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
import { Button } from "./button";
import { cn } from "./cn";
import { SortableHeader } from "./sortable-header";

declare module "@tanstack/react-table" {
  interface ColumnMeta<TData, TValue> {
    /** Classes for the column's cells (a code set in a monospace face, say). */
    cellClassName?: string;
  }
}

// A cell's look, and on phones its column's name before the value (columns whose header is not plain text,
// such as row actions, show the value alone), is the `data-cell` class in app/globals.css: written once
// there rather than on each of the thousands of cells a big analysis table has.

/**
 * The one table for lists of records (catalogue, trials, sites, analysis results, admin lists): sortable,
 * with a text filter over every column when `filterLabel` is given, paginated unless `pageSize` is null.
 * Column headers are buttons so sorting works from the keyboard, and aria-sort tells screen readers the
 * current order. On phones each row becomes a card of "column: value" lines and the headers a row of
 * sort buttons, so nothing scrolls sideways; explicit table roles keep the structure for screen readers,
 * which drop it when table parts are displayed as blocks.
 */
export function DataTable<T>({
  data,
  columns,
  caption,
  filterLabel,
  pageSize = 15,
  initialSort = [],
  empty = "Nothing here yet.",
  testId,
}: {
  data: T[];
  columns: ColumnDef<T, unknown>[];
  caption: string;
  filterLabel?: string;
  /** Rows per page; null shows every row (analysis tables, where a hidden row would hide a result). */
  pageSize?: number | null;
  initialSort?: SortingState;
  empty?: string;
  testId?: string;
}) {
  const [sorting, setSorting] = useState<SortingState>(initialSort);
  const [filter, setFilter] = useState("");
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    ...(pageSize === null ? {} : { getPaginationRowModel: getPaginationRowModel(), initialState: { pagination: { pageSize } } }),
  });
  const filterId = `filter-${caption.replace(/\W+/g, "-").toLowerCase()}`;
  const rows = table.getRowModel().rows;
  return (
    <div className="space-y-3">
      {filterLabel && (
        <div className="no-print max-w-xs">
          <label htmlFor={filterId} className="block text-sm font-semibold">
            {filterLabel}
          </label>
          <input
            id={filterId}
            type="search"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
            className="block min-h-11 w-full rounded-lg border border-loam-300 bg-white px-3 py-2"
          />
        </div>
      )}
      <div className="overflow-x-auto">
        <table role="table" className="w-full text-left text-sm max-sm:block" data-testid={testId}>
          <caption className="sr-only">{caption}</caption>
          <thead role="rowgroup" className="border-b border-husk-200 text-loam-700 max-sm:block">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} role="row" className="max-sm:flex max-sm:flex-wrap max-sm:gap-x-4">
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  return (
                    <th
                      key={header.id}
                      role="columnheader"
                      scope="col"
                      className="py-2 pr-3 max-sm:py-1"
                      aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}
                    >
                      {header.isPlaceholder ? null : (
                        <SortableHeader header={header} buttonClassName="inline-flex items-center gap-1 font-semibold hover:text-loam-900" />
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody role="rowgroup" className="max-sm:block">
            {rows.length === 0 ? (
              <tr role="row" className="max-sm:block">
                <td role="cell" colSpan={columns.length} className="py-4 text-loam-700 max-sm:block">
                  {filter ? "No rows match the filter." : empty}
                </td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={row.id} role="row" className="border-b border-husk-100 align-top max-sm:block max-sm:py-2">
                  {row.getVisibleCells().map((cell) => {
                    const label = cell.column.columnDef.header;
                    return (
                      <td
                        key={cell.id}
                        role="cell"
                        data-label={typeof label === "string" ? label : undefined}
                        className={cn("data-cell", cell.column.columnDef.meta?.cellClassName)}
                      >
                        <div>{flexRender(cell.column.columnDef.cell, cell.getContext())}</div>
                      </td>
                    );
                  })}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      {pageSize !== null && table.getPageCount() > 1 && (
        <div className="no-print flex flex-wrap items-center gap-3 text-sm">
          <Button variant="secondary" type="button" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
            Previous
          </Button>
          <span>
            Page {table.getState().pagination.pageIndex + 1} of {table.getPageCount()} · {table.getFilteredRowModel().rows.length} rows
          </span>
          <Button variant="secondary" type="button" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
            Next
          </Button>
        </div>
      )}
    </div>
  );
}
