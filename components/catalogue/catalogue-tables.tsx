"use client";
import { useMemo } from "react";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { Badge } from "@/components/ui/badge";
import type { CropRow, SeedLotRow, TraitRow, VarietyRow } from "@/db/queries/catalogue";
import { COMPUTATION_LABELS, CROP_GROUP_LABELS, TRAIT_TYPE_LABELS } from "@/lib/domain/vocabulary/labels";
import { removeCrop, removeSeedLot, removeTrait, removeVariety } from "@/server/actions/catalogue";
import { CropForm, SeedLotForm, TraitForm, VarietyForm } from "./catalogue-forms";
import { RowActions, TableNotices } from "./row-actions";

const trialCount = (n: number) => `${n} ${n === 1 ? "trial" : "trials"}`;
const actionsColumn = <T,>(cell: (row: T) => React.ReactNode): ColumnDef<T, unknown> => ({
  id: "actions",
  header: () => <span className="sr-only">Actions</span>,
  enableSorting: false,
  enableGlobalFilter: false,
  cell: (c) => cell(c.row.original),
});

const cropColumns: ColumnDef<CropRow, unknown>[] = [
  { accessorKey: "name", header: "Crop", cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
  { id: "group", accessorFn: (r) => CROP_GROUP_LABELS[r.cropGroup], header: "Group" },
  { accessorKey: "scientificName", header: "Scientific name", cell: (c) => <i>{c.row.original.scientificName ?? ""}</i> },
  { accessorKey: "varieties", header: "Varieties" },
  { accessorKey: "trials", header: "Trials" },
  actionsColumn((r) => (
    <RowActions
      name={r.name}
      idField="cropId"
      id={r.id}
      remove={removeCrop}
      editTitle={`Edit ${r.name}`}
      note={
        r.usedByOtherPrograms
          ? "Another program also grows this crop, so only an administrator can rename or delete it."
          : r.trials > 0
            ? `Grown in ${trialCount(r.trials)}. Their pages show the new name; published reports keep the name they were published with.`
            : null
      }
      renderEdit={(onSaved) => <CropForm item={r} onSaved={onSaved} />}
    />
  )),
];

function varietyColumns(crops: { id: number; name: string }[]): ColumnDef<VarietyRow, unknown>[] {
  return [
    { accessorKey: "crop", header: "Crop" },
    { accessorKey: "name", header: "Variety", cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
    { accessorKey: "seedLots", header: "Seed lots" },
    { accessorKey: "trials", header: "Trials" },
    { accessorKey: "description", header: "Notes", enableSorting: false },
    actionsColumn((r) => (
      <RowActions
        name={r.name}
        idField="varietyId"
        id={r.id}
        remove={removeVariety}
        editTitle={`Edit ${r.name}`}
        note={r.trials > 0 ? `An entry in ${trialCount(r.trials)}, so it stays a ${r.crop} variety. Published reports keep the name they were published with.` : null}
        renderEdit={(onSaved) => <VarietyForm crops={crops} item={r} onSaved={onSaved} />}
      />
    )),
  ];
}

function lotColumns(varieties: { id: number; name: string; crop: string }[]): ColumnDef<SeedLotRow, unknown>[] {
  return [
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
    { accessorKey: "trials", header: "Trials" },
    actionsColumn((r) => (
      <RowActions
        name={`lot ${r.lotCode}`}
        idField="seedLotId"
        id={r.id}
        remove={removeSeedLot}
        editTitle={`Edit lot ${r.lotCode} (${r.variety})`}
        note={
          r.trials > 0
            ? `Used by entries in ${trialCount(r.trials)}, so it stays with ${r.variety}. Its label germination and treatment cannot change while one of those trials is published.`
            : null
        }
        renderEdit={(onSaved) => <SeedLotForm varieties={varieties} item={r} onSaved={onSaved} />}
      />
    )),
  ];
}

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
  { accessorKey: "trials", header: "Trials" },
  // Built-in traits come from the seed script and stay as they are; only coordinators' own traits change here.
  actionsColumn((r) =>
    r.builtIn ? (
      <span className="whitespace-nowrap">
        <Badge>Built in</Badge>
      </span>
    ) : (
      <RowActions
        name={r.name}
        idField="traitId"
        id={r.id}
        remove={removeTrait}
        editTitle={`Edit ${r.name}`}
        note={
          r.trials > 0
            ? `Recorded in ${trialCount(r.trials)}. Once a site is laid out or values are recorded, only the name, unit, timing note and description can change.`
            : null
        }
        renderEdit={(onSaved) => <TraitForm item={r} onSaved={onSaved} />}
      />
    ),
  ),
];

export const CropTable = ({ rows }: { rows: CropRow[] }) => (
  <TableNotices>
    <DataTable data={rows} columns={cropColumns} caption="Crops" filterLabel="Filter crops" />
  </TableNotices>
);

/** A program column, only for people who see more than one program's items (admins, multi-program coordinators). */
function withProgramColumn<T extends { program: string | null }>(rows: T[], columns: ColumnDef<T, unknown>[]): ColumnDef<T, unknown>[] {
  const programs = new Set(rows.map((r) => r.program).filter((p) => p !== null));
  if (programs.size < 2) return columns;
  return [...columns.slice(0, -1), { id: "program", accessorFn: (r) => r.program ?? "Every program", header: "Program" }, columns.at(-1)!];
}

export function VarietyTable({ rows, crops }: { rows: VarietyRow[]; crops: { id: number; name: string }[] }) {
  const columns = useMemo(() => withProgramColumn(rows, varietyColumns(crops)), [rows, crops]);
  return (
    <TableNotices>
      <DataTable data={rows} columns={columns} caption="Varieties" filterLabel="Filter varieties" />
    </TableNotices>
  );
}

export function SeedLotTable({ rows, varieties }: { rows: SeedLotRow[]; varieties: { id: number; name: string; crop: string }[] }) {
  const columns = useMemo(() => lotColumns(varieties), [varieties]);
  return (
    <TableNotices>
      <DataTable data={rows} columns={columns} caption="Seed lots" filterLabel="Filter seed lots" />
    </TableNotices>
  );
}

export function TraitTable({ rows }: { rows: TraitRow[] }) {
  const columns = useMemo(() => withProgramColumn(rows, traitColumns), [rows]);
  return (
    <TableNotices>
      <DataTable data={rows} columns={columns} caption="Trait library" filterLabel="Filter traits" pageSize={25} />
    </TableNotices>
  );
}
