"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { useTranslations } from "next-intl";
import type { Figures } from "@/lib/domain/i18n/figures";
import { useFigures } from "./use-figures";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";

export interface VarietyTraitRow {
  trait: string;
  traitCode: string;
  unit: string | null;
  valueType: string;
  computation: string;
  betterWhen: BetterWhen;
  mean: number | null;
  rank: number | null;
  of: number;
  letter: string | null;
  percentOfCheck: number | null;
  beyondLsd: boolean | null;
}

type Words = ReturnType<typeof useTranslations<"publicTables">>;

/** "104% (beyond the LSD)"; "–" without a check. */
function percentOfCheckText(t: Words, figures: Figures, r: Pick<VarietyTraitRow, "percentOfCheck" | "beyondLsd">, isCheck: boolean): string {
  if (isCheck) return t("checkItself");
  if (r.percentOfCheck === null) return "–";
  return `${figures.percent(r.percentOfCheck, 0)}${r.beyondLsd === null ? "" : r.beyondLsd ? t("beyondLsd") : t("withinLsd")}`;
}

const directionKey = { higher: "higherBetter", lower: "lowerBetter", neither: "noPreference" } as const;

function columnsFor(t: Words, figures: Figures, isCheck: boolean): ColumnDef<VarietyTraitRow, unknown>[] {
  return [
    { id: "trait", header: t("trait"), accessorFn: (r) => r.trait },
    { id: "mean", header: t("mean"), accessorFn: (r) => r.mean, cell: (c) => figures.value(c.row.original, c.row.original.mean) },
    { id: "better", header: t("betterWhen"), accessorFn: (r) => t(directionKey[r.betterWhen]) },
    {
      id: "rank",
      header: t("rank"),
      accessorFn: (r) => r.rank,
      cell: (c) => (c.row.original.betterWhen === "neither" ? t("notRanked") : c.row.original.rank ? t("rankOf", { rank: String(c.row.original.rank), of: String(c.row.original.of) }) : "–"),
    },
    { id: "group", header: t("group"), accessorFn: (r) => r.letter ?? "", cell: (c) => <span className="font-mono font-semibold">{c.row.original.letter ?? "–"}</span> },
    { id: "percentOfCheck", header: t("percentOfCheck"), accessorFn: (r) => r.percentOfCheck, cell: (c) => percentOfCheckText(t, figures, c.row.original, isCheck) },
  ];
}

/** One published variety's results in one trial: a row per trait. */
export function VarietyTraitTable({ rows, caption, isCheck }: { rows: VarietyTraitRow[]; caption: string; isCheck: boolean }) {
  const t = useTranslations("publicTables");
  const figures = useFigures();
  return <DataTable data={rows} columns={columnsFor(t, figures, isCheck)} caption={caption} pageSize={null} />;
}

export interface SeasonColumn {
  code: string;
  season: string;
  isCheck: boolean;
  traits: VarietyTraitRow[];
}

/** The variety's % of check per trait, one column per published season (oldest first). */
export function CheckHistoryTable({ seasons, caption }: { seasons: SeasonColumn[]; caption: string }) {
  const t = useTranslations("publicTables");
  const figures = useFigures();
  const traits = [...new Map(seasons.flatMap((s) => s.traits).map((t) => [t.traitCode, t.trait])).entries()];
  const rows = traits.map(([code, name]) => ({ code, name }));
  const columns: ColumnDef<{ code: string; name: string }, unknown>[] = [
    { id: "trait", header: t("trait"), accessorFn: (r) => r.name },
    ...seasons.map(
      (s): ColumnDef<{ code: string; name: string }, unknown> => ({
        id: `season-${s.code}`,
        header: `${s.season} (${s.code})`,
        accessorFn: (r) => s.traits.find((t) => t.traitCode === r.code)?.percentOfCheck ?? null,
        cell: (c) => {
          const row = s.traits.find((t) => t.traitCode === c.row.original.code);
          return row ? percentOfCheckText(t, figures, row, s.isCheck) : t("notInTrial");
        },
      }),
    ),
  ];
  return <DataTable data={rows} columns={columns} caption={caption} pageSize={null} testId="check-history" />;
}
