/**
 * Assembles one trait's analysis from plain rows: which sites and plots count, per-site RCBD
 * ANOVAs, the combined analysis over sites, mean separation, warnings and plain-language notes.
 * All statistics come from lib/domain/stats; this module only decides what goes in and how it is told.
 */
import {
  anovaMultiSite,
  anovaRcbd,
  bartlettFromVariances,
  isStatsError,
  lsd,
  pairwiseLsd,
  tukeyHsd,
  type AnovaTable,
  type MultiSitePlot,
} from "@/lib/domain/stats";
import { SEED_COUNT_TRAITS, SEEDS_SOWN_CODE } from "@/lib/domain/vocabulary/traits";
import { plural } from "@/lib/domain/vocabulary/words";
import { countOf, formatNumber, formatP } from "./format";
import { analyseGermination, analyseEmergence } from "./germination";
import { analysedAs, isAnalysable, plotValue } from "./values";
import type {
  AnalysisBlock,
  AnalysisInput,
  AnalysisResult,
  AnalysisSettings,
  CombinedAnalysis,
  EntryResult,
  InputEntry,
  InputExclusion,
  InputObservation,
  InputPlot,
  InputSite,
  MissingPlot,
  SiteAnalysis,
  SiteChoice,
} from "./types";

/** Significance level for every test and comparison on the page (the trade's standard 0.05). */
export const ALPHA = 0.05;
/** CV% a well-run variety trial aims for (Ohio State SC-166; FarmWest: under 12% is "well-controlled"). */
export const CV_TARGET = 12;
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

/** Runs the whole analysis for the settings; never throws for data problems, it reports them instead. */
export function runAnalysis(input: AnalysisInput, settings: AnalysisSettings): AnalysisResult {
  const trait = input.traits.find((t) => t.id === settings.traitId);
  if (!trait) throw new Error(`Trait ${settings.traitId} is not recorded in this trial.`);
  const warnings: string[] = [];
  const notes: string[] = [];
  const entriesById = new Map(input.entries.map((e) => [e.id, e]));
  const sitesById = new Map(input.sites.map((s) => [s.id, s]));
  const traitLabel = analysedAs(trait);
  const lowerLabel = traitLabel.charAt(0).toLowerCase() + traitLabel.slice(1);

  // Which sites take part, and why the others do not.
  const siteExclusions = new Map<number, InputExclusion>();
  for (const x of input.exclusions) if (x.siteId !== null && x.plotId === null && exclusionApplies(x, [trait.id])) siteExclusions.set(x.siteId, x);
  const plotExclusions = new Map<number, InputExclusion>();
  for (const x of input.exclusions) if (x.plotId !== null && exclusionApplies(x, [trait.id])) plotExclusions.set(x.plotId, x);
  const siteChoices: SiteChoice[] = input.sites.map((site) => {
    let why: string | null = null;
    if (settings.siteIds && !settings.siteIds.includes(site.id)) why = "not selected";
    else if (site.status !== "accepted" && !settings.includeUnaccepted) why = `data ${statusWords(site.status)}, not accepted yet`;
    else if (siteExclusions.has(site.id)) why = `excluded: ${siteExclusions.get(site.id)!.reason}`;
    return { id: site.id, name: site.name, status: site.status, included: why === null, why, shared: site.resultsShared ?? false };
  });
  const includedSites = input.sites.filter((s) => siteChoices.find((c) => c.id === s.id)!.included);
  const unacceptedIn = includedSites.filter((s) => s.status !== "accepted");
  if (unacceptedIn.length > 0) {
    warnings.push(
      `Includes data not yet accepted from ${unacceptedIn.map((s) => `${s.name} (${statusWords(s.status)})`).join(", ")}; these figures may change after review.`,
    );
  }

  // Plot values for the chosen trait.
  const obsByPlot = new Map<number, InputObservation[]>();
  for (const o of input.observations) {
    if (o.traitId !== trait.id) continue;
    const list = obsByPlot.get(o.plotId) ?? [];
    list.push(o);
    obsByPlot.set(o.plotId, list);
  }
  const includedIds = new Set(includedSites.map((s) => s.id));
  const rows: PlotRow[] = [];
  for (const plot of input.plots) {
    if (!includedIds.has(plot.siteId)) continue;
    const site = sitesById.get(plot.siteId)!;
    const entry = entriesById.get(plot.entryId);
    if (!entry) continue;
    const { value, reason } = plotValue(trait, site, obsByPlot.get(plot.id) ?? []);
    rows.push({ plot, site, entry, value, reason, excluded: plotExclusions.get(plot.id) ?? null });
  }

  // A site with no value at all has simply not recorded the trait yet; listing all its plots would bury real gaps.
  const sitesWithData = new Set(rows.filter((r) => r.value !== null).map((r) => r.site.id));
  const missing: MissingPlot[] = [];
  for (const r of rows) {
    if (!sitesWithData.has(r.site.id)) continue;
    if (r.excluded) {
      missing.push({ plotCode: r.plot.plotCode, siteName: r.site.name, blindCode: r.entry.blindCode, block: r.plot.block, reason: `excluded: ${r.excluded.reason}`, handling: "left out; estimated by least squares" });
    } else if (r.value === null) {
      missing.push({ plotCode: r.plot.plotCode, siteName: r.site.name, blindCode: r.entry.blindCode, block: r.plot.block, reason: r.reason ?? "not recorded", handling: "left out; estimated by least squares" });
    }
  }

  const perSite: SiteAnalysis[] = [];
  const analysable = isAnalysable(trait);
  if (!analysable) warnings.push(`${trait.name} is free text, so it has no statistics; see the plot notes instead.`);
  for (const site of includedSites) {
    const siteRows = rows.filter((r) => r.site.id === site.id && !r.excluded);
    const blocksWithData = new Set(siteRows.filter((r) => r.value !== null).map((r) => r.plot.block));
    const base = { siteId: site.id, siteName: site.name, status: site.status, blocks: blocksWithData.size };
    if (!analysable) {
      perSite.push({ ...base, result: null, problem: "Text traits are not analysed." });
      continue;
    }
    if (siteRows.every((r) => r.value === null)) {
      perSite.push({ ...base, result: null, problem: `No ${trait.name.toLowerCase()} values recorded yet.` });
      continue;
    }
    if (blocksWithData.size < 2) {
      perSite.push({ ...base, result: null, problem: `Only ${plural(blocksWithData.size, "block")} with data; an analysis needs at least 2.` });
      warnings.push(`${site.name} has too few blocks with data (${blocksWithData.size}) to analyse; it is left out of the combined analysis.`);
      continue;
    }
    try {
      const table = anovaRcbd(siteRows.map((r) => ({ block: String(r.plot.block), entry: String(r.entry.id), value: r.value })));
      perSite.push({ ...base, result: summarise(table, settings, entriesById, `at ${site.name}`), problem: null });
    } catch (e) {
      if (!isStatsError(e)) throw e;
      perSite.push({ ...base, result: null, problem: e.message });
      warnings.push(`${site.name} could not be analysed: ${e.message}`);
    }
  }

  // Combined analysis over the sites that could be analysed on their own.
  const analysedSites = perSite.filter((s) => s.result !== null);
  let combined: CombinedAnalysis | null = null;
  let combinedProblem: string | null = null;
  if (!analysable) combinedProblem = "Text traits are not analysed.";
  else if (analysedSites.length < 2) combinedProblem = `A combined analysis needs at least 2 analysed sites (there ${analysedSites.length === 1 ? "is" : "are"} ${analysedSites.length}).`;
  else {
    const ids = new Set(analysedSites.map((s) => s.siteId));
    const data: MultiSitePlot[] = rows
      .filter((r) => ids.has(r.site.id) && !r.excluded)
      .map((r) => ({ site: String(r.site.id), block: String(r.plot.block), entry: String(r.entry.id), value: r.value }));
    try {
      const table = anovaMultiSite(data, { sites: settings.siteModel });
      const block = summarise(table, settings, entriesById, "across sites");
      const interaction = table.rows.find((r) => r.source === "entry:site");
      const errors = (table.siteErrors ?? []).filter((s) => s.df > 0 && s.ms > 0);
      const bartlett = errors.length >= 2 ? bartlettFromVariances(errors.map((s) => ({ df: s.df, variance: s.ms }))) : null;
      combined = {
        ...block,
        siteModel: settings.siteModel,
        sites: ids.size,
        interactionF: interaction?.f ?? null,
        interactionP: interaction?.p ?? null,
        bartlett: bartlett ? { statistic: bartlett.statistic, df: bartlett.df, p: bartlett.p } : null,
        cellMeans: cellMeans(rows.filter((r) => ids.has(r.site.id) && !r.excluded)),
      };
    } catch (e) {
      if (!isStatsError(e)) throw e;
      combinedProblem = e.message;
    }
  }

  // Warnings a statistician would raise before anyone reads the means.
  const cvs = analysedSites.map((s) => ({ name: s.siteName, cv: s.result!.cv }));
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
  if (missing.length > 0) {
    const lost = missing.filter((m) => !m.reason.startsWith("excluded")).length;
    const out = missing.length - lost;
    notes.push(
      `${plural(missing.length, "plot")} ${missing.length === 1 ? "is" : "are"} missing${out ? ` (${out} excluded by a coordinator)` : ""}; ${missing.length === 1 ? "it is" : "they are"} left out and the means are least-squares estimates, which equal plain means when nothing is missing.`,
    );
  }

  // Plain-language summary.
  if (analysedSites.length > 0) {
    const differed = analysedSites.filter((s) => s.result!.entryP !== null && s.result!.entryP < ALPHA);
    notes.unshift(`Entries differed in ${lowerLabel} at ${countOf(differed.length, analysedSites.length, "site")} (F test, α = ${ALPHA}).`);
  }
  if (combined) {
    const against = combined.siteModel === "random" ? "against the entry × site mean square, because sites are treated as a sample of farms" : "against the pooled error, because sites are treated as fixed";
    const differ = combined.entryP !== null && combined.entryP < ALPHA;
    notes.push(
      combined.entryF === null
        ? `Across ${plural(combined.sites, "site")}, the entry test could not be run: its error term (${combined.siteModel === "random" ? "entry × site" : "residual"}) has no variation.`
        : `Across ${plural(combined.sites, "site")}, entries ${differ ? "differed" : "did not differ clearly"} (F = ${formatNumber(combined.entryF, 2)}, ${formatP(combined.entryP)}; tested ${against}).`,
    );
    if (combined.interactionP !== null) {
      notes.push(
        combined.interactionP < ALPHA
          ? `The entry × site interaction was large (${formatP(combined.interactionP)}), so rank varieties per site rather than on the combined means.`
          : `Entries ranked much the same from site to site (entry × site ${formatP(combined.interactionP)}), so the combined means are a fair summary.`,
      );
    }
    const top = [...combined.means].sort((a, b) => a.rank - b.rank)[0];
    if (top) {
      notes.push(
        `Highest combined mean: ${top.blindCode} (${formatNumber(top.lsMean ?? top.mean)}${trait.unit && trait.computation === "none" ? ` ${trait.unit}` : ""}); ${combined.comparisonNote} CV ${formatNumber(combined.cv, 1)}%, ${combined.n} plots.`,
      );
    }
  } else if (analysedSites.length === 1) {
    notes.push(`Only one site could be analysed, so there is no combined analysis.`);
  }
  const highCv = cvs.filter((s) => s.cv > CV_TARGET);
  if (cvs.length > 0) {
    notes.push(
      highCv.length === 0
        ? `Every site's CV is at or under ${CV_TARGET}%, the usual target for a well-run trial.`
        : `CV is above the ${CV_TARGET}% target at ${countOf(highCv.length, cvs.length, "site")} (${highCv.map((s) => `${s.name} ${formatNumber(s.cv, 1)}%`).join(", ")}); differences there are harder to detect.`,
    );
  }

  const germinationTraitIds = input.traits.filter((t) => (SEED_COUNT_TRAITS as readonly string[]).includes(t.code)).map((t) => t.id);
  const germPlotExclusions = new Set(input.exclusions.filter((x) => x.plotId !== null && exclusionApplies(x, germinationTraitIds)).map((x) => x.plotId!));
  const germSiteIds = new Set(
    includedSites
      .filter((s) => !input.exclusions.some((x) => x.siteId === s.id && x.plotId === null && exclusionApplies(x, germinationTraitIds)))
      .map((s) => s.id),
  );
  const germPlots = input.plots.filter((p) => germSiteIds.has(p.siteId) && !germPlotExclusions.has(p.id));
  const germination = analyseGermination(input, germPlots, warnings);
  const emergence = analyseEmergence(input, germPlots, warnings);

  const exclusionList = input.exclusions.map((x) => ({
    ...x,
    siteName: x.siteId !== null ? (sitesById.get(x.siteId)?.name ?? null) : x.plotId !== null ? (sitesById.get(input.plots.find((p) => p.id === x.plotId)?.siteId ?? -1)?.name ?? null) : null,
    plotCode: x.plotId !== null ? (input.plots.find((p) => p.id === x.plotId)?.plotCode ?? null) : null,
    traitName: x.traitId !== null ? (input.traits.find((t) => t.id === x.traitId)?.name ?? null) : null,
  }));
  if (exclusionList.length > 0) {
    notes.push(`${plural(exclusionList.length, "exclusion")} recorded for this trial; the data stay stored and are listed below.`);
  }

  return {
    trial: { id: input.trial.id, code: input.trial.code, title: input.trial.title, crop: input.trial.crop, status: input.trial.status },
    settings,
    trait: { ...trait, analysedAs: traitLabel },
    traits: input.traits.filter((t) => t.code !== SEEDS_SOWN_CODE).map((t) => ({ id: t.id, name: t.name, analysable: isAnalysable(t) })),
    sites: siteChoices,
    perSite,
    combined,
    combinedProblem,
    missing,
    exclusions: exclusionList,
    warnings,
    notes,
    explanations: {
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
      cv: `CV% is the plot-to-plot error as a share of the mean; ${CV_TARGET}% or less is the usual target.`,
    },
    germination,
    emergence,
    plots: rows.map((r) => ({
      plotCode: r.plot.plotCode,
      siteId: r.site.id,
      siteName: r.site.name,
      block: r.plot.block,
      entryId: r.entry.id,
      blindCode: r.entry.blindCode,
      varietyName: r.entry.varietyName,
      value: r.value,
      status: r.excluded ? "excluded" : r.value === null ? "missing" : "used",
    })),
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
function summarise(table: AnovaTable, settings: AnalysisSettings, entries: Map<number, InputEntry>, where: string): AnalysisBlock {
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
        letters = pairwiseLsd(table, ALPHA).letters;
        comparisonNote = `LSD 0.05 = ${formatNumber(lsdValue)}${protectedLsd.equalReplication ? "" : " (average over pairs, since plots are missing)"}.`;
      } else {
        comparisonNote = `no LSD is given ${where} because the entry F test was not significant (protected LSD).`;
      }
    } else {
      const tukey = tukeyHsd(table, ALPHA);
      letters = tukey.letters;
      tukeyQ = tukey.q;
      const differ = tukey.pairs.filter((p) => p.pAdj < ALPHA).length;
      comparisonNote = `Tukey found ${plural(differ, "pair")} that differ at α = ${ALPHA}.`;
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
      rank: 0,
    };
  });
  [...means].sort((a, b) => (b.lsMean ?? b.mean) - (a.lsMean ?? a.mean)).forEach((m, i) => (m.rank = i + 1));
  means.sort((a, b) => entries.get(a.entryId)!.entryNumber - entries.get(b.entryId)!.entryNumber);
  return {
    rows: table.rows,
    n: table.n,
    missing: table.missing,
    grandMean: table.grandMean,
    cv: table.cv,
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
