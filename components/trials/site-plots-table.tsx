"use client";
import { useMemo } from "react";
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import type { LayoutPlot } from "@/db/queries/trials";
import type { PlotUnit } from "@/lib/domain/vocabulary/enums";

/** What the plot list shows; the page picks these fields so nothing else of a plot reaches the browser. */
export type SitePlotRow = Pick<LayoutPlot, "id" | "plotCode" | "block" | "blindCode" | "tray" | "traySlot" | "variety">;

/** Every plot at a site with its blind code (and the key for staff); the site map above shows where they lie. */
export function SitePlotsTable({ plots, showKey, plotUnit }: { plots: SitePlotRow[]; showKey: boolean; plotUnit: PlotUnit }) {
  const columns = useMemo<ColumnDef<SitePlotRow, unknown>[]>(() => [
    {
      id: "plot",
      header: "Plot",
      accessorFn: (p) => p.plotCode,
      cell: (c) => (
        <Link href={`/portal/plots/${c.row.original.id}`} className="font-mono">
          {c.row.original.plotCode}
        </Link>
      ),
    },
    { id: "block", header: "Block", accessorFn: (p) => p.block },
    { id: "code", header: "Code", accessorFn: (p) => p.blindCode, meta: { cellClassName: "font-mono font-bold" } },
    ...(showKey ? [{ id: "variety", header: "Variety (key)", accessorFn: (p: SitePlotRow) => p.variety ?? "" } as ColumnDef<SitePlotRow, unknown>] : []),
    ...(plotUnit !== "bed_row"
      ? [{ id: "tray", header: `Flat / ${plotUnit === "insert" ? "insert" : "first cell"}`, accessorFn: (p: SitePlotRow) => `${p.tray} / ${p.traySlot}` } as ColumnDef<SitePlotRow, unknown>]
      : []),
  ], [showKey, plotUnit]);
  // Every plot on one page: the list is printed with the map and taken to the field.
  return <DataTable data={plots} columns={columns} caption="Every plot at this site" filterLabel="Filter plots" pageSize={null} />;
}
