/**
 * The mixed model for one trial's combined analysis: the same plots the least-squares analysis used
 * (analysed sites, accepted data, exclusions applied), with environment = site.
 */
import { analyseMixed, type MixedEntryInfo, type MixedRow } from "./mixed";
import type { AnalysisResult, MixedOutcome } from "./types";

export function mixedForTrial(result: AnalysisResult, options: { forPublication?: boolean } = {}): MixedOutcome {
  const analysed = new Set(result.perSite.filter((s) => s.result !== null).map((s) => s.siteId));
  if (analysed.size < 2) {
    return { mixed: null, mixedProblem: `The mixed model needs at least 2 analysed sites (there ${analysed.size === 1 ? "is" : "are"} ${analysed.size}).` };
  }
  const rows: MixedRow[] = result.plots.flatMap((p) =>
    p.status === "used" && p.value !== null && analysed.has(p.siteId) ? [{ site: `${p.siteId}`, block: String(p.block), entryKey: String(p.entryId), value: p.value }] : [],
  );
  const named = options.forPublication === true || result.trial.status === "published" || result.trial.status === "archived";
  const seen = new Map<number, MixedEntryInfo>();
  for (const m of [...(result.combined?.means ?? []), ...result.perSite.flatMap((s) => s.result?.means ?? [])]) {
    if (seen.has(m.entryId)) continue;
    seen.set(m.entryId, {
      key: String(m.entryId),
      // names only once the key is public, as the least-squares notes
      label: named && m.varietyName ? m.varietyName : m.blindCode,
      blindCode: m.blindCode,
      varietyName: m.varietyName,
      varietyId: m.varietyId,
      isCheck: m.isCheck,
    });
  }
  const siteName = new Map(result.perSite.map((s) => [String(s.siteId), s.siteName]));
  const { mixed, problem } = analyseMixed(rows, [...seen.values()], result.trait);
  if (mixed) mixed.environments = mixed.environments.map((id) => siteName.get(id) ?? id);
  return { mixed, mixedProblem: problem };
}
