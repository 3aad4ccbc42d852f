"use client";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { formatNumber, valueWithUnit } from "@/lib/domain/analysis/format";
import { directionLabel, lsdWords } from "@/lib/domain/analysis/ranking";
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

/** "104% (beyond the LSD)"; "–" without a check. */
export function percentOfCheckText(r: Pick<VarietyTraitRow, "percentOfCheck" | "beyondLsd">, isCheck: boolean): string {
  if (isCheck) return "100% (the check)";
  if (r.percentOfCheck === null) return "–";
  return `${formatNumber(r.percentOfCheck, 0)}%${lsdWords(r.beyondLsd)}`;
}

function columnsFor(isCheck: boolean): ColumnDef<VarietyTraitRow, unknown>[] {
  return [
    { id: "trait", header: "Trait", accessorFn: (r) => r.trait },
    { id: "mean", header: "Mean", accessorFn: (r) => r.mean, cell: (c) => valueWithUnit(c.row.original, c.row.original.mean) },
    { id: "better", header: "Better when", accessorFn: (r) => directionLabel(r.betterWhen) },
    {
      id: "rank",
      header: "Rank",
      accessorFn: (r) => r.rank,
      cell: (c) => (c.row.original.betterWhen === "neither" ? "not ranked" : c.row.original.rank ? `${c.row.original.rank} of ${c.row.original.of}` : "–"),
    },
    { id: "group", header: "Group", accessorFn: (r) => r.letter ?? "", cell: (c) => <span className="font-mono font-semibold">{c.row.original.letter ?? "–"}</span> },
    { id: "percentOfCheck", header: "% of check", accessorFn: (r) => r.percentOfCheck, cell: (c) => percentOfCheckText(c.row.original, isCheck) },
  ];
}

/** One published variety's results in one trial: a row per trait. */
export function VarietyTraitTable({ rows, caption, isCheck }: { rows: VarietyTraitRow[]; caption: string; isCheck: boolean }) {
  return <DataTable data={rows} columns={columnsFor(isCheck)} caption={caption} pageSize={null} />;
}

export interface SeasonColumn {
  code: string;
  season: string;
  isCheck: boolean;
  traits: VarietyTraitRow[];
}

/** The variety's % of check per trait, one column per published season (oldest first). */
export function CheckHistoryTable({ seasons, caption }: { seasons: SeasonColumn[]; caption: string }) {
  const traits = [...new Map(seasons.flatMap((s) => s.traits).map((t) => [t.traitCode, t.trait])).entries()];
  const rows = traits.map(([code, name]) => ({ code, name }));
  const columns: ColumnDef<{ code: string; name: string }, unknown>[] = [
    { id: "trait", header: "Trait", accessorFn: (r) => r.name },
    ...seasons.map(
      (s): ColumnDef<{ code: string; name: string }, unknown> => ({
        id: `season-${s.code}`,
        header: `${s.season} (${s.code})`,
        accessorFn: (r) => s.traits.find((t) => t.traitCode === r.code)?.percentOfCheck ?? null,
        cell: (c) => {
          const row = s.traits.find((t) => t.traitCode === c.row.original.code);
          return row ? percentOfCheckText(row, s.isCheck) : "not in this trial";
        },
      }),
    ),
  ];
  return <DataTable data={rows} columns={columns} caption={caption} pageSize={null} testId="check-history" />;
}
