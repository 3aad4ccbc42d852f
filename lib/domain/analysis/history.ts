/**
 * One variety's standing in one trial's analysis: where it ranked across sites and at each site, its
 * mean as a percentage of the trial mean and of the check (the usual ways to compare across seasons).
 */
import { extremeWord } from "./ranking";
import type { AnalysisResult } from "./types";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";

export interface TrialStanding {
  trait: string;
  betterWhen: BetterWhen;
  mean: number | null;
  /** 1 = best for the trait's direction; null when the trait has no preferred direction */
  rank: number | null;
  of: number;
  percentOfTrialMean: number | null;
  percentOfCheck: number | null;
  /** whether the difference to the check exceeds the LSD 0.05; null without an LSD or a check */
  beyondLsd: boolean | null;
  letter: string | null;
  sitesAnalysed: number;
  /** sites where it ranked first; null when the trait has no preferred direction */
  topAt: number | null;
  /** "highest", "earliest", ...: what ranking first means for this trait */
  topWord: string;
  /** site-by-site ranks */
  siteRanks: { siteName: string; rank: number | null; of: number }[];
  problem: string | null;
}

/** The standing of `entryId` in an analysis result; `problem` says why there is none. */
export function standingOf(result: AnalysisResult, entryId: number): TrialStanding {
  const siteRanks = result.perSite
    .filter((s) => s.result)
    .flatMap((s) => {
      const m = s.result!.means.find((x) => x.entryId === entryId);
      return m ? [{ siteName: s.siteName, rank: m.rank, of: s.result!.means.length }] : [];
    });
  const combined = result.combined?.means.find((m) => m.entryId === entryId) ?? null;
  const single = !combined && siteRanks.length === 1 ? result.perSite.find((s) => s.result)!.result! : null;
  const source = combined ? result.combined! : single;
  const m = combined ?? single?.means.find((x) => x.entryId === entryId) ?? null;
  const value = m ? (m.lsMean ?? m.mean) : null;
  const ranked = result.trait.betterWhen !== "neither";
  return {
    trait: result.trait.analysedAs,
    betterWhen: result.trait.betterWhen,
    mean: value,
    rank: m?.rank ?? null,
    of: source?.means.length ?? 0,
    percentOfTrialMean: value !== null && source && source.grandMean !== 0 ? (100 * value) / source.grandMean : null,
    percentOfCheck: m?.percentOfCheck ?? null,
    beyondLsd: m?.beyondLsd ?? null,
    letter: m?.letter ?? null,
    sitesAnalysed: siteRanks.length,
    topAt: ranked ? siteRanks.filter((r) => r.rank === 1).length : null,
    topWord: extremeWord(result.trait, "first"),
    siteRanks,
    problem: m ? null : (result.combinedProblem ?? "No analysable data yet."),
  };
}
