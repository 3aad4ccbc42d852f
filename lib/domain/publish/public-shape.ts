/**
 * The public shape of a published version: the only form in which a snapshot leaves the server (public
 * pages, /api/public/trials/..., the downloads and the PDF). `toPublicSnapshot` builds it field by
 * field from the stored snapshot, so it is an allow-list: review states, sharing flags, internal ids
 * and anything added to the analysis later stay out until someone adds them here on purpose. Stored
 * snapshots keep the full record and are mapped when read, so versions published before this shape
 * existed are served the same way.
 *
 * Things are referred to as the public pages name them: trials by code, traits by code, entries by
 * blind code, plots by plot code, sites by name. The two numbers kept are the ones in public
 * addresses: a site's `id` (/sites/:id) and an entry's `varietyId` (/varieties/:id).
 */
import { blockView } from "@/lib/domain/analysis/block-view";
import { assignRanks, compareWithCheck } from "@/lib/domain/analysis/ranking";
import type { AnalysisBlock, AnalysisResult, EntryResult, GerminationRow } from "@/lib/domain/analysis/types";
import { EXCLUSION_CATEGORIES, type BetterWhen, type ExclusionCategory } from "@/lib/domain/vocabulary/enums";
import { EXCLUSION_CATEGORY_LABELS } from "@/lib/domain/vocabulary/labels";
import { publicNotIncludedWhy } from "./site-inclusion";
import type { PublishedSnapshot, PublishedValue, PublishSettings } from "./types";
import { toPublicMixed, type PublicMixed } from "./public-mixed";

export interface PublicSite {
  /** the number in the site's public address, /sites/:id; null for a site published without its name */
  id: number | null;
  name: string;
  kind: string;
  region: string;
  growingSetup: string;
  soil: string | null;
  irrigation: string | null;
  publicDescription: string | null;
  sownOn: string | null;
}

export interface PublicEntry {
  blindCode: string;
  /** the number in the variety's public address, /varieties/:id */
  varietyId: number;
  variety: string;
  isCheck: boolean;
  seedSource: string | null;
  lotCode: string | null;
  labelGermination: number | null;
  treated: boolean;
}

export interface PublicTrait {
  code: string;
  name: string;
  unit: string | null;
  valueType: string;
  analysedAs: string;
  description: string | null;
  betterWhen: BetterWhen;
}

export type PublicMean = Pick<EntryResult, "blindCode" | "varietyName" | "isCheck" | "mean" | "lsMean" | "se" | "n" | "letter" | "rank" | "percentOfCheck" | "checkDifference" | "beyondLsd">;

export interface PublicBlock extends Omit<AnalysisBlock, "means"> {
  means: PublicMean[];
}

export interface PublicCombined extends PublicBlock {
  siteModel: "random" | "fixed";
  sites: number;
  interactionF: number | null;
  interactionP: number | null;
  bartlett: { statistic: number; df: number; p: number } | null;
  cellMeans: { siteName: string; blindCode: string; mean: number; n: number }[];
  /** each variety's response to the sites; null without one (and in versions published before it was worked out) */
  stability: PublicStability | null;
}

export interface PublicStability {
  sites: number;
  rows: { blindCode: string; varietyName: string | null; isCheck: boolean; mean: number; slope: number; slopeSe: number; deviationMs: number; shuklaVariance: number; reading: string }[];
  /** share explained by the GGE biplot's first two components */
  explained: [number, number];
  notes: string[];
}

export type PublicGerminationRow = Omit<GerminationRow, "entryId" | "siteId">;

export interface PublicExclusion {
  siteName: string | null;
  /** null when the whole site is left out */
  plotCode: string | null;
  /** null when the exclusion covers every trait */
  traitName: string | null;
  category: ExclusionCategory;
  /** the category in words */
  reason: string;
}

export interface PublicTraitResult {
  trait: { code: string; name: string; unit: string | null; valueType: string; computation: string; analysedAs: string; betterWhen: BetterWhen };
  /** the sites in this trait's analysis */
  perSite: { siteName: string; blocks: number; result: PublicBlock | null; problem: string | null }[];
  combined: PublicCombined | null;
  combinedProblem: string | null;
  /** the REML mixed model when the version was published with it */
  mixed?: PublicMixed | null;
  missing: { plotCode: string; siteName: string; blindCode: string; block: number; reason: string; handling: string }[];
  /** exactly the sites and plots left out of this trait, with the public reason (never the staff's note) */
  exclusions: PublicExclusion[];
  warnings: string[];
  notes: string[];
  germination: {
    byEntry: PublicGerminationRow[];
    bySite: PublicGerminationRow[];
    chiSquare: { statistic: number; df: number; p: number; lowExpected: number; cells: number } | null;
    cmh: { statistic: number; df: number; p: number; sites: number } | null;
    labels: { blindCode: string; varietyName: string | null; seedLot: string | null; labelPercent: number | null; observedPercent: number; sown: number; chiSquareP: number | null; tolerance: number | null; withinTolerance: boolean | null; note: string }[];
    note: string;
  } | null;
  emergence: {
    days: number[];
    curve: { blindCode: string; varietyName: string | null; day: number; percent: number; plots: number }[];
    kinetics: { blindCode: string; varietyName: string | null; meanEmergenceTime: number | null; t50: number | null; finalPercent: number; plots: number }[];
    note: string;
  } | null;
}

/** One plot's published value: dates as days (unit "days"), a missing plot with its reason, the plot's seed counts. */
export interface PublicValue extends Omit<PublishedValue, "missingReason" | "seedsSown" | "emerged"> {
  missingReason: string | null;
  seedsSown: number | null;
  emerged: number | null;
}

export interface PublicSnapshot {
  version: number;
  publishedAt: string;
  changeNote: string | null;
  settings: PublishSettings;
  program: string;
  trial: {
    code: string;
    title: string;
    crop: string;
    cropGroup: string;
    season: string;
    year: number;
    purpose: string | null;
    design: string;
    blocks: number;
    plotUnit: string;
    plotSize: number;
    protocol: string | null;
  };
  /** code of the one trait published, or null when the whole trial is */
  scopeTrait: string | null;
  /** every enrolled site */
  sites: PublicSite[];
  /** "results from N of M sites": how many enrolled sites this version includes, and the others by name with why */
  coverage: { inResults: number; enrolled: number; notIncluded: { name: string; reason: string }[] };
  entries: PublicEntry[];
  traits: PublicTrait[];
  results: { trait: string; result: PublicTraitResult }[];
  summary: string[];
  data: PublicValue[];
  citation: string;
}

const mean = (m: EntryResult): PublicMean => ({
  blindCode: m.blindCode,
  varietyName: m.varietyName,
  isCheck: m.isCheck,
  mean: m.mean,
  lsMean: m.lsMean,
  se: m.se,
  n: m.n,
  letter: m.letter,
  rank: m.rank,
  percentOfCheck: m.percentOfCheck,
  checkDifference: m.checkDifference,
  beyondLsd: m.beyondLsd,
});

/**
 * Versions published before traits had a direction ranked every trait highest-first and had no % of
 * check. Read back, they get no direction and no ranks (nothing is called best), and the check
 * comparison is worked out from their stored means.
 */
function blockOf(b: AnalysisBlock, legacy: boolean): PublicBlock {
  const means = b.means.map(mean);
  if (legacy) {
    assignRanks(means, "neither");
    compareWithCheck(means, b.lsd).forEach((c, i) => Object.assign(means[i]!, c));
  }
  return blockView(b, means);
}

const germinationRow = (g: GerminationRow): PublicGerminationRow => ({ blindCode: g.blindCode, varietyName: g.varietyName, siteName: g.siteName, sown: g.sown, emerged: g.emerged, percent: g.percent, lower: g.lower, upper: g.upper });

// Versions published before exclusions had a category stored the coordinator's free text as the reason and
// listed every exclusion under every trait; only the category (or "other") and this trait's own leave here.
const categoryOf = (x: { category?: unknown }): ExclusionCategory => (EXCLUSION_CATEGORIES as readonly unknown[]).includes(x.category) ? (x.category as ExclusionCategory) : "other";
const publicReasons = new Set(Object.values(EXCLUSION_CATEGORY_LABELS));
const publicMissingReason = (reason: string) =>
  reason.startsWith("excluded") && !publicReasons.has(reason.slice("excluded: ".length)) ? `excluded: ${EXCLUSION_CATEGORY_LABELS.other}` : reason;

function exclusionsOf(r: AnalysisResult): PublicExclusion[] {
  return r.exclusions
    .filter((x) => x.traitId === null || x.traitId === undefined || x.traitId === r.trait.id)
    .map((x) => {
      const category = categoryOf(x);
      return { siteName: x.siteName, plotCode: x.plotCode, traitName: x.traitName, category, reason: EXCLUSION_CATEGORY_LABELS[category] };
    });
}

/** One trait's published analysis in its public shape. */
export function toPublicTraitResult(r: AnalysisResult): PublicTraitResult {
  const { combined, germination: g, emergence: e } = r;
  const legacy = (r.trait as Partial<AnalysisResult["trait"]>).betterWhen === undefined;
  const block = (b: AnalysisBlock) => blockOf(b, legacy);
  const codeOf = new Map<number, string>();
  for (const m of [...(combined?.means ?? []), ...r.perSite.flatMap((s) => s.result?.means ?? [])]) codeOf.set(m.entryId, m.blindCode);
  return {
    trait: { code: r.trait.code, name: r.trait.name, unit: r.trait.unit, valueType: r.trait.valueType, computation: r.trait.computation, analysedAs: r.trait.analysedAs, betterWhen: legacy ? "neither" : r.trait.betterWhen },
    ...(r.mixed ? { mixed: toPublicMixed(r.mixed) } : {}),
    perSite: r.perSite.map((s) => ({ siteName: s.siteName, blocks: s.blocks, result: s.result && block(s.result), problem: s.problem })),
    combined: combined && {
      ...block(combined),
      siteModel: combined.siteModel,
      sites: combined.sites,
      interactionF: combined.interactionF,
      interactionP: combined.interactionP,
      bartlett: combined.bartlett && { statistic: combined.bartlett.statistic, df: combined.bartlett.df, p: combined.bartlett.p },
      cellMeans: combined.cellMeans.map((c) => ({ siteName: c.siteName, blindCode: codeOf.get(c.entryId) ?? "", mean: c.mean, n: c.n })),
      stability: combined.stability
        ? {
            sites: combined.stability.sites,
            rows: combined.stability.rows.map((x) => ({ blindCode: x.blindCode, varietyName: x.varietyName, isCheck: x.isCheck, mean: x.mean, slope: x.slope, slopeSe: x.slopeSe, deviationMs: x.deviationMs, shuklaVariance: x.shuklaVariance, reading: x.reading })),
            explained: [combined.stability.gge.explained[0], combined.stability.gge.explained[1]],
            notes: [...combined.stability.notes],
          }
        : null,
    },
    combinedProblem: r.combinedProblem,
    missing: r.missing.map((m) => ({ plotCode: m.plotCode, siteName: m.siteName, blindCode: m.blindCode, block: m.block, reason: publicMissingReason(m.reason), handling: m.handling })),
    exclusions: exclusionsOf(r),
    warnings: [...r.warnings],
    notes: [...r.notes],
    germination: g && {
      byEntry: g.byEntry.map(germinationRow),
      bySite: g.bySite.map(germinationRow),
      chiSquare: g.chiSquare && { statistic: g.chiSquare.statistic, df: g.chiSquare.df, p: g.chiSquare.p, lowExpected: g.chiSquare.lowExpected, cells: g.chiSquare.cells },
      cmh: g.cmh && { statistic: g.cmh.statistic, df: g.cmh.df, p: g.cmh.p, sites: g.cmh.sites },
      labels: g.labels.map((l) => ({ blindCode: l.blindCode, varietyName: l.varietyName, seedLot: l.seedLot, labelPercent: l.labelPercent, observedPercent: l.observedPercent, sown: l.sown, chiSquareP: l.chiSquareP, tolerance: l.tolerance, withinTolerance: l.withinTolerance, note: l.note })),
      note: g.note,
    },
    emergence: e && {
      days: [...e.days],
      curve: e.curve.map((c) => ({ blindCode: c.blindCode, varietyName: c.varietyName, day: c.day, percent: c.percent, plots: c.plots })),
      kinetics: e.kinetics.map((k) => ({ blindCode: k.blindCode, varietyName: k.varietyName, meanEmergenceTime: k.meanEmergenceTime, t50: k.t50, finalPercent: k.finalPercent, plots: k.plots })),
      note: e.note,
    },
  };
}

/**
 * Which enrolled sites a version includes. Versions published before the inclusion was kept count the
 * sites that appear in any trait's analysis.
 */
function coverageOf(s: PublishedSnapshot): PublicSnapshot["coverage"] {
  if (s.siteInclusion) {
    const out = s.siteInclusion.filter((x) => !x.included);
    return { inResults: s.siteInclusion.length - out.length, enrolled: s.siteInclusion.length, notIncluded: out.map((x) => ({ name: x.siteName, reason: publicNotIncludedWhy(x) })) };
  }
  const analysed = new Set(s.results.flatMap(({ result }) => result.perSite.map((p) => p.siteName)));
  const out = s.sites.filter((x) => !analysed.has(x.name));
  return { inResults: s.sites.length - out.length, enrolled: s.sites.length, notIncluded: out.map((x) => ({ name: x.name, reason: "no accepted data in this version" })) };
}

/**
 * What versions published before plot values carried their unit in days and their missing reason need to
 * be read the same way: which traits are counted in days, and each missing plot's reason from the analysis.
 */
function factsForOlderValues(s: PublishedSnapshot) {
  const daysTraits = new Set(s.results.filter(({ result: r }) => r.trait.computation !== "none" || r.trait.valueType === "date").map(({ result: r }) => r.trait.analysedAs));
  const missingReasons = new Map<string, string>();
  for (const { result: r } of s.results) {
    for (const m of r.missing) if (!m.reason.startsWith("excluded")) missingReasons.set(`${r.trait.analysedAs}\u0000${m.plotCode}`, m.reason);
  }
  return { daysTraits, missingReasons };
}

function publicValue(d: PublishedValue, legacy: ReturnType<typeof factsForOlderValues>): PublicValue {
  const missingReason = d.status !== "missing" ? null : (d.missingReason ?? legacy.missingReasons.get(`${d.trait}\u0000${d.plotCode}`) ?? "not recorded");
  return {
    site: d.site,
    block: d.block,
    plotCode: d.plotCode,
    blindCode: d.blindCode,
    variety: d.variety,
    trait: d.trait,
    unit: legacy.daysTraits.has(d.trait) ? "days" : d.unit,
    value: d.value,
    status: d.status,
    missingReason,
    seedsSown: d.seedsSown ?? null,
    emerged: d.emerged ?? null,
  };
}

/** A stored snapshot (any version of its format) in the public shape. */
export function toPublicSnapshot(s: PublishedSnapshot): PublicSnapshot {
  const t = s.trial;
  const legacyFacts = factsForOlderValues(s);
  const traitCode = new Map(s.traits.map((x) => [x.id, x.code]));
  return {
    version: s.version,
    publishedAt: s.publishedAt,
    changeNote: s.changeNote,
    settings: { siteModel: s.settings.siteModel, separation: s.settings.separation, ...(s.settings.mixed ? { mixed: true } : {}), stabilityInReport: s.settings.stabilityInReport === true },
    program: s.program,
    trial: { code: t.code, title: t.title, crop: t.crop, cropGroup: t.cropGroup, season: t.season, year: t.year, purpose: t.purpose, design: t.design, blocks: t.blocks, plotUnit: t.plotUnit, plotSize: t.plotSize, protocol: t.protocol },
    scopeTrait: s.scopeTraitId === null ? null : (traitCode.get(s.scopeTraitId) ?? null),
    coverage: coverageOf(s),
    sites: s.sites.map((x) => ({ id: x.id, name: x.name, kind: x.kind, region: x.region, growingSetup: x.growingSetup, soil: x.soil, irrigation: x.irrigation, publicDescription: x.publicDescription, sownOn: x.sownOn })),
    entries: s.entries.map((e) => ({ blindCode: e.blindCode, varietyId: e.varietyId, variety: e.variety, isCheck: e.isCheck, seedSource: e.seedSource, lotCode: e.lotCode, labelGermination: e.labelGermination, treated: e.treated })),
    traits: s.traits.map((x) => ({ code: x.code, name: x.name, unit: x.unit, valueType: x.valueType, analysedAs: x.analysedAs, description: x.description, betterWhen: x.betterWhen ?? "neither" })),
    results: s.results.map(({ traitId, result }) => ({ trait: traitCode.get(traitId) ?? result.trait.code, result: toPublicTraitResult(result) })),
    summary: [...s.summary],
    data: s.data.map((d) => publicValue(d, legacyFacts)),
    citation: s.citation,
  };
}
