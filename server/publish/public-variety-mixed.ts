import "server-only";
import { listLatestSnapshots } from "./public-snapshots";
import { mixedFromPublished, standingAcrossSeasons, type AcrossSeasonsStanding } from "@/lib/domain/analysis/mixed-variety";

export interface TraitAcrossSeasons {
  traitCode: string;
  trait: { analysedAs: string; unit: string | null; valueType: string; computation: string; betterWhen: "higher" | "lower" | "neither" };
  seasons: number;
  standing: AcrossSeasonsStanding;
}

// Public pages are open to anyone: a fit is kept per variety and set of published versions, so repeated
// requests cost a lookup, and a new publication (a new version) is a new key.
const CACHE_LIMIT = 200;
const cache = new Map<string, TraitAcrossSeasons[]>();

const seasonOf = (t: { season: string; year: number }) => (t.season.includes(String(t.year)) ? t.season : `${t.season} ${t.year}`);

/**
 * A variety's standing in the across-seasons mixed model of each trait it was published with in more
 * than one season, from the latest published versions of its crop's trials only (the public never
 * reads unpublished data here). Empty when it was published in one season.
 */
export async function publicVarietyAcrossSeasons(varietyId: number): Promise<TraitAcrossSeasons[]> {
  const snapshots = await listLatestSnapshots();
  const mine = snapshots.filter((s) => s.entries.some((e) => e.varietyId === varietyId));
  if (new Set(mine.map((s) => seasonOf(s.trial))).size < 2) return [];
  const crop = mine[0]!.trial.crop;
  const versions = snapshots.filter((s) => s.trial.crop === crop);
  const key = `${varietyId}|${versions.map((s) => `${s.trial.code}:${s.version}`).join(",")}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const codes = [...new Set(mine.flatMap((s) => s.results.map((r) => r.result.trait.code)))];
  const out: TraitAcrossSeasons[] = [];
  for (const code of codes) {
    const grownIn = new Set(mine.filter((s) => s.results.some((r) => r.result.trait.code === code)).map((s) => seasonOf(s.trial)));
    if (grownIn.size < 2) continue;
    const { mixed, seasons } = mixedFromPublished(versions, code);
    const standing = mixed && standingAcrossSeasons(mixed, `variety:${varietyId}`);
    const trait = versions.flatMap((s) => s.results).find((r) => r.result.trait.code === code)!.result.trait;
    if (standing) out.push({ traitCode: code, trait, seasons, standing });
  }
  cache.set(key, out);
  if (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  return out;
}
