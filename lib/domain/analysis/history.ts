/**
 * One variety's standing in one trial's analysis: where it ranked across sites and at each site,
 * and its mean as a percentage of the trial mean (the usual way to compare across seasons).
 */
import type { AnalysisResult } from "./types";

export interface TrialStanding {
  trait: string;
  mean: number | null;
  rank: number | null;
  of: number;
  percentOfTrialMean: number | null;
  letter: string | null;
  sitesAnalysed: number;
  /** sites where it had the highest mean */
  topAt: number;
  /** site-by-site ranks */
  siteRanks: { siteName: string; rank: number; of: number }[];
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
  return {
    trait: result.trait.analysedAs,
    mean: value,
    rank: m?.rank ?? null,
    of: source?.means.length ?? 0,
    percentOfTrialMean: value !== null && source && source.grandMean !== 0 ? (100 * value) / source.grandMean : null,
    letter: m?.letter ?? null,
    sitesAnalysed: siteRanks.length,
    topAt: siteRanks.filter((r) => r.rank === 1).length,
    siteRanks,
    problem: m ? null : (result.combinedProblem ?? "No analysable data yet."),
  };
}
