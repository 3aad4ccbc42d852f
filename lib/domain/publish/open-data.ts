/**
 * The open data API's answers (/api/public/v1/...), built from a published version's public shape. Field
 * by field, like the public shape itself: entries are named by blind code and variety, sites by name,
 * traits by code; no internal ids, review states or flags. `openapi.ts` describes exactly these types, and
 * the contract test checks every answer of the demo against it.
 */
import { inStatedOrder, orderWords, rankedValue } from "@/lib/domain/analysis/ranking";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";
import type { PublicBlock, PublicMean, PublicSnapshot, PublicTraitResult } from "./public-shape";
import type { PublicTrialCard } from "./public-view";

export const API_BASE = "/api/public/v1";
export const OPENAPI_PATH = `${API_BASE}/openapi.json`;

export interface ApiLinks {
  self: string;
  page: string;
  report: string;
  results: string;
  plots: string;
  csv: string;
  xlsx: string;
}

export interface ApiTrialSummary {
  code: string;
  title: string;
  crop: string;
  season: string;
  year: number;
  sites: number;
  entries: number;
  version: number;
  publishedAt: string;
  summary: string;
  links: ApiLinks;
}

export interface ApiTrialIndex {
  trials: ApiTrialSummary[];
  crops: string[];
  seasons: string[];
}

export interface ApiTrait {
  code: string;
  name: string;
  /** unit of the published values: "days" for dates counted from sowing */
  unit: string | null;
  valueType: string;
  betterWhen: BetterWhen;
  description: string | null;
}

export interface ApiEntry {
  code: string;
  variety: string;
  isCheck: boolean;
  seedSource: string | null;
  seedLot: string | null;
  labelGerminationPercent: number | null;
  treatedSeed: boolean;
}

export interface ApiSite {
  name: string;
  kind: string;
  region: string;
  growingSetup: string;
  soil: string | null;
  irrigation: string | null;
  description: string | null;
  sownOn: string | null;
}

export interface ApiTrial {
  code: string;
  title: string;
  crop: string;
  cropGroup: string;
  season: string;
  year: number;
  program: string;
  purpose: string | null;
  design: string;
  blocksPerSite: number;
  plotUnit: string;
  plotSize: number;
  protocol: string | null;
  version: number;
  latestVersion: number;
  publishedAt: string;
  changeNote: string | null;
  citation: string;
  analysis: { siteModel: "random" | "fixed"; separation: "lsd" | "tukey" };
  /** the one trait this version publishes, or null when it publishes the whole trial */
  publishedTrait: string | null;
  summary: string[];
  sites: ApiSite[];
  traits: ApiTrait[];
  entries: ApiEntry[];
  links: ApiLinks;
}

export interface ApiMean {
  entry: string;
  variety: string | null;
  isCheck: boolean;
  /** least-squares mean when plots are missing, otherwise the plain mean */
  mean: number;
  se: number | null;
  n: number;
  /** 1 = best for the trait's direction; null when the trait has no preferred direction */
  rank: number | null;
  groupLetters: string | null;
  percentOfCheck: number | null;
  checkDifference: number | null;
  beyondLsd: boolean | null;
}

export interface ApiBlock {
  cv: number | null;
  lsd: number | null;
  entryP: number | null;
  comparison: string;
  means: ApiMean[];
}

export interface ApiTraitResult {
  trait: string;
  name: string;
  unit: string | null;
  betterWhen: BetterWhen;
  /** how `means` are ordered, in words */
  order: string;
  /** "across sites" (the combined analysis) or "one site" */
  scope: "across sites" | "one site";
  sites: number;
  /** why there is no result, when there is none */
  problem: string | null;
  result: ApiBlock | null;
  bySite: { site: string; problem: string | null; result: ApiBlock | null }[];
}

export interface ApiResults {
  trial: string;
  version: number;
  results: ApiTraitResult[];
}

export interface ApiPlot {
  site: string;
  block: number;
  plot: string;
  entry: string;
  variety: string;
  trait: string;
  unit: string | null;
  value: number | null;
  status: "used" | "missing" | "excluded";
  missingReason: string | null;
  seedsSown: number | null;
  emerged: number | null;
}

export interface ApiPlots {
  trial: string;
  version: number;
  plots: ApiPlot[];
}

const finite = (x: number | null | undefined): number | null => (x === null || x === undefined || !Number.isFinite(x) ? null : x);

/** The unit a published trait's values are in: dates are published as days from sowing. */
export function publishedUnit(trait: { unit: string | null; valueType: string; computation?: string }): string | null {
  return (trait.computation !== undefined && trait.computation !== "none") || trait.valueType === "date" ? "days" : trait.unit;
}

export function linksFor(code: string, version: number | null): ApiLinks {
  const v = version === null ? "" : `?version=${version}`;
  const vAnd = version === null ? "?" : `?version=${version}&`;
  return {
    self: `${API_BASE}/trials/${code}${v}`,
    page: `/results/${code}${v}`,
    report: `/results/${code}/report${v}`,
    results: `${API_BASE}/trials/${code}/results${v}`,
    plots: `${API_BASE}/trials/${code}/plots${v}`,
    csv: `/results/${code}/data${vAnd}format=csv`,
    xlsx: `/results/${code}/data${vAnd}format=xlsx`,
  };
}

export function apiTrialIndex(list: { trials: PublicTrialCard[]; crops: string[]; seasons: string[] }): ApiTrialIndex {
  return {
    trials: list.trials.map((t) => ({
      code: t.code,
      title: t.title,
      crop: t.crop,
      season: t.season,
      year: t.year,
      sites: t.sites,
      entries: t.entries.length,
      version: t.version,
      publishedAt: t.publishedAt,
      summary: t.summary,
      links: linksFor(t.code, null),
    })),
    crops: [...list.crops],
    seasons: [...list.seasons],
  };
}

export function apiTrial(s: PublicSnapshot, latestVersion: number): ApiTrial {
  const t = s.trial;
  const unitOf = new Map(s.results.map(({ result }) => [result.trait.code, publishedUnit(result.trait)]));
  return {
    code: t.code,
    title: t.title,
    crop: t.crop,
    cropGroup: t.cropGroup,
    season: t.season,
    year: t.year,
    program: s.program,
    purpose: t.purpose,
    design: t.design,
    blocksPerSite: t.blocks,
    plotUnit: t.plotUnit,
    plotSize: t.plotSize,
    protocol: t.protocol,
    version: s.version,
    latestVersion,
    publishedAt: s.publishedAt,
    changeNote: s.changeNote,
    citation: s.citation,
    analysis: { siteModel: s.settings.siteModel, separation: s.settings.separation },
    publishedTrait: s.scopeTrait,
    summary: [...s.summary],
    sites: s.sites.map((x) => ({
      name: x.name,
      kind: x.kind,
      region: x.region,
      growingSetup: x.growingSetup,
      soil: x.soil,
      irrigation: x.irrigation,
      description: x.publicDescription,
      sownOn: x.sownOn,
    })),
    traits: s.traits.map((x) => ({
      code: x.code,
      name: x.name,
      unit: unitOf.get(x.code) ?? publishedUnit(x),
      valueType: x.valueType,
      betterWhen: x.betterWhen,
      description: x.description,
    })),
    entries: s.entries.map((e) => ({
      code: e.blindCode,
      variety: e.variety,
      isCheck: e.isCheck,
      seedSource: e.seedSource,
      seedLot: e.lotCode,
      labelGerminationPercent: e.labelGermination,
      treatedSeed: e.treated,
    })),
    links: linksFor(t.code, s.version === latestVersion ? null : s.version),
  };
}

function apiMean(m: PublicMean): ApiMean {
  return {
    entry: m.blindCode,
    variety: m.varietyName,
    isCheck: m.isCheck,
    mean: rankedValue(m),
    se: finite(m.se),
    n: m.n,
    rank: m.rank,
    groupLetters: m.letter,
    percentOfCheck: finite(m.percentOfCheck),
    checkDifference: finite(m.checkDifference),
    beyondLsd: m.beyondLsd,
  };
}

function apiBlock(b: PublicBlock): ApiBlock {
  return { cv: finite(b.cv), lsd: finite(b.lsd), entryP: finite(b.entryP), comparison: b.comparisonNote, means: inStatedOrder(b.means).map(apiMean) };
}

/** One trait's published result: the combined analysis (or the one site's), then each site's. */
export function apiTraitResult(r: PublicTraitResult): ApiTraitResult {
  const single = r.perSite.find((p) => p.result);
  const block = r.combined ?? single?.result ?? null;
  return {
    trait: r.trait.code,
    name: r.trait.analysedAs,
    unit: publishedUnit(r.trait),
    betterWhen: r.trait.betterWhen,
    order: orderWords(r.trait),
    scope: r.combined ? "across sites" : "one site",
    sites: r.combined ? r.combined.sites : single ? 1 : 0,
    problem: block ? null : (r.combinedProblem ?? r.perSite.find((p) => p.problem)?.problem ?? "Not enough data for this trait."),
    result: block && apiBlock(block),
    bySite: r.perSite.map((p) => ({ site: p.siteName, problem: p.problem, result: p.result && apiBlock(p.result) })),
  };
}

export function apiResults(s: PublicSnapshot): ApiResults {
  return { trial: s.trial.code, version: s.version, results: s.results.map(({ result }) => apiTraitResult(result)) };
}

export function apiPlots(s: PublicSnapshot): ApiPlots {
  const codeOf = new Map(s.results.map(({ result }) => [result.trait.analysedAs, result.trait.code]));
  return {
    trial: s.trial.code,
    version: s.version,
    plots: s.data.map((d) => ({
      site: d.site,
      block: d.block,
      plot: d.plotCode,
      entry: d.blindCode,
      variety: d.variety,
      trait: codeOf.get(d.trait) ?? d.trait,
      unit: d.unit,
      value: finite(d.value),
      status: d.status,
      missingReason: d.missingReason,
      seedsSown: d.seedsSown,
      emerged: d.emerged,
    })),
  };
}
