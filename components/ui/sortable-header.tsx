"use client";
import { flexRender, type Header } from "@tanstack/react-table";

/** A column heading that sorts when it can: a real button (keyboard-operable) with an arrow showing the order. */
export function SortableHeader<T>({ header, buttonClassName, arrowClassName }: { header: Header<T, unknown>; buttonClassName: string; arrowClassName?: string }) {
  const label = flexRender(header.column.columnDef.header, header.getContext());
  if (!header.column.getCanSort()) return <>{label}</>;
  const sorted = header.column.getIsSorted();
  return (
    <button type="button" onClick={header.column.getToggleSortingHandler()} className={buttonClassName}>
      {label}
      <span aria-hidden className={arrowClassName}>
        {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}
      </span>
    </button>
  );
}
