"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { Badge } from "@/components/ui/badge";
import type { SiteRow } from "@/db/queries/sites";
import { SETUP_LABELS, SITE_KIND_LABELS } from "@/lib/domain/vocabulary/labels";
import { PrintLanguageForm } from "./print-language-form";

const columns: ColumnDef<SiteRow, unknown>[] = [
  { accessorKey: "name", header: "Site", cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
  { id: "kind", accessorFn: (r) => SITE_KIND_LABELS[r.kind], header: "Kind" },
  { accessorKey: "region", header: "Region" },
  { id: "setup", accessorFn: (r) => SETUP_LABELS[r.growingSetup], header: "Setup" },
  { id: "conditions", header: "Soil · irrigation", enableSorting: false, accessorFn: (r) => [r.soil, r.irrigation].filter(Boolean).join(" · ") },
  {
    id: "growers",
    header: "Growers",
    accessorFn: (r) => r.growers.map((g) => g.name).join(", ") || r.contactName || "",
    cell: (c) => {
      const r = c.row.original;
      if (r.growers.length === 0) return r.contactName ? <span className="text-loam-700">{r.contactName} (not yet invited)</span> : <span className="text-loam-700">—</span>;
      return (
        <ul>
          {r.growers.map((g) => (
            <li key={g.name}>
              {g.name} {g.invited && <Badge>Invited</Badge>}
            </li>
          ))}
        </ul>
      );
    },
  },
  {
    id: "printLocale",
    header: "Printouts in",
    enableSorting: false,
    accessorFn: (r) => r.printLocale ?? "",
    cell: (c) => <PrintLanguageForm siteId={c.row.original.id} siteName={c.row.original.name} current={c.row.original.printLocale} />,
  },
];

const programColumn: ColumnDef<SiteRow, unknown> = { accessorKey: "program", header: "Program" };

export function SiteTable({ rows }: { rows: SiteRow[] }) {
  // The program is worth a column only for people who see sites of more than one.
  const severalPrograms = new Set(rows.map((r) => r.program)).size > 1;
  return <DataTable data={rows} columns={severalPrograms ? [columns[0]!, programColumn, ...columns.slice(1)] : columns} caption="Partner sites" filterLabel="Filter sites" />;
}
