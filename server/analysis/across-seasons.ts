import "server-only";
import { listCropTrials, listCropsWithTrials, listTraitsOfTrials } from "@/db/queries/across-seasons";
import { listAnalysisTraits } from "@/db/queries/analysis";
import { loadAnalysis } from "./load-analysis";
import { mixedAcrossSeasons, varietyKey, type SeasonResult } from "@/lib/domain/analysis/mixed-seasons";
import { standingAcrossSeasons } from "@/lib/domain/analysis/mixed-variety";
import { isAnalysable } from "@/lib/domain/analysis/values";
import { isStaff } from "@/lib/domain/permissions";
import type { Viewer } from "@/lib/domain/viewer";

export function seasonLabel(t: { season: string; year: number }): string {
  return t.season.includes(String(t.year)) ? t.season : `${t.season} ${t.year}`;
}

/**
 * Every season of a crop's trials in the viewer's programs analysed at once (staff only: other sites'
 * unpublished data never reach a grower or the public from here). Each trial contributes what its own
 * default analysis uses (accepted data, exclusions applied), through the same cache as the analysis page.
 */
export async function loadAcrossSeasons(viewer: Viewer, p: { cropId?: number; traitCode?: string }) {
  if (!isStaff(viewer)) return null;
  const crops = await listCropsWithTrials(viewer);
  const crop = crops.find((c) => c.id === p.cropId) ?? null;
  if (!crop) return { crops, crop: null, traits: [], trait: null, trials: [], outcome: null };
  const trials = await listCropTrials(viewer, crop.id);
  const traits = (await listTraitsOfTrials(viewer, trials.map((t) => t.id))).filter((t) => isAnalysable(t));
  const trait = traits.find((t) => t.code === p.traitCode) ?? null;
  if (!trait) return { crops, crop, traits, trait: null, trials: trials.map((t) => ({ ...t, used: false })), outcome: null };
  const parts: SeasonResult[] = [];
  for (const t of trials) {
    const recorded = await listAnalysisTraits(viewer, t.id);
    const traitId = recorded?.find((r) => r.code === trait.code)?.id;
    if (traitId === undefined) continue;
    // a trial whose data cannot be analysed yet simply contributes nothing, as on the variety history
    const loaded = await loadAnalysis(viewer, t.id, { trait: traitId }).catch(() => null);
    if (loaded) parts.push({ trialId: t.id, season: seasonLabel(t), result: loaded.result });
  }
  const outcome = mixedAcrossSeasons(parts);
  const usedTrials = new Set(parts.filter((part) => part.result.plots.some((x) => x.status === "used")).map((part) => part.trialId));
  return { crops, crop, traits, trait, trials: trials.map((t) => ({ ...t, used: usedTrials.has(t.id) })), outcome };
}

/**
 * A variety's standing in the across-seasons model of each trait, when it was grown in more than one
 * season of the viewer's programs' trials (staff only, like the history page that shows it).
 */
export async function varietyAcrossSeasons(viewer: Viewer, p: { varietyId: number; cropId: number; traitCodes: string[] }) {
  if (!isStaff(viewer)) return [];
  const out = [];
  for (const traitCode of p.traitCodes) {
    const view = await loadAcrossSeasons(viewer, { cropId: p.cropId, traitCode });
    const mixed = view?.outcome?.mixed;
    const trait = view?.outcome?.trait;
    if (!mixed || !trait) continue;
    const standing = standingAcrossSeasons(mixed, varietyKey(0, { entryId: 0, varietyId: p.varietyId }));
    if (standing) out.push({ traitCode, trait, seasons: view.outcome!.seasons, standing });
  }
  return out;
}
