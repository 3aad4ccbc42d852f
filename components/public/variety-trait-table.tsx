"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { formatNumber } from "@/lib/domain/analysis/format";

export interface VarietyTraitRow {
  trait: string;
  mean: number | null;
  rank: number | null;
  of: number;
  letter: string | null;
}

const columns: ColumnDef<VarietyTraitRow, unknown>[] = [
  { id: "trait", header: "Trait", accessorFn: (r) => r.trait },
  { id: "mean", header: "Mean", accessorFn: (r) => r.mean, cell: (c) => formatNumber(c.getValue() as number | null) },
  { id: "rank", header: "Rank", accessorFn: (r) => r.rank, cell: (c) => (c.row.original.rank ? `${c.row.original.rank} of ${c.row.original.of}` : "–") },
  { id: "group", header: "Group", accessorFn: (r) => r.letter ?? "", cell: (c) => <span className="font-mono">{c.row.original.letter ?? "–"}</span> },
];

/** One published variety's results in one trial: a row per trait. */
export function VarietyTraitTable({ rows, caption }: { rows: VarietyTraitRow[]; caption: string }) {
  return <DataTable data={rows} columns={columns} caption={caption} pageSize={null} />;
}
