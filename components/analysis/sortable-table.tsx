"use client";
import { useState } from "react";
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from "@tanstack/react-table";
import { SortableHeader } from "@/components/ui/sortable-header";

/** A sortable table with a text filter over every column, for means, germination and missing plots. */
export function SortableTable<T>({
  data,
  columns,
  caption,
  filterLabel,
  initialSort = [],
  testId,
}: {
  data: T[];
  columns: ColumnDef<T, unknown>[];
  caption: string;
  filterLabel?: string;
  initialSort?: SortingState;
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
  });
  const filterId = `filter-${caption.replace(/\W+/g, "-").toLowerCase()}`;
  return (
    <div className="space-y-2">
      {filterLabel && (
        <div className="flex flex-wrap items-center gap-2">
          <label htmlFor={filterId} className="text-sm font-semibold">
            {filterLabel}
          </label>
          <input
            id={filterId}
            type="search"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
            className="min-h-11 w-48 rounded-lg border border-loam-300 bg-white px-3 text-base"
          />
        </div>
      )}
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-sm" data-testid={testId}>
          <caption className="sr-only">{caption}</caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-husk-400 text-left">
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  return (
                    <th key={header.id} scope="col" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"} className="px-2 py-1 font-semibold whitespace-nowrap">
                      <SortableHeader header={header} buttonClassName="min-h-11 text-left font-semibold hover:underline" arrowClassName="ml-1 text-loam-500" />
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-husk-200 odd:bg-husk-50">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-2 py-1.5 align-top tabular-nums">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {table.getRowModel().rows.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-2 py-3 text-loam-700">
                  Nothing matches “{filter}”.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}
