"use client";
import type { ColumnDef } from "@tanstack/react-table";
import type { AnovaRow } from "@/lib/domain/stats";
import type { EntryResult, GerminationRow, LabelComparison, MissingPlot } from "@/lib/domain/analysis/types";
import { formatNumber, formatP } from "@/lib/domain/analysis/format";
import { SortableTable } from "./sortable-table";

export type EntryLabel = (e: { blindCode: string; varietyName?: string | null }) => string;

/**
 * An entry mean as the tables and charts need it. Staff rows carry the variety and the check flag;
 * growers' rows before publication carry the blind code only; public rows have no internal ids.
 */
export type MeanRow = Pick<EntryResult, "blindCode" | "mean" | "lsMean" | "se" | "n" | "letter" | "rank"> & { varietyName?: string | null; isCheck?: boolean };
/** A germination row with or without the variety name. */
export type GerminationRowView = Omit<GerminationRow, "entryId" | "siteId" | "varietyName"> & { varietyName?: string | null };
type Labelled<T> = T & { shown: string };

const SOURCE_WORDS: Record<AnovaRow["source"], string> = {
  site: "Sites",
  block: "Blocks",
  "block:site": "Blocks within sites",
  entry: "Entries",
  "entry:site": "Entry × site",
  residual: "Error",
};

/** Entry means with SE, n, rank and letters; sortable and filterable. */
export function MeansTable({ means, label, unit, caption, testId }: { means: MeanRow[]; label: EntryLabel; unit: string; caption: string; testId?: string }) {
  // The shown name is part of the data, because the table caches accessor values per row.
  const rows: Labelled<MeanRow>[] = means.map((m) => ({ ...m, shown: label(m) }));
  const showLs = means.some((m) => m.lsMean !== null && Math.abs(m.lsMean - m.mean) > 1e-9);
  const columns: ColumnDef<Labelled<MeanRow>, unknown>[] = [
    { id: "rank", header: "Rank", accessorFn: (m) => m.rank },
    { id: "entry", header: "Entry", accessorFn: (m) => m.shown, cell: (c) => (
      <span>
        {c.getValue() as string}
        {c.row.original.isCheck && <span className="ml-1 rounded bg-husk-100 px-1 text-xs font-semibold">check</span>}
      </span>
    ) },
    { id: "mean", header: `Mean (${unit})`, accessorFn: (m) => m.mean, cell: (c) => formatNumber(c.getValue() as number) },
    ...(showLs ? [{ id: "lsMean", header: "LS mean", accessorFn: (m: MeanRow) => m.lsMean, cell: (c: { getValue: () => unknown }) => formatNumber(c.getValue() as number | null) } as ColumnDef<Labelled<MeanRow>, unknown>] : []),
    { id: "se", header: "± SE", accessorFn: (m) => m.se, cell: (c) => formatNumber(c.getValue() as number) },
    { id: "n", header: "Plots", accessorFn: (m) => m.n },
    { id: "letter", header: "Group", accessorFn: (m) => m.letter ?? "", cell: (c) => <span className="font-mono">{(c.getValue() as string) || "–"}</span> },
  ];
  return <SortableTable data={rows} columns={columns} caption={caption} filterLabel="Filter entries" initialSort={[{ id: "rank", desc: false }]} testId={testId} />;
}

/** The ANOVA table in plain words. */
export function AnovaTable({ rows, caption }: { rows: AnovaRow[]; caption: string }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-husk-400 text-left">
            <th scope="col" className="px-2 py-1">Source</th>
            <th scope="col" className="px-2 py-1">df</th>
            <th scope="col" className="px-2 py-1">Sum of squares</th>
            <th scope="col" className="px-2 py-1">Mean square</th>
            <th scope="col" className="px-2 py-1">F</th>
            <th scope="col" className="px-2 py-1">p</th>
            <th scope="col" className="px-2 py-1">Tested against</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.source} className="border-b border-husk-200 tabular-nums">
              <th scope="row" className="px-2 py-1 text-left font-normal">{SOURCE_WORDS[r.source]}</th>
              <td className="px-2 py-1">{r.df}</td>
              <td className="px-2 py-1">{formatNumber(r.ss)}</td>
              <td className="px-2 py-1">{formatNumber(r.ms)}</td>
              <td className="px-2 py-1">{r.f === null ? "" : formatNumber(r.f, 2)}</td>
              <td className="px-2 py-1">{r.p === null ? "" : formatP(r.p).replace(/^p [=<] ?/, (m) => (m.includes("<") ? "< " : ""))}</td>
              <td className="px-2 py-1">{r.testedAgainst ? SOURCE_WORDS[r.testedAgainst] : ""}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
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
  return <SortableTable data={missing} columns={columns} caption="Missing and excluded plots" filterLabel="Filter plots" />;
}

export function GerminationTable({ rows, label, bySite }: { rows: GerminationRowView[]; label: EntryLabel; bySite: boolean }) {
  const data: Labelled<GerminationRowView>[] = rows.map((r) => ({ ...r, shown: label(r) }));
  const columns: ColumnDef<Labelled<GerminationRowView>, unknown>[] = [
    ...(bySite ? [{ id: "site", header: "Site", accessorFn: (r: GerminationRowView) => r.siteName ?? "" } as ColumnDef<Labelled<GerminationRowView>, unknown>] : []),
    { id: "entry", header: "Entry", accessorFn: (r) => r.shown },
    { id: "sown", header: "Seeds sown", accessorFn: (r) => r.sown },
    { id: "emerged", header: "Emerged", accessorFn: (r) => r.emerged },
    { id: "percent", header: "Emergence %", accessorFn: (r) => r.percent, cell: (c) => formatNumber(c.getValue() as number, 1) },
    { id: "ci", header: "95% interval", accessorFn: (r) => r.lower, cell: (c) => `${formatNumber(c.row.original.lower, 1)}–${formatNumber(c.row.original.upper, 1)}` },
  ];
  return <SortableTable data={data} columns={columns} caption={bySite ? "Emergence per entry and site" : "Emergence per entry"} filterLabel={bySite ? "Filter sites or entries" : undefined} />;
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
  return <SortableTable data={data} columns={columns} caption="Emergence compared with each seed lot's label germination" />;
}
