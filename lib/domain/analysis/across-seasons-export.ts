/**
 * The across-seasons view as plain tables for its downloads (xlsx sheets, one CSV each): what the page
 * shows, from the same view, so the file and the screen cannot drift apart. Staff files: variety names in.
 * lib/domain/spreadsheets/write turns them into files and makes every cell safe.
 */
import type { Cell, ExportTable } from "./export";
import type { MixedAnalysis } from "./mixed";
import { MIXED_SHEETS, mixedExportTables } from "./mixed-export";
import { orderWords } from "./ranking";
import type { AnalysisResult } from "./types";
import { STATUS_LABELS } from "@/lib/domain/vocabulary/statuses";
import type { TrialStatus } from "@/lib/domain/vocabulary/enums";

/** What the across-seasons page shows once a crop and a trait are chosen. */
export interface AcrossSeasonsShown {
  crop: { name: string };
  trait: { code: string; name: string };
  outcome: { mixed: MixedAnalysis | null; mixedProblem: string | null; seasons: number; trait: AnalysisResult["trait"] | null } | null;
  trials: { code: string; title: string; season: string; year: number; status: TrialStatus; used: boolean }[];
}

export const ACROSS_SEASONS_SHEETS = { settings: "Across seasons", trials: "Trials", ...MIXED_SHEETS } as const;
/** The tables a CSV download can hold, by the name its address uses. */
export const ACROSS_SEASONS_CSV = { means: MIXED_SHEETS.means, model: MIXED_SHEETS.components, pairs: MIXED_SHEETS.pairs, trials: "Trials" } as const;
export type AcrossSeasonsCsvTable = keyof typeof ACROSS_SEASONS_CSV;
export const ACROSS_SEASONS_CSV_TABLES = Object.keys(ACROSS_SEASONS_CSV) as [AcrossSeasonsCsvTable, ...AcrossSeasonsCsvTable[]];

const seasonOf = (t: { season: string; year: number }) => (t.season.includes(String(t.year)) ? t.season : `${t.season} ${t.year}`);

/** Every table of the download, in sheet order. `generatedAt` is passed in so this stays pure. */
export function acrossSeasonsTables(view: AcrossSeasonsShown, generatedAt: string): ExportTable[] {
  const analysed = view.outcome?.trait ?? null;
  const mixed = view.outcome?.mixed ?? null;
  const settings: ExportTable = {
    name: ACROSS_SEASONS_SHEETS.settings,
    columns: ["Setting", "Value"],
    rows: [
      ["Crop", view.crop.name],
      ["Trait", view.trait.name],
      ...(analysed ? ([["Analysed as", analysed.analysedAs], ["Order", orderWords(analysed)]] as Cell[][]) : []),
      ["Seasons with data", view.outcome?.seasons ?? 0],
      ...(mixed ? ([["Site-years", mixed.environments.join(", ")]] as Cell[][]) : [["Result", view.outcome?.mixedProblem ?? "No trial of this crop has data for this trait yet."]]),
      ["Data used", "each trial's accepted data, with its exclusions applied"],
      ["Generated", generatedAt],
    ],
  };
  const trials: ExportTable = {
    name: ACROSS_SEASONS_SHEETS.trials,
    columns: ["Trial", "Title", "Season", "Stage", "In the analysis"],
    rows: view.trials.map((t): Cell[] => [t.code, t.title, seasonOf(t), STATUS_LABELS[t.status], t.used]),
  };
  return [settings, ...mixedExportTables(mixed, true), trials];
}
