/**
 * The REML mixed model told in plain words: one trial's sites (environment = site) or every season of
 * a crop's trials at once (environment = site-year, varieties present in some seasons only). The
 * statistics come from lib/domain/stats (mixedModel); ranks, % of check and the order words from
 * ranking.ts, so this view agrees with the least-squares one on what "best" means.
 */
import { compactLetters, isStatsError, mixedModel, type MixedModelResult, type MixedPlot, type MixedTerm } from "@/lib/domain/stats";
import { plural } from "@/lib/domain/vocabulary/words";
import { differenceWithUnit, formatNumber, formatP, valueWithUnit, type UnitShape } from "./format";
import { assignRanks, compareWithCheck, extremeWord } from "./ranking";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";

/** Significance level of the F test and of the pairwise tests behind the letters. */
export const MIXED_ALPHA = 0.05;

/** One variety (or entry) as the mixed model compares it. */
export interface MixedEntryInfo {
  /** what identifies it across the plots (variety id across seasons, entry id in one trial) */
  key: string;
  /** what people read: variety name when the viewer may see it, else the blind code */
  label: string;
  /** the blind code in one trial; across seasons (codes differ by trial) the label again */
  blindCode: string;
  varietyName: string | null;
  varietyId: number | null;
  isCheck: boolean;
}

export interface MixedEntryResult extends MixedEntryInfo {
  mean: number;
  se: number;
  df: number;
  /** observed plots */
  n: number;
  /** environments it was grown in */
  environments: number;
  /** compact letters from the pairwise t tests (protected by the F test); null when no letters */
  letter: string | null;
  /** 1 = best for the trait's direction; null when the trait has no preferred direction */
  rank: number | null;
  percentOfCheck: number | null;
  checkDifference: number | null;
  /** for ranking.ts (a REML mean is already adjusted) */
  lsMean: null;
}

export interface MixedComponent {
  term: MixedTerm;
  variance: number;
  /** share of the total variance of one plot, % */
  share: number;
  /** what the component means, in words a grower follows */
  words: string;
}

export interface MixedAnalysis {
  environmentWord: "site" | "site-year";
  environments: string[];
  n: number;
  dfMethod: "satterthwaite" | "kenward-roger";
  components: MixedComponent[];
  singular: boolean;
  remlCriterion: number;
  entryTest: MixedModelResult["entryTest"];
  means: MixedEntryResult[];
  pairs: (MixedModelResult["pairs"][number] & { aLabel: string; bLabel: string })[];
  notes: string[];
}

type TraitShape = { name: string; betterWhen: BetterWhen; computation: string } & UnitShape;

/** Mixed-model plots from rows the analysis already chose (accepted, not excluded): one per used plot. */
export interface MixedRow {
  site: string;
  season?: string;
  block: string;
  entryKey: string;
  value: number;
}

/**
 * Fits the mixed model to the rows and describes it; a StatsError becomes `problem` in plain words
 * (one environment, a single variety, ...), never a thrown error.
 */
export function analyseMixed(
  rows: readonly MixedRow[],
  entries: readonly MixedEntryInfo[],
  trait: TraitShape,
  opts: { df?: "satterthwaite" | "kenward-roger" } = {},
): { mixed: MixedAnalysis | null; problem: string | null } {
  const seasons = rows.some((r) => r.season !== undefined);
  const environmentWord = seasons ? "site-year" : "site";
  const used = new Set(rows.map((r) => r.entryKey));
  const listed = entries.filter((e) => used.has(e.key));
  const plots: MixedPlot[] = rows.map((r) => ({
    site: r.site,
    ...(r.season !== undefined ? { year: r.season } : {}),
    // blocks are numbered within a site; a site-year keeps its own
    block: r.block,
    entry: r.entryKey,
    value: r.value,
  }));
  let fit: MixedModelResult;
  try {
    fit = mixedModel(plots, { df: opts.df ?? "satterthwaite", entries: listed.map((e) => e.key) });
  } catch (error) {
    if (isStatsError(error)) return { mixed: null, problem: `The mixed model could not be fitted: ${error.message}` };
    throw error;
  }
  const byKey = new Map(listed.map((e) => [e.key, e]));
  const counts = new Map<string, { n: number; envs: Set<string> }>();
  for (const p of plots) {
    const c = counts.get(p.entry) ?? { n: 0, envs: new Set<string>() };
    c.n++;
    c.envs.add(p.year !== undefined ? `${p.site} ${p.year}` : p.site);
    counts.set(p.entry, c);
  }
  const separated = fit.entryTest.p < MIXED_ALPHA;
  const letters = separated
    ? compactLetters(
        fit.entryMeans.map((m) => m.entry),
        fit.entryMeans.map((m) => m.mean),
        fit.pairs.map((pair) => ({ a: pair.a, b: pair.b, differ: pair.p < MIXED_ALPHA })),
      )
    : null;
  const means: MixedEntryResult[] = fit.entryMeans.map((m) => {
    const info = byKey.get(m.entry)!;
    return {
      ...info,
      mean: m.mean,
      se: m.se,
      df: m.df,
      n: counts.get(m.entry)?.n ?? 0,
      environments: counts.get(m.entry)?.envs.size ?? 0,
      letter: letters ? letters[m.entry] : null,
      rank: null,
      percentOfCheck: null,
      checkDifference: null,
      lsMean: null,
    };
  });
  assignRanks(means, trait.betterWhen);
  compareWithCheck(means, null).forEach((c, i) => {
    means[i].percentOfCheck = c.percentOfCheck;
    means[i].checkDifference = c.checkDifference;
  });
  means.sort((a, b) => (a.rank !== null && b.rank !== null ? a.rank - b.rank : a.mean - b.mean));
  const labelOf = (key: string) => byKey.get(key)?.label ?? key;
  const total = fit.components.reduce((s, c) => s + c.variance, 0);
  const components = fit.components.map((c) => ({
    term: c.term,
    variance: c.variance,
    share: total > 0 ? (100 * c.variance) / total : 0,
    words: componentWords(c.term, c.variance, trait, environmentWord),
  }));
  const mixed: MixedAnalysis = {
    environmentWord,
    environments: fit.environments,
    n: fit.n,
    dfMethod: fit.dfMethod,
    components,
    singular: fit.singular,
    remlCriterion: fit.remlCriterion,
    entryTest: fit.entryTest,
    means,
    pairs: fit.pairs.map((pair) => ({ ...pair, aLabel: labelOf(pair.a), bLabel: labelOf(pair.b) })),
    notes: [],
  };
  mixed.notes = mixedNotes(mixed, trait);
  return { mixed, problem: null };
}

/** A variance component's name in words: "variety × site", "blocks within a site-year", ... */
export function termWords(term: MixedTerm, env: "site" | "site-year"): string {
  return term === "environment" ? `differences between ${env}s` : term === "entry:environment" ? `variety × ${env}` : term === "block:environment" ? `blocks within a ${env}` : "plot to plot";
}

const sd = (variance: number) => Math.sqrt(Math.max(variance, 0));

function componentWords(term: MixedTerm, variance: number, trait: TraitShape, env: "site" | "site-year"): string {
  const spread = differenceWithUnit(trait, sd(variance));
  const where = env === "site" ? "site" : "site and season";
  switch (term) {
    case "environment":
      return `How much ${env === "site" ? "sites" : "sites and seasons"} differ: a typical ${where}'s average lies about ${spread} above or below the overall average.`;
    case "entry:environment":
      return variance <= 0
        ? `How much varieties change rank between ${env}s: no more than plot-to-plot noise would explain.`
        : `How much varieties change rank between ${env}s: a variety's advantage moves by about ${spread} from one ${where} to the next.`;
    case "block:environment":
      return `How much blocks within a ${where} differ: about ${spread}.`;
    case "residual":
      return `Plot-to-plot variation left over: about ${spread}.`;
  }
}

function mixedNotes(m: MixedAnalysis, trait: TraitShape): string[] {
  const notes: string[] = [];
  const envs = plural(m.environments.length, m.environmentWord);
  notes.push(
    `REML mixed model over ${envs} (${plural(m.n, "plot")}): varieties fixed; ${m.environmentWord}s, blocks and variety × ${m.environmentWord} random, so a variety missing from some ${m.environmentWord}s is still compared fairly.`,
  );
  const interaction = m.components.find((c) => c.term === "entry:environment")!;
  const environment = m.components.find((c) => c.term === "environment")!;
  notes.push(
    `${formatNumber(environment.share, 0)}% of the variation between plots comes from differences between ${m.environmentWord}s and ${formatNumber(interaction.share, 0)}% from varieties changing rank between them.`,
  );
  if (m.entryTest.p < MIXED_ALPHA) {
    const first = m.means[0];
    const lead =
      trait.betterWhen === "neither"
        ? `Varieties differ (${formatP(m.entryTest.p)}); ${extremeWord(trait, "first")} is ${first.label} at ${valueWithUnit(trait, first.mean)}.`
        : `Varieties differ (${formatP(m.entryTest.p)}); best (${extremeWord(trait, "first")}) is ${first.label} at ${valueWithUnit(trait, first.mean)}.`;
    notes.push(`${lead} Means sharing a letter do not differ at ${MIXED_ALPHA}.`);
  } else {
    notes.push(`The varieties did not differ beyond chance (${formatP(m.entryTest.p)}), so no letters are given.`);
  }
  if (m.singular) {
    const zero = m.components.filter((c) => c.term !== "residual" && c.variance < 1e-8 * (m.components.find((x) => x.term === "residual")!.variance || 1));
    notes.push(
      `Estimated at zero: ${zero.map((c) => termWords(c.term, m.environmentWord)).join(", ")}. The data show no such variation beyond plot-to-plot noise; the other figures stand.`,
    );
  }
  return notes;
}
