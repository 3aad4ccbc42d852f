"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { Badge } from "@/components/ui/badge";
import type { CropRow, SeedLotRow, TraitRow, VarietyRow } from "@/db/queries/catalogue";
import { COMPUTATION_LABELS, CROP_GROUP_LABELS, TRAIT_TYPE_LABELS } from "@/lib/labels";

const cropColumns: ColumnDef<CropRow, unknown>[] = [
  { accessorKey: "name", header: "Crop", cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
  { id: "group", accessorFn: (r) => CROP_GROUP_LABELS[r.cropGroup], header: "Group" },
  { accessorKey: "scientificName", header: "Scientific name", cell: (c) => <i>{c.row.original.scientificName ?? ""}</i> },
  { accessorKey: "varieties", header: "Varieties" },
];

const varietyColumns: ColumnDef<VarietyRow, unknown>[] = [
  { accessorKey: "crop", header: "Crop" },
  { accessorKey: "name", header: "Variety", cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
  { accessorKey: "seedLots", header: "Seed lots" },
  { accessorKey: "description", header: "Notes", enableSorting: false },
];

const lotColumns: ColumnDef<SeedLotRow, unknown>[] = [
  { id: "variety", accessorFn: (r) => `${r.crop}: ${r.variety}`, header: "Variety" },
  { accessorKey: "source", header: "Source" },
  { accessorKey: "lotCode", header: "Lot", cell: (c) => <span className="font-mono">{c.row.original.lotCode}</span> },
  {
    accessorKey: "labelGerminationPct",
    header: "Label germ. %",
    cell: (c) => (c.row.original.labelGerminationPct === null ? <span className="text-loam-700">not stated</span> : `${c.row.original.labelGerminationPct}%`),
  },
  { accessorKey: "germinationTestDate", header: "Tested", cell: (c) => c.row.original.germinationTestDate ?? "—" },
  { accessorKey: "packetDaysToMaturity", header: "Days to maturity", cell: (c) => c.row.original.packetDaysToMaturity ?? "—" },
  {
    id: "treated",
    accessorFn: (r) => (r.treated ? "treated" : "untreated"),
    header: "Treatment",
    cell: (c) => (c.row.original.treated ? <Badge tone="warn">Treated{c.row.original.treatment ? `: ${c.row.original.treatment}` : ""}</Badge> : "Untreated"),
  },
];

const traitColumns: ColumnDef<TraitRow, unknown>[] = [
  { accessorKey: "name", header: "Trait", cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
  { accessorKey: "code", header: "Code", cell: (c) => <span className="font-mono text-xs">{c.row.original.code}</span> },
  { id: "type", accessorFn: (r) => TRAIT_TYPE_LABELS[r.valueType], header: "Kind" },
  { accessorKey: "unit", header: "Unit", cell: (c) => c.row.original.unit ?? "—" },
  {
    id: "range",
    header: "Valid range",
    enableSorting: false,
    accessorFn: (r) => (r.minValue === null && r.maxValue === null ? "any" : `${r.minValue ?? "…"} to ${r.maxValue ?? "…"}`),
  },
  {
    id: "due",
    header: "When due",
    enableSorting: false,
    accessorFn: (r) => (r.dueDaysAfterSowing?.length ? `Days ${r.dueDaysAfterSowing.join(", ")} after sowing` : (r.dueNote ?? "—")),
  },
  { id: "computed", header: "Analysed as", accessorFn: (r) => COMPUTATION_LABELS[r.computation] },
  { id: "builtIn", header: "", enableSorting: false, cell: (c) => (c.row.original.builtIn ? <Badge>Built in</Badge> : null) },
];

export const CropTable = ({ rows }: { rows: CropRow[] }) => <DataTable data={rows} columns={cropColumns} caption="Crops" filterLabel="Filter crops" />;
export const VarietyTable = ({ rows }: { rows: VarietyRow[] }) => <DataTable data={rows} columns={varietyColumns} caption="Varieties" filterLabel="Filter varieties" />;
export const SeedLotTable = ({ rows }: { rows: SeedLotRow[] }) => <DataTable data={rows} columns={lotColumns} caption="Seed lots" filterLabel="Filter seed lots" />;
export const TraitTable = ({ rows }: { rows: TraitRow[] }) => <DataTable data={rows} columns={traitColumns} caption="Trait library" filterLabel="Filter traits" pageSize={25} />;
