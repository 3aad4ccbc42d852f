/**
 * The mixed model over every season of a crop's trials at once: environment = site-year, a variety
 * is the same entry in every season it was grown (its blind code changes from trial to trial), and
 * varieties that entered or left the network are compared through the seasons they share.
 */
import { analyseMixed, type MixedEntryInfo, type MixedRow } from "./mixed";
import type { AnalysisResult, MixedOutcome } from "./types";

export interface SeasonResult {
  trialId: number;
  /** how people name the season, e.g. "2025" or "Spring 2025" */
  season: string;
  result: AnalysisResult;
}

/** The key a variety is known by across trials; an entry without a variety stays its trial's own. */
export function varietyKey(trialId: number, entry: { entryId: number; varietyId: number | null }): string {
  return entry.varietyId !== null ? `variety:${entry.varietyId}` : `entry:${trialId}:${entry.entryId}`;
}

/** The plots each trial's own analysis used (analysed sites, accepted data, exclusions applied), as site-years. */
export function acrossSeasonRows(parts: readonly SeasonResult[]): { rows: MixedRow[]; entries: MixedEntryInfo[]; seasons: number } {
  const rows: MixedRow[] = [];
  const entries = new Map<string, MixedEntryInfo>();
  const seasons = new Set<string>();
  for (const { trialId, season, result } of parts) {
    const analysed = new Set(result.perSite.filter((s) => s.result !== null).map((s) => s.siteId));
    const means = [...(result.combined?.means ?? []), ...result.perSite.flatMap((s) => s.result?.means ?? [])];
    const byEntry = new Map(means.map((m) => [m.entryId, m]));
    let used = false;
    for (const p of result.plots) {
      if (p.status !== "used" || p.value === null || !analysed.has(p.siteId)) continue;
      const m = byEntry.get(p.entryId);
      const key = varietyKey(trialId, { entryId: p.entryId, varietyId: m?.varietyId ?? null });
      // two trials at one site in one season are one site-year; their blocks stay apart
      rows.push({ site: p.siteName, season, block: `${trialId}-${p.block}`, entryKey: key, value: p.value });
      used = true;
      const label = p.varietyName ?? `${p.blindCode} (${result.trial.code})`;
      const known = entries.get(key);
      entries.set(key, { key, label, blindCode: label, varietyName: p.varietyName, varietyId: m?.varietyId ?? null, isCheck: (known?.isCheck ?? false) || (m?.isCheck ?? false) });
    }
    if (used) seasons.add(season);
  }
  return { rows, entries: [...entries.values()], seasons: seasons.size };
}

/** Fits the across-seasons model; the trait's direction and unit come from the newest trial given first. */
export function mixedAcrossSeasons(parts: readonly SeasonResult[]): MixedOutcome & { seasons: number; trait: AnalysisResult["trait"] | null } {
  const { rows, entries, seasons } = acrossSeasonRows(parts);
  const trait = parts[0]?.result.trait ?? null;
  if (!trait || rows.length === 0) return { mixed: null, mixedProblem: "No trial of this crop has accepted, analysable data for this trait yet.", seasons, trait };
  const { mixed, problem } = analyseMixed(rows, entries, trait);
  return { mixed, mixedProblem: problem, seasons, trait };
}
