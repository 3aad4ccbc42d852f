"use client";
import type { ColumnDef } from "@tanstack/react-table";
import type { AnovaRow } from "@/lib/domain/stats";
import type { EntryResult, GerminationRow, LabelComparison, MissingPlot } from "@/lib/domain/analysis/types";
import { formatNumber, formatP, signedDifference } from "@/lib/domain/analysis/format";
import { DataTable } from "@/components/ui/data-table";
import { ANOVA_SOURCE_LABELS } from "@/lib/domain/vocabulary/labels";

export type EntryLabel = (e: { blindCode: string; varietyName?: string | null }) => string;

/**
 * An entry mean as the tables and charts need it. Staff rows carry the variety and the check flag;
 * growers' rows before publication carry the blind code only; public rows have no internal ids.
 */
export type MeanRow = Pick<EntryResult, "blindCode" | "mean" | "lsMean" | "se" | "n" | "letter" | "rank"> &
  Partial<Pick<EntryResult, "percentOfCheck" | "checkDifference" | "beyondLsd">> & { varietyName?: string | null; isCheck?: boolean };
/** A germination row with or without the variety name. */
export type GerminationRowView = Omit<GerminationRow, "entryId" | "siteId" | "varietyName"> & { varietyName?: string | null };
type Labelled<T> = T & { shown: string };
type EmergenceKinetics = { blindCode: string; varietyName?: string | null; meanEmergenceTime: number | null; t50: number | null; plots: number };

/** % of check as a cell: "95%", the difference, and a mark when it is larger than the LSD. */
function CheckCell({ row }: { row: MeanRow }) {
  if (row.percentOfCheck === null || row.percentOfCheck === undefined) return <span>–</span>;
  if (row.isCheck) return <span>100 (check)</span>;
  return (
    <span>
      {formatNumber(row.percentOfCheck, 0)}
      <span className="text-loam-700"> ({signedDifference(row.checkDifference ?? 0)})</span>
      {row.beyondLsd && <span title="differs from the check by more than the LSD 0.05"> ◆</span>}
    </span>
  );
}

/**
 * Entry means with SE, n, rank, % of check and letters; sortable and filterable. Listed in the stated
 * order (`order`, from orderWords): best first when the trait has a direction, else lowest first with no rank.
 */
export function MeansTable({ means, label, unit, caption, order, testId, lsdMarks = true }: { means: MeanRow[]; label: EntryLabel; unit: string; caption: string; order?: string; testId?: string; lsdMarks?: boolean }) {
  // The shown name is part of the data, because the table caches accessor values per row.
  const rows: Labelled<MeanRow>[] = means.map((m) => ({ ...m, shown: label(m) }));
  const showLs = means.some((m) => m.lsMean !== null && Math.abs(m.lsMean - m.mean) > 1e-9);
  const ranked = means.some((m) => m.rank !== null);
  const withCheck = means.some((m) => m.percentOfCheck !== null && m.percentOfCheck !== undefined);
  const columns: ColumnDef<Labelled<MeanRow>, unknown>[] = [
    ...(ranked ? [{ id: "rank", header: "Rank", accessorFn: (m: MeanRow) => m.rank } as ColumnDef<Labelled<MeanRow>, unknown>] : []),
    { id: "entry", header: "Entry", accessorFn: (m) => m.shown, cell: (c) => (
      <span>
        {c.getValue() as string}
        {c.row.original.isCheck && <span className="ml-1 rounded bg-husk-100 px-1 text-xs font-semibold">check</span>}
      </span>
    ) },
    { id: "mean", header: `Mean (${unit})`, accessorFn: (m) => m.lsMean ?? m.mean, cell: (c) => formatNumber(c.row.original.mean) },
    ...(showLs ? [{ id: "lsMean", header: "LS mean", accessorFn: (m: MeanRow) => m.lsMean, cell: (c: { getValue: () => unknown }) => formatNumber(c.getValue() as number | null) } as ColumnDef<Labelled<MeanRow>, unknown>] : []),
    ...(withCheck ? [{ id: "percentOfCheck", header: "% of check", accessorFn: (m: MeanRow) => m.percentOfCheck, cell: (c: { row: { original: MeanRow } }) => <CheckCell row={c.row.original} /> } as ColumnDef<Labelled<MeanRow>, unknown>] : []),
    { id: "se", header: "± SE", accessorFn: (m) => m.se, cell: (c) => formatNumber(c.getValue() as number) },
    { id: "n", header: "Plots", accessorFn: (m) => m.n },
    { id: "letter", header: "Group", accessorFn: (m) => m.letter ?? "", cell: (c) => <span className="font-mono">{(c.getValue() as string) || "–"}</span> },
  ];
  const notes = [order && `Listed ${order}.`, withCheck && `% of check: the entry's mean as a share of the check's (check = 100), with the difference in brackets${lsdMarks ? "; ◆ marks a difference larger than the LSD 0.05" : ""}.`].filter(Boolean).join(" ");
  return (
    <div className="space-y-1">
      <DataTable pageSize={null} data={rows} columns={columns} caption={caption} filterLabel="Filter entries" initialSort={[ranked ? { id: "rank", desc: false } : { id: "mean", desc: false }]} testId={testId} />
      {notes && <p className="text-sm text-loam-700">{notes}</p>}
    </div>
  );
}

/** The ANOVA table in plain words, in the model's order (sorting it would break the reading order of sources). */
export function AnovaTable({ rows, caption }: { rows: AnovaRow[]; caption: string }) {
  const columns: ColumnDef<AnovaRow, unknown>[] = [
    { id: "source", header: "Source", accessorFn: (r) => ANOVA_SOURCE_LABELS[r.source] },
    { id: "df", header: "df", accessorFn: (r) => r.df },
    { id: "ss", header: "Sum of squares", accessorFn: (r) => r.ss, cell: (c) => formatNumber(c.getValue() as number) },
    { id: "ms", header: "Mean square", accessorFn: (r) => r.ms, cell: (c) => formatNumber(c.getValue() as number) },
    { id: "f", header: "F", accessorFn: (r) => r.f, cell: (c) => (c.getValue() === null ? "" : formatNumber(c.getValue() as number, 2)) },
    { id: "p", header: "p", accessorFn: (r) => r.p, cell: (c) => (c.getValue() === null ? "" : formatP(c.getValue() as number).replace(/^p [=<] ?/, (m) => (m.includes("<") ? "< " : ""))) },
    { id: "against", header: "Tested against", accessorFn: (r) => (r.testedAgainst ? ANOVA_SOURCE_LABELS[r.testedAgainst] : "") },
  ];
  return <DataTable pageSize={null} data={rows} columns={columns.map((c) => ({ ...c, enableSorting: false }))} caption={caption} />;
}

/** Mean emergence time and T50 per entry. */
export function EmergenceTimeTable({ rows, label }: { rows: EmergenceKinetics[]; label: EntryLabel }) {
  const data: Labelled<EmergenceKinetics>[] = rows.map((r) => ({ ...r, shown: label(r) }));
  const columns: ColumnDef<Labelled<EmergenceKinetics>, unknown>[] = [
    { id: "entry", header: "Entry", accessorFn: (k) => k.shown },
    { id: "met", header: "Mean emergence time (days)", accessorFn: (k) => k.meanEmergenceTime, cell: (c) => formatNumber(c.getValue() as number | null, 2) },
    { id: "t50", header: "T50 (days)", accessorFn: (k) => k.t50, cell: (c) => formatNumber(c.getValue() as number | null, 2) },
    { id: "plots", header: "Plots", accessorFn: (k) => k.plots },
  ];
  return <DataTable pageSize={null} data={data} columns={columns} caption="Mean emergence time per entry" />;
}

export function MissingTable({ missing }: { missing: MissingPlot[] }) {
  const columns: ColumnDef<MissingPlot, unknown>[] = [
    { id: "plot", header: "Plot", accessorFn: (m) => m.plotCode },
    { id: "site", header: "Site", accessorFn: (m) => m.siteName },
    { id: "block", header: "Block", accessorFn: (m) => m.block },
    { id: "entry", header: "Entry", accessorFn: (m) => m.blindCode },
    { id: "reason", header: "Why missing", accessorFn: (m) => m.reason },
    { id: "handling", header: "How handled", accessorFn: (m) => m.handling },
  ];
  return <DataTable pageSize={null} data={missing} columns={columns} caption="Missing and excluded plots" filterLabel="Filter plots" />;
}

export function GerminationTable({ rows, label, bySite, caption }: { rows: GerminationRowView[]; label: EntryLabel; bySite: boolean; caption?: string }) {
  const data: Labelled<GerminationRowView>[] = rows.map((r) => ({ ...r, shown: label(r) }));
  const columns: ColumnDef<Labelled<GerminationRowView>, unknown>[] = [
    ...(bySite ? [{ id: "site", header: "Site", accessorFn: (r: GerminationRowView) => r.siteName ?? "" } as ColumnDef<Labelled<GerminationRowView>, unknown>] : []),
    { id: "entry", header: "Entry", accessorFn: (r) => r.shown },
    { id: "sown", header: "Seeds sown", accessorFn: (r) => r.sown },
    { id: "emerged", header: "Emerged", accessorFn: (r) => r.emerged },
    { id: "percent", header: "Emergence %", accessorFn: (r) => r.percent, cell: (c) => formatNumber(c.getValue() as number, 1) },
    { id: "ci", header: "95% interval", accessorFn: (r) => r.lower, cell: (c) => `${formatNumber(c.row.original.lower, 1)}–${formatNumber(c.row.original.upper, 1)}` },
  ];
  return <DataTable pageSize={null} data={data} columns={columns} caption={caption ?? (bySite ? "Emergence per entry and site" : "Emergence per entry")} filterLabel={bySite ? "Filter sites or entries" : undefined} />;
}

export function LabelTable({ rows, label }: { rows: LabelComparison[]; label: EntryLabel }) {
  const data: Labelled<LabelComparison>[] = rows.map((r) => ({ ...r, shown: label(r) }));
  const columns: ColumnDef<Labelled<LabelComparison>, unknown>[] = [
    { id: "entry", header: "Entry", accessorFn: (r) => r.shown },
    { id: "lot", header: "Seed lot", accessorFn: (r) => r.seedLot ?? "" },
    { id: "label", header: "Label %", accessorFn: (r) => r.labelPercent, cell: (c) => (c.getValue() === null ? "not stated" : formatNumber(c.getValue() as number, 0)) },
    { id: "observed", header: "Trial %", accessorFn: (r) => r.observedPercent, cell: (c) => formatNumber(c.getValue() as number, 1) },
    { id: "p", header: "χ² vs label", accessorFn: (r) => r.chiSquareP, cell: (c) => (c.getValue() === null ? "–" : formatP(c.getValue() as number)) },
    { id: "note", header: "Reading", accessorFn: (r) => r.note },
  ];
  return <DataTable pageSize={null} data={data} columns={columns} caption="Emergence compared with each seed lot's label germination" />;
}
