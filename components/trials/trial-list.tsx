"use client";
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { TrialStatusBadge } from "@/components/ui/status-badge";
import { STATUS_LABELS } from "@/lib/domain/vocabulary/statuses";
import type { listTrialsForViewer } from "@/db/queries/overview";

type Row = Awaited<ReturnType<typeof listTrialsForViewer>>[number];

const columns: ColumnDef<Row, unknown>[] = [
  {
    accessorKey: "title",
    header: "Trial",
    cell: (c) => (
      <>
        <Link href={`/portal/trials/${c.row.original.id}`} className="font-semibold">
          {c.row.original.title}
        </Link>
        <span className="block font-mono text-xs text-loam-700">{c.row.original.code}</span>
      </>
    ),
  },
  { accessorKey: "crop", header: "Crop" },
  { accessorKey: "season", header: "Season" },
  { accessorKey: "entries", header: "Entries" },
  { accessorKey: "sites", header: "Sites" },
  { id: "status", accessorFn: (r) => STATUS_LABELS[r.status], header: "Status", cell: (c) => <TrialStatusBadge status={c.row.original.status} /> },
];

export function TrialList({ rows, empty = "No trials yet. Create the first one." }: { rows: Row[]; empty?: string }) {
  return <DataTable data={rows} columns={columns} caption="Trials in your programs" filterLabel="Filter trials" empty={empty} />;
}
