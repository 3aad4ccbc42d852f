/**
 * One variety's standing in an across-seasons mixed model, for the variety histories (portal and
 * public), and the site-year rows of published versions, so the public history reads only what was
 * published.
 */
import { analyseMixed, type MixedAnalysis, type MixedEntryInfo, type MixedRow } from "./mixed";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";

export interface AcrossSeasonsStanding {
  mean: number;
  se: number;
  /** 1 = best for the trait's direction; null when the trait has no preferred direction */
  rank: number | null;
  of: number;
  percentOfCheck: number | null;
  letter: string | null;
  /** site-years this variety was grown in, of all in the model */
  environments: number;
  totalEnvironments: number;
  /** how much varieties change rank between site-years, in words */
  interactionWords: string;
}

export function standingAcrossSeasons(mixed: MixedAnalysis, key: string): AcrossSeasonsStanding | null {
  const m = mixed.means.find((x) => x.key === key);
  if (!m) return null;
  return {
    mean: m.mean,
    se: m.se,
    rank: m.rank,
    of: mixed.means.length,
    percentOfCheck: m.isCheck ? 100 : m.percentOfCheck,
    letter: m.letter,
    environments: m.environments,
    totalEnvironments: mixed.environments.length,
    interactionWords: mixed.components.find((c) => c.term === "entry:environment")!.words,
  };
}

/** What the public history needs of one published version (a structural slice of the public snapshot). */
export interface PublishedSeason {
  trial: { code: string; season: string; year: number };
  entries: { blindCode: string; varietyId: number; variety: string; isCheck: boolean }[];
  results: { result: { trait: { code: string; analysedAs: string; name: string; unit: string | null; valueType: string; computation: string; betterWhen: BetterWhen } } }[];
  data: { site: string; block: number; blindCode: string; trait: string; value: number | null; status: string }[];
}

const seasonOf = (t: PublishedSeason["trial"]) => (t.season.includes(String(t.year)) ? t.season : `${t.season} ${t.year}`);

/**
 * The across-seasons model of one trait from published versions only: their used plot values, with
 * site-years as environments and varieties matched by their public id.
 */
export function mixedFromPublished(versions: readonly PublishedSeason[], traitCode: string): { mixed: MixedAnalysis | null; problem: string | null; seasons: number } {
  const rows: MixedRow[] = [];
  const entries = new Map<string, MixedEntryInfo>();
  const seasons = new Set<string>();
  let trait: PublishedSeason["results"][number]["result"]["trait"] | null = null;
  for (const v of versions) {
    const result = v.results.find((r) => r.result.trait.code === traitCode)?.result;
    if (!result) continue;
    trait ??= result.trait;
    const byCode = new Map(v.entries.map((e) => [e.blindCode, e]));
    const season = seasonOf(v.trial);
    for (const d of v.data) {
      if (d.trait !== result.trait.analysedAs || d.status !== "used" || d.value === null) continue;
      const e = byCode.get(d.blindCode);
      if (!e) continue;
      const key = `variety:${e.varietyId}`;
      rows.push({ site: d.site, season, block: `${v.trial.code}-${d.block}`, entryKey: key, value: d.value });
      seasons.add(season);
      const known = entries.get(key);
      entries.set(key, { key, label: e.variety, blindCode: e.variety, varietyName: e.variety, varietyId: e.varietyId, isCheck: (known?.isCheck ?? false) || e.isCheck });
    }
  }
  if (!trait || rows.length === 0) return { mixed: null, problem: "No published data for this trait.", seasons: seasons.size };
  const { mixed, problem } = analyseMixed(rows, [...entries.values()], trait);
  return { mixed, problem, seasons: seasons.size };
}
