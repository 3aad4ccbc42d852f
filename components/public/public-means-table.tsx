"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { useTranslations } from "next-intl";
import { DataTable } from "@/components/ui/data-table";
import { signedDifference } from "@/lib/domain/analysis/format";
import { inStatedOrder, rankedValue } from "@/lib/domain/analysis/ranking";
import type { PublicMean } from "@/lib/domain/publish/public-shape";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";
import { useFigures } from "./use-figures";

type Row = PublicMean & { shown: string };

/**
 * A published trait's means, one row per variety in the stated order (best first; lowest or earliest
 * first when the trait has no preferred direction, which has no rank column). On phones each row is a
 * card, so the group letters and % of check are read without scrolling sideways.
 */
export function PublicMeansTable({ means, betterWhen, unit, caption }: { means: PublicMean[]; betterWhen: BetterWhen; unit: string; caption: string }) {
  const t = useTranslations("publicTables");
  const figures = useFigures();
  /** "+152 (beyond the LSD)", "−38 (within the LSD)"; the check itself reads "the check". */
  const againstCheck = (m: PublicMean) => {
    if (m.isCheck) return t("theCheck");
    if (m.checkDifference === null) return "–";
    return `${signedDifference(m.checkDifference, figures.number)}${m.beyondLsd === null ? "" : m.beyondLsd ? t("beyondLsd") : t("withinLsd")}`;
  };
  const rows: Row[] = inStatedOrder(means).map((m) => ({ ...m, shown: m.varietyName ?? m.blindCode }));
  const hasCheck = means.some((m) => m.isCheck);
  const columns: ColumnDef<Row, unknown>[] = [
    ...(betterWhen === "neither" ? [] : [{ id: "rank", header: t("rank"), accessorFn: (m: Row) => m.rank } as ColumnDef<Row, unknown>]),
    {
      id: "variety",
      header: t("variety"),
      accessorFn: (m) => m.shown,
      cell: (c) => (
        <span>
          {c.getValue() as string}
          {c.row.original.isCheck && <span className="ml-1 rounded bg-husk-100 px-1 text-xs font-semibold">{t("check")}</span>}
        </span>
      ),
    },
    { id: "mean", header: unit ? t("meanIn", { unit }) : t("mean"), accessorFn: (m) => rankedValue(m), cell: (c) => figures.number(c.getValue() as number) },
    { id: "group", header: t("group"), accessorFn: (m) => m.letter ?? "", cell: (c) => <span className="font-mono font-semibold">{(c.getValue() as string) || "–"}</span> },
    ...(hasCheck
      ? ([
          { id: "percentOfCheck", header: t("percentOfCheck"), accessorFn: (m: Row) => m.percentOfCheck, cell: (c: { getValue: () => unknown }) => figures.percent(c.getValue() as number | null, 0) },
          { id: "vsCheck", header: t("differenceFromCheck"), accessorFn: (m: Row) => m.checkDifference, cell: (c: { row: { original: Row } }) => againstCheck(c.row.original) },
        ] as ColumnDef<Row, unknown>[])
      : []),
    { id: "se", header: t("se"), accessorFn: (m) => m.se, cell: (c) => figures.number(c.getValue() as number) },
    { id: "n", header: t("plots"), accessorFn: (m) => m.n },
  ];
  return <DataTable pageSize={null} data={rows} columns={columns} caption={caption} testId="public-means" />;
}
