"use client";
import { useMemo } from "react";
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import type { LayoutPlot } from "@/db/queries/trials";
import type { PlotUnit } from "@/lib/domain/vocabulary/enums";

/** What the plot list shows; the page picks these fields so nothing else of a plot reaches the browser. */
export type SitePlotRow = Pick<LayoutPlot, "id" | "plotCode" | "block" | "blindCode" | "tray" | "traySlot" | "variety">;

/** The table's words in the reader's language (English by default, as on staff screens). */
export interface SitePlotsWords {
  plot: string;
  block: string;
  code: string;
  varietyKey: string;
  flatInsert: string;
  flatCell: string;
  caption: string;
  filter: string;
}

const ENGLISH: SitePlotsWords = { plot: "Plot", block: "Block", code: "Code", varietyKey: "Variety (key)", flatInsert: "Flat / insert", flatCell: "Flat / first cell", caption: "Every plot at this site", filter: "Filter plots" };

/** Every plot at a site with its blind code (and the key for staff); the site map above shows where they lie. */
export function SitePlotsTable({ plots, showKey, plotUnit, words = ENGLISH }: { plots: SitePlotRow[]; showKey: boolean; plotUnit: PlotUnit; words?: SitePlotsWords }) {
  const columns = useMemo<ColumnDef<SitePlotRow, unknown>[]>(() => [
    {
      id: "plot",
      header: words.plot,
      accessorFn: (p) => p.plotCode,
      cell: (c) => (
        <Link href={`/portal/plots/${c.row.original.id}`} className="font-mono">
          {c.row.original.plotCode}
        </Link>
      ),
    },
    { id: "block", header: words.block, accessorFn: (p) => p.block },
    { id: "code", header: words.code, accessorFn: (p) => p.blindCode, meta: { cellClassName: "font-mono font-bold" } },
    ...(showKey ? [{ id: "variety", header: words.varietyKey, accessorFn: (p: SitePlotRow) => p.variety ?? "" } as ColumnDef<SitePlotRow, unknown>] : []),
    ...(plotUnit !== "bed_row"
      ? [{ id: "tray", header: plotUnit === "insert" ? words.flatInsert : words.flatCell, accessorFn: (p: SitePlotRow) => `${p.tray} / ${p.traySlot}` } as ColumnDef<SitePlotRow, unknown>]
      : []),
  ], [showKey, plotUnit, words]);
  // Every plot on one page: the list is printed with the map and taken to the field.
  return <DataTable data={plots} columns={columns} caption={words.caption} filterLabel={words.filter} pageSize={null} />;
}
