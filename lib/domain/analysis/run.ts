/**
 * Assembles one trait's analysis from plain rows: which sites and plots count, per-site RCBD
 * ANOVAs, the combined analysis over sites, mean separation, warnings and plain-language notes.
 * All statistics come from lib/domain/stats; this module only decides what goes in and how it is told.
 * runAnalysis reads as the list of its steps; each step below takes what it needs and returns its part.
 */
import {
  anovaMultiSite,
  anovaRcbd,
  bartlettFromVariances,
  isStatsError,
  lsd,
  lsdLetters,
  tukeyHsd,
  type AnovaTable,
  type MultiSitePlot,
} from "@/lib/domain/stats";
import { SEED_COUNT_TRAITS, SEEDS_SOWN_CODE } from "@/lib/domain/vocabulary/traits";
import { capitalise, plural } from "@/lib/domain/vocabulary/words";
import { ANOVA_SOURCE_LABELS, EXCLUSION_CATEGORY_LABELS } from "@/lib/domain/vocabulary/labels";
import { countOf, CV_TARGET, cvWords, differenceWithUnit, formatNumber, formatP, hasCv, valueWithUnit } from "./format";
import { analyseGermination, analyseEmergence } from "./germination";
import { assignRanks, compareWithCheck, extremeWord, inStatedOrder, noPairDiffers, orderWords, rankedValue } from "./ranking";
import { analysedAs, isAnalysable, plotValue } from "./values";
import { analyseStability } from "./stability";
import type {
  AnalysisBlock,
  AnalysisInput,
  AnalysisResult,
  AnalysisSettings,
  CombinedAnalysis,
  DescribedExclusion,
  EntryResult,
  InputEntry,
  InputExclusion,
  InputObservation,
  InputPlot,
  InputSite,
  InputTrait,
  MissingPlot,
  PlotValue,
  SiteAnalysis,
  SiteChoice,
} from "./types";

/** Significance level for every test and comparison on the page (the trade's standard 0.05). */
export const ALPHA = 0.05;
/** A site's CV counts as far above the others at this multiple of their median (our rule of thumb, common practice). */
export const CV_OUTLIER_FACTOR = 2;

/** Sites and plots an exclusion removes for this trait (an exclusion without a trait applies to all). */
export function exclusionApplies(exclusion: InputExclusion, traitIds: number[]): boolean {
  return exclusion.traitId === null || traitIds.includes(exclusion.traitId);
}

interface PlotRow {
  plot: InputPlot;
  site: InputSite;
  entry: InputEntry;
  value: number | null;
  reason: string | null;
  excluded: InputExclusion | null;
}

type EntriesById = Map<number, InputEntry>;

/** How the result will be read: `forPublication` tells the notes that the key is revealed by the publication itself. */
export interface RunOptions {
  forPublication?: boolean;
  /** Told how long each step took (benchmarks: scripts/bench-analysis.ts). */
  onStep?: (step: string, ms: number) => void;
}

/** Runs the whole analysis for the settings; never throws for data problems, it reports them instead. */
export function runAnalysis(input: AnalysisInput, settings: AnalysisSettings, options: RunOptions = {}): AnalysisResult {
  const trait = input.traits.find((t) => t.id === settings.traitId);
  if (!trait) throw new Error(`Trait ${settings.traitId} is not recorded in this trial.`);
  const entriesById: EntriesById = new Map(input.entries.map((e) => [e.id, e]));
  const exclusions = exclusionsFor(input.exclusions, [trait.id]);
  const analysable = isAnalysable(trait);

  const step = timer(options.onStep);
  const { siteChoices, includedSites } = chooseSites(input.sites, exclusions.bySite, settings);
  const rows = step("plot values", () => collectPlotValues(input, trait, includedSites, exclusions.byPlot));
  const missing = listMissingPlots(rows);
  const perSite = step("per-site ANOVAs and letters", () => analyseEachSite(includedSites, rows, trait, analysable, settings, entriesById));
  const analysedSites = perSite.analyses.filter((s) => s.result !== null);
  const { combined, combinedProblem } = step("combined ANOVA and letters", () => analyseAcrossSites(analysedSites, rows, trait, analysable, settings, entriesById));
  // yes/no traits have no CV (see hasCv), so no CV rule applies to them
  const cvs = analysedSites.flatMap((s) => (s.result!.cv === null ? [] : [{ name: s.siteName, cv: s.result!.cv }]));

  const warnings = [
    ...unacceptedDataWarning(includedSites),
    ...(analysable ? [] : [`${trait.name} is free text, so it has no statistics; see the plot notes instead.`]),
    ...perSite.warnings,
    ...varianceWarnings(cvs, combined),
  ];
  // the seed-count sections add their own warnings
  const { germination, emergence } = step("germination and emergence", () => analyseSeedCounts(input, includedSites, warnings));
  const exclusionList = describeExclusions(input, exclusions);
  const notes = [
    ...siteNotes(trait, analysedSites, missing),
    // names only once the key is public (or made public by this very publication); before that the
    // coordinator's notes and the growers' view use codes alike
    ...combinedNotes(trait, combined, analysedSites.length, options.forPublication === true || input.trial.status === "published" || input.trial.status === "archived"),
    ...cvNote(cvs),
    ...(exclusionList.length > 0 ? [`${plural(exclusionList.length, "site or plot", "sites or plots")} left out of this trait by the coordinator, each listed with its reason; the data stay stored.`] : []),
  ];

  return {
    trial: { id: input.trial.id, code: input.trial.code, title: input.trial.title, crop: input.trial.crop, status: input.trial.status },
    settings,
    trait: { ...trait, analysedAs: analysedAs(trait) },
    traits: input.traits.filter((t) => t.code !== SEEDS_SOWN_CODE).map((t) => ({ id: t.id, name: t.name, analysable: isAnalysable(t) })),
    sites: siteChoices,
    perSite: perSite.analyses,
    combined,
    combinedProblem,
    missing,
    exclusions: exclusionList,
    warnings,
    notes,
    explanations: explanations(settings, trait),
    germination,
    emergence,
    plots: rows.map(plotValueRow),
  };
}

/** Runs a step, telling `onStep` how long it took when asked to. */
function timer(onStep: RunOptions["onStep"]) {
  return <T>(name: string, run: () => T): T => {
    if (!onStep) return run();
    const started = performance.now();
    const result = run();
    onStep(name, performance.now() - started);
    return result;
  };
}

/** The site-wide and plot exclusions that apply to these traits, by site and by plot (the last one recorded wins). */
function exclusionsFor(exclusions: InputExclusion[], traitIds: number[]) {
  const bySite = new Map<number, InputExclusion>();
  const byPlot = new Map<number, InputExclusion>();
  for (const x of exclusions) {
    if (!exclusionApplies(x, traitIds)) continue;
    if (x.plotId !== null) byPlot.set(x.plotId, x);
    else if (x.siteId !== null) bySite.set(x.siteId, x);
  }
  return { bySite, byPlot };
}

/** Which sites take part, and why the others do not. */
function chooseSites(sites: InputSite[], siteExclusions: Map<number, InputExclusion>, settings: AnalysisSettings) {
  const siteChoices: SiteChoice[] = sites.map((site) => {
    let why: string | null = null;
    if (settings.siteIds && !settings.siteIds.includes(site.id)) why = "not selected";
    else if (site.status !== "accepted" && !settings.includeUnaccepted) why = `data ${statusWords(site.status)}, not accepted yet`;
    else if (siteExclusions.has(site.id)) why = `excluded: ${EXCLUSION_CATEGORY_LABELS[siteExclusions.get(site.id)!.category]}`;
    return { id: site.id, name: site.name, status: site.status, included: why === null, why, shared: site.resultsShared ?? false };
  });
  const includedSites = sites.filter((_, i) => siteChoices[i]!.included);
  return { siteChoices, includedSites };
}

function unacceptedDataWarning(includedSites: InputSite[]): string[] {
  const unaccepted = includedSites.filter((s) => s.status !== "accepted");
  if (unaccepted.length === 0) return [];
  return [`Includes data not yet accepted from ${unaccepted.map((s) => `${s.name} (${statusWords(s.status)})`).join(", ")}; these figures may change after review.`];
}

/** One row per laid-out plot of the included sites, with the trait's analysed value or why it has none. */
function collectPlotValues(input: AnalysisInput, trait: InputTrait, includedSites: InputSite[], plotExclusions: Map<number, InputExclusion>): PlotRow[] {
  const observationsByPlot = new Map<number, InputObservation[]>();
  for (const o of input.observations) {
    if (o.traitId !== trait.id) continue;
    const list = observationsByPlot.get(o.plotId) ?? [];
    list.push(o);
    observationsByPlot.set(o.plotId, list);
  }
  const sitesById = new Map(includedSites.map((s) => [s.id, s]));
  const entriesById = new Map(input.entries.map((e) => [e.id, e]));
  const rows: PlotRow[] = [];
  for (const plot of input.plots) {
    const site = sitesById.get(plot.siteId);
    const entry = entriesById.get(plot.entryId);
    if (!site || !entry) continue;
    const { value, reason } = plotValue(trait, site, observationsByPlot.get(plot.id) ?? []);
    rows.push({ plot, site, entry, value, reason, excluded: plotExclusions.get(plot.id) ?? null });
  }
  return rows;
}

/** Missing and excluded plots of the sites that recorded the trait at all. */
function listMissingPlots(rows: PlotRow[]): MissingPlot[] {
  // A site with no value at all has simply not recorded the trait yet; listing all its plots would bury real gaps.
  const sitesWithData = new Set(rows.filter((r) => r.value !== null).map((r) => r.site.id));
  const missing: MissingPlot[] = [];
  for (const r of rows) {
    if (!sitesWithData.has(r.site.id)) continue;
    const reason = r.excluded ? `excluded: ${EXCLUSION_CATEGORY_LABELS[r.excluded.category]}` : r.value === null ? (r.reason ?? "not recorded") : null;
    if (reason === null) continue;
    missing.push({ plotCode: r.plot.plotCode, siteName: r.site.name, blindCode: r.entry.blindCode, block: r.plot.block, reason, handling: "left out; estimated by least squares" });
  }
  return missing;
}

/** The RCBD analysis of each included site, or the reason it has none. */
function analyseEachSite(
  includedSites: InputSite[],
  rows: PlotRow[],
  trait: InputTrait,
  analysable: boolean,
  settings: AnalysisSettings,
  entriesById: EntriesById,
): { analyses: SiteAnalysis[]; warnings: string[] } {
  const analyses: SiteAnalysis[] = [];
  const warnings: string[] = [];
  // One pass over the plots instead of one per site.
  const rowsBySite = new Map<number, PlotRow[]>();
  for (const r of rows) {
    if (r.excluded) continue;
    const list = rowsBySite.get(r.site.id);
    if (list) list.push(r);
    else rowsBySite.set(r.site.id, [r]);
  }
  for (const site of includedSites) {
    const siteRows = rowsBySite.get(site.id) ?? [];
    const blocksWithData = new Set(siteRows.filter((r) => r.value !== null).map((r) => r.plot.block));
    const base = { siteId: site.id, siteName: site.name, status: site.status, blocks: blocksWithData.size };
    if (!analysable) {
      analyses.push({ ...base, result: null, problem: "Text traits are not analysed." });
    } else if (siteRows.every((r) => r.value === null)) {
      analyses.push({ ...base, result: null, problem: `No ${trait.name.toLowerCase()} values recorded yet.` });
    } else if (blocksWithData.size < 2) {
      analyses.push({ ...base, result: null, problem: `Only ${plural(blocksWithData.size, "block")} with data; an analysis needs at least 2.` });
      warnings.push(`${site.name} has too few blocks with data (${blocksWithData.size}) to analyse; it is left out of the combined analysis.`);
    } else {
      try {
        const table = anovaRcbd(siteRows.map((r) => ({ block: String(r.plot.block), entry: String(r.entry.id), value: r.value })));
        analyses.push({ ...base, result: summarise(table, trait, settings, entriesById, `at ${site.name}`), problem: null });
      } catch (e) {
        if (!isStatsError(e)) throw e;
        analyses.push({ ...base, result: null, problem: e.message });
        warnings.push(`${site.name} could not be analysed: ${e.message}`);
      }
    }
  }
  return { analyses, warnings };
}

/** Combined analysis over the sites that could be analysed on their own, or why there is none. */
function analyseAcrossSites(
  analysedSites: SiteAnalysis[],
  rows: PlotRow[],
  trait: InputTrait,
  analysable: boolean,
  settings: AnalysisSettings,
  entriesById: EntriesById,
): { combined: CombinedAnalysis | null; combinedProblem: string | null } {
  if (!analysable) return { combined: null, combinedProblem: "Text traits are not analysed." };
  if (analysedSites.length < 2) {
    return { combined: null, combinedProblem: `A combined analysis needs at least 2 analysed sites (there ${analysedSites.length === 1 ? "is" : "are"} ${analysedSites.length}).` };
  }
  const ids = new Set(analysedSites.map((s) => s.siteId));
  const used = rows.filter((r) => ids.has(r.site.id) && !r.excluded);
  const data: MultiSitePlot[] = used.map((r) => ({ site: String(r.site.id), block: String(r.plot.block), entry: String(r.entry.id), value: r.value }));
  try {
    const table = anovaMultiSite(data, { sites: settings.siteModel });
    const block = summarise(table, trait, settings, entriesById, "across sites");
    const interaction = table.rows.find((r) => r.source === "entry:site");
    const errors = (table.siteErrors ?? []).filter((s) => s.df > 0 && s.ms > 0);
    const bartlett = errors.length >= 2 ? bartlettFromVariances(errors.map((s) => ({ df: s.df, variance: s.ms }))) : null;
    const combined: CombinedAnalysis = {
      ...block,
      siteModel: settings.siteModel,
      sites: ids.size,
      interactionF: interaction?.f ?? null,
      interactionP: interaction?.p ?? null,
      bartlett: bartlett ? { statistic: bartlett.statistic, df: bartlett.df, p: bartlett.p } : null,
      cellMeans: cellMeans(used),
      stability: null,
      stabilityProblem: null,
    };
    const { stability, problem } = analyseStability(combined, trait, entriesById);
    combined.stability = stability;
    combined.stabilityProblem = problem;
    return { combined, combinedProblem: null };
  } catch (e) {
    if (!isStatsError(e)) throw e;
    return { combined: null, combinedProblem: e.message };
  }
}

/** Warnings a statistician would raise before anyone reads the means: one site far noisier, unequal residual variances. */
function varianceWarnings(cvs: { name: string; cv: number }[], combined: CombinedAnalysis | null): string[] {
  const warnings: string[] = [];
  if (cvs.length >= 3) {
    for (const s of cvs) {
      const others = median(cvs.filter((o) => o !== s).map((o) => o.cv));
      if (others > 0 && s.cv > CV_OUTLIER_FACTOR * others) {
        warnings.push(
          `${s.name}'s CV (${formatNumber(s.cv, 1)}%) is more than ${CV_OUTLIER_FACTOR} times the other sites' median (${formatNumber(others, 1)}%); check its data or consider excluding it with a reason.`,
        );
      }
    }
  }
  if (combined?.bartlett && combined.bartlett.p < ALPHA) {
    warnings.push(
      `Residual variances differ across sites (Bartlett K² = ${formatNumber(combined.bartlett.statistic, 2)}, ${combined.bartlett.df} df, ${formatP(combined.bartlett.p)}), so pooling them is doubtful: read the per-site results first and treat the combined F test with care.`,
    );
  }
  return warnings;
}

/** Germination and emergence from the seed counts, over the included sites and the plots no seed-count exclusion removes. */
function analyseSeedCounts(input: AnalysisInput, includedSites: InputSite[], warnings: string[]) {
  const seedCountTraitIds = input.traits.filter((t) => (SEED_COUNT_TRAITS as readonly string[]).includes(t.code)).map((t) => t.id);
  const excluded = exclusionsFor(input.exclusions, seedCountTraitIds);
  const siteIds = new Set(includedSites.filter((s) => !excluded.bySite.has(s.id)).map((s) => s.id));
  const plots = input.plots.filter((p) => siteIds.has(p.siteId) && !excluded.byPlot.has(p.id));
  return { germination: analyseGermination(input, plots, warnings), emergence: analyseEmergence(input, plots, warnings) };
}

/**
 * The exclusions that leave something out of this trait, one per site or plot (the one that applies), with
 * the names people know them by. Other traits' exclusions are theirs: a plot left out of yield still counts
 * for height.
 */
function describeExclusions(input: AnalysisInput, applied: ReturnType<typeof exclusionsFor>): DescribedExclusion[] {
  const siteName = (siteId: number | undefined) => input.sites.find((s) => s.id === siteId)?.name ?? null;
  return [...applied.bySite.values(), ...applied.byPlot.values()]
    .sort((a, b) => a.id - b.id)
    .map((x) => {
      const plot = x.plotId !== null ? input.plots.find((p) => p.id === x.plotId) : undefined;
      return {
        ...x,
        siteName: x.siteId !== null ? siteName(x.siteId) : siteName(plot?.siteId),
        plotCode: plot?.plotCode ?? null,
        traitName: x.traitId !== null ? (input.traits.find((t) => t.id === x.traitId)?.name ?? null) : null,
        publicReason: EXCLUSION_CATEGORY_LABELS[x.category],
      };
    });
}

/** Plain-language summary of the per-site tests, then the missing plots. */
function siteNotes(trait: InputTrait, analysedSites: SiteAnalysis[], missing: MissingPlot[]): string[] {
  const notes: string[] = [];
  if (analysedSites.length > 0) {
    const label = analysedAs(trait);
    const lowerLabel = label.charAt(0).toLowerCase() + label.slice(1);
    const differed = analysedSites.filter((s) => s.result!.entryP !== null && s.result!.entryP < ALPHA).length;
    notes.push(`${sitesDifferedWords(lowerLabel, differed, analysedSites.length)} (F test, α = ${ALPHA}).`);
  }
  // A plot missing at a site that could not be analysed takes no part in any mean, so it is said apart.
  const analysedNames = new Set(analysedSites.map((s) => s.siteName));
  const inAnalysis = missing.filter((m) => analysedNames.has(m.siteName));
  const notAnalysed = missing.filter((m) => !analysedNames.has(m.siteName));
  const elsewhere = notAnalysed.length;
  const elsewhereSites = new Set(notAnalysed.map((m) => m.siteName)).size;
  if (inAnalysis.length > 0) {
    const out = inAnalysis.filter((m) => m.reason.startsWith("excluded")).length;
    notes.push(
      `${plural(inAnalysis.length, "plot")} ${inAnalysis.length === 1 ? "is" : "are"} missing${out ? ` (${out} excluded by a coordinator)` : ""}; ${inAnalysis.length === 1 ? "it is" : "they are"} left out and the means are least-squares estimates, which equal plain means when nothing is missing.`,
    );
  }
  if (elsewhere > 0) {
    const where = elsewhereSites === 1 ? "a site that could not be analysed for this trait (its reason is given)" : `${elsewhereSites} sites that could not be analysed for this trait (their reasons are given)`;
    notes.push(`${plural(elsewhere, "missing plot")} ${elsewhere === 1 ? "is" : "are"} at ${where}, so ${elsewhere === 1 ? "it takes" : "they take"} no part in these means.`);
  }
  return notes;
}

/**
 * How many sites' F tests found the varieties different, as a sentence that reads naturally for one site,
 * none, some or all: "At the one site analysed, varieties did not differ clearly in yield".
 */
export function sitesDifferedWords(what: string, differed: number, analysed: number): string {
  if (analysed === 1) return `At the one site analysed, varieties ${differed === 1 ? "differed" : "did not differ clearly"} in ${what}`;
  if (differed === 0) return `Varieties did not differ clearly in ${what} at ${analysed === 2 ? "either site" : `any of the ${analysed} sites`}`;
  if (differed === analysed) return `Varieties differed in ${what} at ${analysed === 2 ? "both sites" : `all ${analysed} sites`}`;
  return `Varieties differed in ${what} at ${countOf(differed, analysed, "site")}`;
}

/** What the combined analysis says: the entry test, the interaction, the top entry. */
function combinedNotes(trait: InputTrait, combined: CombinedAnalysis | null, analysedSiteCount: number, revealed: boolean): string[] {
  if (!combined) return analysedSiteCount === 1 ? [`Only one site could be analysed, so there is no combined analysis.`] : [];
  const notes: string[] = [];
  const interaction = ANOVA_SOURCE_LABELS["entry:site"].toLowerCase();
  const against = combined.siteModel === "random" ? `against the ${interaction} mean square, because sites are treated as a sample of farms` : "against the pooled error, because sites are treated as fixed";
  const differ = combined.entryP !== null && combined.entryP < ALPHA;
  const test = `F = ${formatNumber(combined.entryF, 2)}, ${formatP(combined.entryP)}; tested ${against}`;
  notes.push(
    combined.entryF === null
      ? `Across ${plural(combined.sites, "site")}, the variety test could not be run: its error term (${combined.siteModel === "random" ? interaction : "residual"}) has no variation.`
      : !differ
        ? `Across ${plural(combined.sites, "site")}, varieties did not differ clearly (${test}).`
        : noPairDiffers(combined.means)
          ? `Across ${plural(combined.sites, "site")}, the F test was significant (${test}), but Tukey's test found no pair of varieties that differs at α = ${ALPHA}, so no variety is clearly ahead of another.`
          : `Across ${plural(combined.sites, "site")}, varieties differed (${test}).`,
  );
  if (combined.interactionP !== null) {
    notes.push(
      combined.interactionP < ALPHA
        ? `The ${interaction} interaction was large (${formatP(combined.interactionP)}), so rank varieties per site rather than on the combined means.`
        : `Varieties ranked much the same from site to site (${interaction} ${formatP(combined.interactionP)}), so the combined means are a fair summary.`,
    );
  }
  const ordered = inStatedOrder(combined.means);
  const first = ordered[0];
  if (first) {
    const label = (m: EntryResult) => (revealed && m.varietyName ? m.varietyName : m.blindCode);
    const lead =
      trait.betterWhen === "neither"
        ? `Combined means, ${orderWords(trait)}: ${extremeWord(trait, "first")} ${label(first)} (${valueWithUnit(trait, rankedValue(first))}), ${extremeWord(trait, "last")} ${label(ordered[ordered.length - 1]!)} (${valueWithUnit(trait, rankedValue(ordered[ordered.length - 1]!))})`
        : differ && !noPairDiffers(combined.means)
          ? `Best combined mean (${extremeWord(trait, "first")}): ${label(first)} (${valueWithUnit(trait, rankedValue(first))})`
          : `${capitalise(extremeWord(trait, "first"))} combined mean: ${label(first)} (${valueWithUnit(trait, rankedValue(first))}), not clearly better than the others`;
    notes.push(`${lead}; ${combined.comparisonNote} ${[cvWords(combined.cv), plural(combined.n, "plot")].filter(Boolean).join(", ")}.`);
  }
  return notes;
}

function cvNote(cvs: { name: string; cv: number }[]): string[] {
  if (cvs.length === 0) return [];
  const highCv = cvs.filter((s) => s.cv > CV_TARGET);
  return [
    highCv.length === 0
      ? `Every site's CV is at or under ${CV_TARGET}%, the usual target for a well-run trial.`
      : `CV is above the ${CV_TARGET}% target at ${countOf(highCv.length, cvs.length, "site")} (${highCv.map((s) => `${s.name} ${formatNumber(s.cv, 1)}%`).join(", ")}); differences there are harder to detect.`,
  ];
}

/** One-line explanations of the chosen settings, shown beside the controls. */
function explanations(settings: AnalysisSettings, trait: InputTrait): AnalysisResult["explanations"] {
  return {
    siteModel:
      settings.siteModel === "random"
        ? "Sites random: the farms stand for farms like them, so entries are tested against how much their ranking shifts between sites."
        : "Sites fixed: conclusions hold for these farms only, so entries are tested against plot-to-plot error.",
    separation:
      settings.separation === "lsd"
        ? `Protected LSD: pairs are compared only after a significant F test; entries sharing a letter do not differ at α = ${ALPHA}.`
        : `Tukey: every pair is compared at once with a ${ALPHA} family-wise error rate; it finds fewer differences than the LSD.`,
    missing: "Missing and excluded plots are left out; means are least-squares estimates, so no value is invented.",
    unaccepted: settings.includeUnaccepted
      ? "Includes data still in draft or awaiting review; those sites are marked."
      : "Only data a coordinator has accepted are used.",
    cv: hasCv(trait)
      ? `CV% is the plot-to-plot error as a share of the mean; ${CV_TARGET}% or less is the usual target.`
      : "A yes/no trait has no CV (the spread of yes and no says nothing of the trial's precision); the share of plots with yes is shown instead.",
  };
}

function plotValueRow(r: PlotRow): PlotValue {
  return {
    plotCode: r.plot.plotCode,
    siteId: r.site.id,
    siteName: r.site.name,
    block: r.plot.block,
    entryId: r.entry.id,
    blindCode: r.entry.blindCode,
    varietyName: r.entry.varietyName,
    value: r.value,
    status: r.excluded ? "excluded" : r.value === null ? "missing" : "used",
  };
}


function statusWords(status: InputSite["status"]): string {
  return status === "submitted" ? "submitted" : status === "returned" ? "returned for corrections" : status === "draft" ? "still in draft" : "accepted";
}

function median(xs: number[]): number {
  if (xs.length === 0) return 0;
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Means, letters and the comparison sentence for one ANOVA table. */
function summarise(table: AnovaTable, trait: InputTrait, settings: AnalysisSettings, entries: EntriesById, where: string): AnalysisBlock {
  const entryRow = table.rows.find((r) => r.source === "entry");
  let letters: Record<string, string> | null = null;
  let lsdValue: number | null = null;
  let tukeyQ: number | null = null;
  let comparisonNote: string;
  try {
    if (settings.separation === "lsd") {
      const protectedLsd = lsd(table, ALPHA);
      if (protectedLsd) {
        lsdValue = protectedLsd.lsd;
        letters = lsdLetters(table, ALPHA);
        comparisonNote = `LSD 0.05 = ${differenceWithUnit(trait, lsdValue)}${protectedLsd.equalReplication ? "" : " (average over pairs, since plots are missing)"}.`;
      } else {
        comparisonNote = `no LSD is given ${where} because the variety F test was not significant (protected LSD).`;
      }
    } else {
      const tukey = tukeyHsd(table, ALPHA);
      letters = tukey.letters;
      tukeyQ = tukey.q;
      const differ = tukey.pairs.filter((p) => p.pAdj < ALPHA).length;
      comparisonNote = differ === 0 ? `Tukey found no pair that differs at α = ${ALPHA}.` : `Tukey found ${plural(differ, "pair")} that ${differ === 1 ? "differs" : "differ"} at α = ${ALPHA}.`;
    }
  } catch (e) {
    if (!isStatsError(e)) throw e;
    comparisonNote = `means cannot be compared: ${e.message}`;
  }
  const ls = new Map((table.lsMeans ?? []).map((m) => [m.entry, m]));
  const means: EntryResult[] = table.entryMeans.map((m) => {
    const entry = entries.get(Number(m.entry))!;
    const lsMean = table.lsMeans === null ? null : (ls.get(m.entry)?.mean ?? m.mean);
    return {
      entryId: entry.id,
      blindCode: entry.blindCode,
      varietyName: entry.varietyName,
      varietyId: entry.varietyId,
      isCheck: entry.isCheck,
      mean: m.mean,
      lsMean,
      se: ls.get(m.entry)?.se ?? m.se,
      n: m.n,
      letter: letters ? (letters[m.entry] ?? null) : null,
      rank: null,
      percentOfCheck: null,
      checkDifference: null,
      beyondLsd: null,
    };
  });
  assignRanks(means, trait.betterWhen);
  compareWithCheck(means, lsdValue).forEach((c, i) => Object.assign(means[i]!, c));
  means.sort((a, b) => entries.get(a.entryId)!.entryNumber - entries.get(b.entryId)!.entryNumber);
  return {
    rows: table.rows,
    n: table.n,
    missing: table.missing,
    grandMean: table.grandMean,
    cv: hasCv(trait) ? table.cv : null,
    errorMs: table.errorMs,
    errorDf: table.errorDf,
    entryF: entryRow?.f ?? null,
    entryP: entryRow?.p ?? null,
    means,
    lsd: lsdValue,
    tukeyQ,
    comparisonNote,
  };
}

function cellMeans(rows: PlotRow[]): CombinedAnalysis["cellMeans"] {
  const cells = new Map<string, { siteId: number; siteName: string; entryId: number; sum: number; n: number }>();
  for (const r of rows) {
    if (r.value === null) continue;
    const key = `${r.site.id}:${r.entry.id}`;
    const c = cells.get(key) ?? { siteId: r.site.id, siteName: r.site.name, entryId: r.entry.id, sum: 0, n: 0 };
    c.sum += r.value;
    c.n += 1;
    cells.set(key, c);
  }
  return [...cells.values()].map((c) => ({ siteId: c.siteId, siteName: c.siteName, entryId: c.entryId, mean: c.sum / c.n, n: c.n }));
}
