import "server-only";
import { listAnalysisTraits } from "@/db/queries/analysis";
import { getPublishContext } from "@/db/queries/publish";
import { runAnalysis } from "@/lib/domain/analysis/run";
import { mixedForTrial } from "@/lib/domain/analysis/mixed-trial";
import { analysedAs } from "@/lib/domain/analysis/values";
import { EMERGED_TRAIT_CODES, isPublishableTrait, SEEDS_SOWN_CODE } from "@/lib/domain/vocabulary/traits";
import { loadAnalysisInput } from "@/server/analysis/load-analysis";
import { AppError } from "@/lib/errors";
import type { AnalysisInput, AnalysisResult } from "@/lib/domain/analysis/types";
import type { Viewer } from "@/lib/domain/viewer";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { summariseForGrowers } from "@/lib/domain/publish/summary";
import type { PublishedSnapshot, PublishSettings } from "@/lib/domain/publish/types";
import type { SiteInclusion } from "@/lib/domain/publish/site-inclusion";
import { anonymousSiteNames } from "@/lib/domain/publish/site-naming";

/**
 * Runs the analyses a publication shows and freezes them with the trial's public facts. Only accepted
 * data are published. Throws AppError when the trial is not the viewer's or there is nothing to publish.
 */
export async function buildSnapshot(
  viewer: Viewer,
  p: { trialId: number; traitId: number | null; settings: PublishSettings; version: number; changeNote: string | null; publishedAt: Date; siteInclusion: SiteInclusion[] },
): Promise<PublishedSnapshot> {
  const [context, traitList] = await Promise.all([getPublishContext(viewer, p.trialId), listAnalysisTraits(viewer, p.trialId)]);
  if (!context || !traitList) throw new AppError("not_found", "That trial does not exist or is not in your programs.");
  const candidates = traitList.filter((t) => isPublishableTrait(t) && t.recorded > 0 && (p.traitId === null || t.id === p.traitId));
  if (p.traitId !== null && candidates.length === 0) throw new AppError("bad_request", "That trait has no recorded data to publish.");
  if (candidates.length === 0) throw new AppError("conflict", "This trial has no recorded data yet, so there is nothing to publish.");

  // Sites whose growers did not agree to be named go into the analyses under their public name, so every
  // table, note and warning built from them says "Site N, region" and nothing else.
  const anonymous = anonymousSiteNames(context.sites.map((s) => ({ siteId: s.id, name: s.name, region: s.region, named: s.named, joined: s.joined })));
  const results: { traitId: number; result: AnalysisResult }[] = [];
  let seedCounts = new Map<string, { sown: number | null; emerged: number | null }>();
  for (const trait of candidates) {
    const loaded = await loadAnalysisInput(viewer, { trialId: p.trialId, traitId: trait.id });
    if (!loaded) throw new AppError("not_found", "That trial does not exist or is not in your programs.");
    const input = { ...loaded, sites: loaded.sites.map((s) => (anonymous.has(s.id) ? { ...s, name: anonymous.get(s.id)! } : s)) };
    if (seedCounts.size === 0) seedCounts = seedCountsByPlot(input);
    const plain = runAnalysis(input, { traitId: trait.id, siteIds: null, includeUnaccepted: false, siteModel: p.settings.siteModel, separation: p.settings.separation }, { forPublication: true });
    const result = p.settings.mixed ? { ...plain, ...mixedForTrial(plain, { forPublication: true }) } : plain;
    // Who recorded an exclusion and the staff's note stay in the portal; the category is the public reason.
    result.exclusions = result.exclusions.map((e) => ({ ...e, note: null, createdBy: null }));
    results.push({ traitId: trait.id, result });
  }
  const usable = results.filter((r) => r.result.combined || r.result.perSite.some((s) => s.result));
  if (usable.length === 0) throw new AppError("conflict", "No site has accepted data that can be analysed yet. Accept at least one site's data first.");

  const { trial } = context;
  const published = p.publishedAt.toISOString();
  return {
    schemaVersion: 1,
    version: p.version,
    publishedAt: published,
    changeNote: p.changeNote,
    settings: p.settings,
    program: trial.program,
    trial: {
      id: trial.id,
      code: trial.code,
      title: trial.title,
      crop: trial.crop,
      cropGroup: trial.cropGroup,
      season: trial.season,
      year: trial.year,
      purpose: trial.purpose,
      design: trial.design,
      blocks: trial.blocks,
      plotUnit: trial.plotUnit,
      plotSize: trial.plotSize,
      protocol: trial.protocol,
    },
    scopeTraitId: p.traitId,
    sites: context.sites.map(({ named: _named, joined: _joined, ...s }) =>
      anonymous.has(s.id) ? { ...s, id: null, name: anonymous.get(s.id)!, publicDescription: null } : s,
    ),
    siteInclusion: p.siteInclusion.map((s) => (anonymous.has(s.siteId) ? { ...s, siteName: anonymous.get(s.siteId)! } : s)),
    entries: context.entries,
    traits: candidates.map((t) => ({
      id: t.id,
      code: t.code,
      name: t.name,
      unit: t.unit,
      valueType: t.valueType,
      analysedAs: analysedAs(t),
      betterWhen: t.betterWhen,
      description: context.traits.find((c) => c.id === t.id)?.description ?? null,
    })),
    results,
    summary: summariseForGrowers(usable.map((r) => r.result)),
    data: results.flatMap(({ result }) => {
      const missingReason = new Map(result.missing.map((m) => [m.plotCode, m.reason]));
      return result.plots.map((plot) => ({
        site: plot.siteName,
        block: plot.block,
        plotCode: plot.plotCode,
        blindCode: plot.blindCode,
        variety: plot.varietyName ?? plot.blindCode,
        trait: result.trait.analysedAs,
        // a date trait is published as whole days from sowing (or transplanting), so its unit is days
        unit: result.trait.computation !== "none" || result.trait.valueType === "date" ? "days" : result.trait.unit,
        value: plot.value,
        status: plot.status,
        // an excluded plot's reason is the coordinator's; only a missing plot's recorded reason is published
        missingReason: plot.status === "missing" ? (missingReason.get(plot.plotCode) ?? "not recorded") : null,
        seedsSown: seedCounts.get(plot.plotCode)?.sown ?? null,
        emerged: seedCounts.get(plot.plotCode)?.emerged ?? null,
      }));
    }),
    citation: `${trial.program}. ${trial.title} (${trial.code}), ${trial.season}, version ${p.version}, published ${formatDate(published)}. Seedplot.`,
  };
}

/** Each plot's seeds sown and final seedling count (the last count of the emergence occasions), by plot code. */
function seedCountsByPlot(input: AnalysisInput): Map<string, { sown: number | null; emerged: number | null }> {
  const codeOfTrait = new Map(input.traits.map((t) => [t.id, t.code]));
  const codeOfPlot = new Map(input.plots.map((p) => [p.id, p.plotCode]));
  const counts = new Map<string, { sown: number | null; emerged: number | null; emergedOccasion: number }>();
  for (const o of input.observations) {
    const trait = codeOfTrait.get(o.traitId);
    const plotCode = codeOfPlot.get(o.plotId);
    if (!trait || !plotCode || o.valueNumber === null) continue;
    const row = counts.get(plotCode) ?? { sown: null, emerged: null, emergedOccasion: -1 };
    if (trait === SEEDS_SOWN_CODE) row.sown = o.valueNumber;
    else if (EMERGED_TRAIT_CODES.includes(trait) && o.occasion >= row.emergedOccasion) {
      row.emerged = o.valueNumber;
      row.emergedOccasion = o.occasion;
    }
    counts.set(plotCode, row);
  }
  return new Map([...counts].map(([code, c]) => [code, { sown: c.sown, emerged: c.emerged }]));
}
