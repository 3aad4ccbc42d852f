"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { useTranslations } from "next-intl";
import { DataTable } from "@/components/ui/data-table";
import type { PublicGerminationView } from "@/lib/domain/publish/public-view";
import { useFigures } from "./use-figures";

type EntryRow = PublicGerminationView["byEntry"][number] & { shown: string };
type LabelRow = PublicGerminationView["labels"][number] & { shown: string };

/** The trial's germination: per-variety emergence with its interval, the chi-square test between varieties, and the seed labels compared. */
export function GerminationSection({ germination }: { germination: PublicGerminationView }) {
  const t = useTranslations("publicTables");
  const figures = useFigures();
  const { chiSquare, cmh } = germination;
  const byEntry = germination.byEntry.map((g) => ({ ...g, shown: g.varietyName ?? g.blindCode }));
  const labels = germination.labels.map((l) => ({ ...l, shown: l.varietyName ?? l.blindCode }));
  const entryColumns: ColumnDef<EntryRow, unknown>[] = [
    { id: "variety", header: t("variety"), accessorFn: (g) => g.shown },
    { id: "sown", header: t("seedsSown"), accessorFn: (g) => g.sown },
    { id: "emerged", header: t("emerged"), accessorFn: (g) => g.emerged },
    { id: "percent", header: t("emergencePercent"), accessorFn: (g) => g.percent, cell: (c) => figures.percent(c.getValue() as number, 1) },
    { id: "interval", header: t("interval"), accessorFn: (g) => g.lower, cell: (c) => figures.percent(c.row.original.lower, 1).replace(/\s?%$/, "") + "–" + figures.percent(c.row.original.upper, 1) },
  ];
  const labelColumns: ColumnDef<LabelRow, unknown>[] = [
    { id: "variety", header: t("variety"), accessorFn: (l) => l.shown },
    { id: "lot", header: t("seedLot"), accessorFn: (l) => l.seedLot ?? "–" },
    { id: "label", header: t("labelPercent"), accessorFn: (l) => l.labelPercent, cell: (c) => (c.getValue() === null ? t("notStated") : figures.percent(c.getValue() as number, 0)) },
    { id: "observed", header: t("emergedPercent"), accessorFn: (l) => l.observedPercent, cell: (c) => figures.percent(c.getValue() as number, 1) },
    { id: "p", header: t("testAgainstLabel"), accessorFn: (l) => l.chiSquareP, cell: (c) => (c.getValue() === null ? "–" : figures.p(c.getValue() as number)) },
    { id: "note", header: t("reading"), accessorFn: (l) => l.note },
  ];
  return (
    <div className="space-y-4">
      <p>{germination.note}</p>
      <DataTable pageSize={null} data={byEntry} columns={entryColumns} caption={t("emergenceCaption")} testId="germination-by-entry" />
      {chiSquare && (
        <p data-testid="germination-chi-square">
          {t("chiSquare", { statistic: figures.number(chiSquare.statistic, 2), df: String(chiSquare.df), p: figures.p(chiSquare.p) })}
          {chiSquare.lowExpected > 0 ? t("lowExpected", { low: String(chiSquare.lowExpected), cells: String(chiSquare.cells) }) : ""}.
          {cmh && t("cmh", { sites: String(cmh.sites), p: figures.p(cmh.p) })}
        </p>
      )}
      <h3 className="text-lg font-bold">{t("comparedWithLabel")}</h3>
      <DataTable pageSize={null} data={labels} columns={labelColumns} caption={t("labelCaption")} testId="germination-labels" />
    </div>
  );
}
