"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { formatNumber, signedDifference } from "@/lib/domain/analysis/format";
import { inStatedOrder, lsdWords, rankedValue } from "@/lib/domain/analysis/ranking";
import type { PublicMean } from "@/lib/domain/publish/public-shape";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";

type Row = PublicMean & { shown: string };

/** "+152 (beyond the LSD)", "−38 (within the LSD)"; the check itself reads "the check". */
function againstCheck(m: PublicMean): string {
  if (m.isCheck) return "the check";
  if (m.checkDifference === null) return "–";
  return `${signedDifference(m.checkDifference)}${lsdWords(m.beyondLsd)}`;
}

/**
 * A published trait's means, one row per variety in the stated order (best first; lowest or earliest
 * first when the trait has no preferred direction, which has no rank column). On phones each row is a
 * card, so the group letters and % of check are read without scrolling sideways.
 */
export function PublicMeansTable({ means, betterWhen, unit, caption }: { means: PublicMean[]; betterWhen: BetterWhen; unit: string; caption: string }) {
  const rows: Row[] = inStatedOrder(means).map((m) => ({ ...m, shown: m.varietyName ?? m.blindCode }));
  const hasCheck = means.some((m) => m.isCheck);
  const unitSuffix = unit ? ` (${unit})` : "";
  const columns: ColumnDef<Row, unknown>[] = [
    ...(betterWhen === "neither" ? [] : [{ id: "rank", header: "Rank", accessorFn: (m: Row) => m.rank } as ColumnDef<Row, unknown>]),
    {
      id: "variety",
      header: "Variety",
      accessorFn: (m) => m.shown,
      cell: (c) => (
        <span>
          {c.getValue() as string}
          {c.row.original.isCheck && <span className="ml-1 rounded bg-husk-100 px-1 text-xs font-semibold">check</span>}
        </span>
      ),
    },
    { id: "mean", header: `Mean${unitSuffix}`, accessorFn: (m) => rankedValue(m), cell: (c) => formatNumber(c.getValue() as number) },
    { id: "group", header: "Group", accessorFn: (m) => m.letter ?? "", cell: (c) => <span className="font-mono font-semibold">{(c.getValue() as string) || "–"}</span> },
    ...(hasCheck
      ? ([
          { id: "percentOfCheck", header: "% of check", accessorFn: (m: Row) => m.percentOfCheck, cell: (c: { getValue: () => unknown }) => (c.getValue() === null ? "–" : `${formatNumber(c.getValue() as number, 0)}%`) },
          { id: "vsCheck", header: "Difference from check", accessorFn: (m: Row) => m.checkDifference, cell: (c: { row: { original: Row } }) => againstCheck(c.row.original) },
        ] as ColumnDef<Row, unknown>[])
      : []),
    { id: "se", header: "± SE", accessorFn: (m) => m.se, cell: (c) => formatNumber(c.getValue() as number) },
    { id: "n", header: "Plots", accessorFn: (m) => m.n },
  ];
  return <DataTable pageSize={null} data={rows} columns={columns} caption={caption} testId="public-means" />;
}
