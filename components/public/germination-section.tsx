"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { formatNumber, formatP } from "@/lib/domain/analysis/format";
import type { PublicGerminationView } from "@/lib/domain/publish/public-view";

type EntryRow = PublicGerminationView["byEntry"][number] & { shown: string };
type LabelRow = PublicGerminationView["labels"][number] & { shown: string };

const entryColumns: ColumnDef<EntryRow, unknown>[] = [
  { id: "variety", header: "Variety", accessorFn: (g) => g.shown },
  { id: "sown", header: "Seeds sown", accessorFn: (g) => g.sown },
  { id: "emerged", header: "Emerged", accessorFn: (g) => g.emerged },
  { id: "percent", header: "Emergence %", accessorFn: (g) => g.percent, cell: (c) => `${formatNumber(c.getValue() as number, 1)}%` },
  { id: "interval", header: "95% interval", accessorFn: (g) => g.lower, cell: (c) => `${formatNumber(c.row.original.lower, 1)}–${formatNumber(c.row.original.upper, 1)}%` },
];

const labelColumns: ColumnDef<LabelRow, unknown>[] = [
  { id: "variety", header: "Variety", accessorFn: (l) => l.shown },
  { id: "lot", header: "Seed lot", accessorFn: (l) => l.seedLot ?? "–" },
  { id: "label", header: "Label %", accessorFn: (l) => l.labelPercent, cell: (c) => (c.getValue() === null ? "not stated" : `${formatNumber(c.getValue() as number, 0)}%`) },
  { id: "observed", header: "Emerged %", accessorFn: (l) => l.observedPercent, cell: (c) => `${formatNumber(c.getValue() as number, 1)}%` },
  { id: "p", header: "Test against label", accessorFn: (l) => l.chiSquareP, cell: (c) => (c.getValue() === null ? "–" : formatP(c.getValue() as number)) },
  { id: "note", header: "Reading", accessorFn: (l) => l.note },
];

/** The trial's germination: per-variety emergence with its interval, the chi-square test between varieties, and the seed labels compared. */
export function GerminationSection({ germination }: { germination: PublicGerminationView }) {
  const { chiSquare, cmh } = germination;
  const byEntry = germination.byEntry.map((g) => ({ ...g, shown: g.varietyName ?? g.blindCode }));
  const labels = germination.labels.map((l) => ({ ...l, shown: l.varietyName ?? l.blindCode }));
  return (
    <div className="space-y-4">
      <p>{germination.note}</p>
      <DataTable pageSize={null} data={byEntry} columns={entryColumns} caption="Seedling emergence per variety, all sites pooled" testId="germination-by-entry" />
      {chiSquare && (
        <p data-testid="germination-chi-square">
          Chi-square test of equal germination between varieties: χ² = {formatNumber(chiSquare.statistic, 2)}, {chiSquare.df} df, {formatP(chiSquare.p)}
          {chiSquare.lowExpected > 0 ? ` (${chiSquare.lowExpected} of ${chiSquare.cells} cells expect fewer than 5 seedlings, so the p-value is approximate)` : ""}.
          {cmh && ` Allowing for differences between the ${cmh.sites} sites: ${formatP(cmh.p)}.`}
        </p>
      )}
      <h3 className="text-lg font-bold">Compared with the seed label</h3>
      <DataTable pageSize={null} data={labels} columns={labelColumns} caption="Emergence compared with the germination stated on each seed label" testId="germination-labels" />
    </div>
  );
}
