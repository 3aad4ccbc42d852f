/**
 * Analysis of variance for variety trials: one-way (completely randomised), randomised complete
 * block at one site, and the combined analysis over sites. Unbalanced data are fitted by least
 * squares (see block-model.ts) and give R's sequential sums of squares.
 */
import { fitBlockModel, type PlotArrays } from "./block-model";
import { fUpper } from "./distributions";
import { StatsError } from "./errors";
import { LabelIndex } from "./label-index";

export type Source = "site" | "block" | "block:site" | "entry" | "entry:site" | "residual";

export interface AnovaRow {
  source: Source;
  df: number;
  ss: number;
  ms: number;
  f: number | null;
  p: number | null;
  testedAgainst?: Source;
}

export interface EntryMean {
  entry: string;
  /** arithmetic mean of the entry's observed plots */
  mean: number;
  /** observed plots */
  n: number;
  /** sqrt(MS of the entry's error term / n) */
  se: number;
}

export interface LsMean {
  entry: string;
  /** least-squares mean: fitted value averaged over blocks (and sites); equals the plain mean when balanced */
  mean: number;
  se: number;
}

export interface AnovaTable {
  rows: AnovaRow[];
  n: number;
  missing: number;
  grandMean: number;
  /** residual mean square and df */
  errorMs: number;
  errorDf: number;
  /** 100 * sqrt(residual MS) / grand mean of the observed values */
  cv: number;
  entryMeans: EntryMean[];
  design?: "one-way" | "rcbd" | "multi-site";
  sites?: "random" | "fixed";
  rSquared?: number;
  /** true when every entry has the same number of plots in every block (no missing plots) */
  balanced?: boolean;
  /**
   * Adjusted entry means used by lsd() and tukeyHsd(); null when entry contrasts are confounded
   * with blocks (not all estimable). Absent on hand-built tables.
   */
  lsMeans?: LsMean[] | null;
  /** covariance of lsMeans per unit error variance (multiply by the entry error MS) */
  lsMeanCovariance?: number[][] | null;
  /** per-site error df and MS of value ~ block + entry (multi-site only), for Bartlett's test */
  siteErrors?: { site: string; df: number; ms: number }[];
}

export interface OneWayPlot {
  entry: string;
  value: number | null;
}

export interface RcbdPlot {
  block: string;
  entry: string;
  value: number | null;
}

export interface MultiSitePlot {
  site: string;
  block: string;
  entry: string;
  value: number | null;
}

function requireArray(data: unknown, what: string): asserts data is unknown[] {
  if (!Array.isArray(data)) {
    throw new StatsError("INVALID_ARGUMENT", `The ${what} must be given as a list of plots.`);
  }
}

function nonFinite(index: number, value: unknown): never {
  throw new StatsError(
    "NON_FINITE_VALUE",
    `Plot ${index + 1} has the value ${String(value)}, which is not a finite number. Give missing plots the value null.`,
    { index, value },
  );
}

function fTest(msNumerator: number, dfNumerator: number, msDenominator: number, dfDenominator: number) {
  if (!(dfNumerator > 0) || !(dfDenominator > 0) || !(msDenominator > 0)) return { f: null, p: null };
  const f = msNumerator / msDenominator;
  return { f, p: fUpper(f, dfNumerator, dfDenominator) };
}

function row(source: Source, df: number, ss: number): AnovaRow {
  return { source, df, ss, ms: df > 0 ? ss / df : 0, f: null, p: null };
}

function testRow(target: AnovaRow, against: AnovaRow): void {
  const test = fTest(target.ms, target.df, against.ms, against.df);
  target.f = test.f;
  target.p = test.p;
  target.testedAgainst = against.source;
}

function requireResidual(df: number, ss: number): void {
  if (df <= 0) {
    throw new StatsError(
      "NO_RESIDUAL_DF",
      "There are no degrees of freedom left for the error term: every plot is used up by the model (add replicates).",
      { residualDf: df },
    );
  }
  if (!(ss > 0)) {
    throw new StatsError(
      "NO_VARIATION",
      "The plots show no variation around the fitted model (residual sum of squares is zero), so no F test is possible.",
    );
  }
}

/**
 * One-way ANOVA of a completely randomised trial (entries only), in the data's units.
 * Plots with value null are missing (counted in `missing`, otherwise ignored); NaN or Infinity throw.
 *
 * Accuracy: one pass over the plots keeps, per entry, the count, the mean and the sum of squared
 * deviations from the mean (Welford's updates, which never subtract two large sums of squares), on
 * values taken relative to the entry's first value. The entry means are then compared relative to
 * one common reference, so values that share their leading digits (NIST SmLs07-09:
 * 1000000000000.4 and the like) keep the differences between entries exact. Every NIST StRD
 * one-way set reaches the LRE that exact arithmetic on the parsed doubles reaches
 * (tests/unit/stats/nist-anova.test.ts).
 */
export function anovaOneWay(data: readonly OneWayPlot[]): AnovaTable {
  requireArray(data, "one-way data");
  const { labels, tallies, missing } = tallyOneWayPlots(data);
  const k = labels.length;
  if (k < 2) {
    throw new StatsError("TOO_FEW_ENTRIES", `At least two entries are needed for an analysis of variance (found ${k}).`, {
      entries: labels.slice(),
    });
  }
  for (let e = 0; e < k; e++) {
    if (tallies[e].count === 0) throw new StatsError("EMPTY_ENTRY", `Entry "${labels[e]}" has no observed plots.`, { entry: labels[e] });
  }
  // Entry means relative to one common reference, the first entry's first value: values that share
  // their leading digits (NIST SmLs07-09) keep the differences between entry means exact.
  const reference = tallies[0].first;
  const means = tallies.map((tally) => tally.first - reference + tally.shiftedMean);

  let n = 0;
  for (const tally of tallies) n += tally.count;
  let centre = 0; // grand mean minus the reference
  for (let e = 0; e < k; e++) centre += (tallies[e].count * means[e]) / n;
  let betweenSs = 0;
  let residualSs = 0;
  for (let e = 0; e < k; e++) {
    betweenSs += tallies[e].count * (means[e] - centre) ** 2;
    residualSs += tallies[e].ss;
  }
  const grandMean = reference + centre;
  const dfResidual = n - k;
  requireResidual(dfResidual, residualSs);

  const entryRow = row("entry", k - 1, betweenSs);
  const residualRow = row("residual", dfResidual, residualSs);
  testRow(entryRow, residualRow);
  const errorMs = residualRow.ms;
  const entryMeanRows: EntryMean[] = [];
  const lsMeans: LsMean[] = [];
  const covariance: number[][] = [];
  for (let e = 0; e < k; e++) {
    const count = tallies[e].count;
    const mean = reference + means[e];
    const se = Math.sqrt(errorMs / count);
    entryMeanRows.push({ entry: labels[e], mean, n: count, se });
    lsMeans.push({ entry: labels[e], mean, se });
    const covarianceRow = new Array<number>(k).fill(0);
    covarianceRow[e] = 1 / count;
    covariance.push(covarianceRow);
  }
  return {
    rows: [entryRow, residualRow],
    n,
    missing,
    grandMean,
    errorMs,
    errorDf: dfResidual,
    cv: (100 * Math.sqrt(errorMs)) / grandMean,
    entryMeans: entryMeanRows,
    design: "one-way",
    rSquared: betweenSs / (betweenSs + residualSs),
    balanced: tallies.every((tally) => tally.count === tallies[0].count),
    lsMeans,
    lsMeanCovariance: covariance,
  };
}

/**
 * One entry's observed plots so far, by Welford's updates on values taken relative to the entry's
 * first value, so the updates work on small numbers even when the values share many leading digits.
 */
class EntryTally {
  count = 0;
  first = 0;
  /** the mean minus the first value */
  shiftedMean = 0;
  /** the sum of squared deviations from the mean */
  ss = 0;

  add(value: number): void {
    const count = ++this.count;
    if (count === 1) this.first = value;
    const shifted = value - this.first;
    const deviation = shifted - this.shiftedMean;
    this.shiftedMean += deviation / count;
    this.ss += deviation * (shifted - this.shiftedMean);
  }
}

/** Checks the plots and tallies each entry's observed values in one pass (entries in order of first appearance). */
function tallyOneWayPlots(data: readonly OneWayPlot[]): { labels: string[]; tallies: EntryTally[]; missing: number } {
  const entries = new LabelIndex("entry");
  const tallies: EntryTally[] = [];
  let missing = 0;
  for (let i = 0; i < data.length; i++) {
    const plot = data[i];
    const e = entries.indexOf(plot.entry);
    if (e === tallies.length) tallies.push(new EntryTally());
    const value = plot.value;
    if (value == null) {
      missing++;
      continue;
    }
    if (!Number.isFinite(value)) nonFinite(i, value);
    tallies[e].add(value);
  }
  return { labels: entries.labels, tallies, missing };
}

interface IndexedPlots {
  arrays: PlotArrays;
  entries: LabelIndex;
  sites: LabelIndex;
  blockLabels: string[];
  reference: number;
  missing: number;
  balanced: boolean;
  entryCounts: Float64Array;
  entrySums: Float64Array;
}

/** Turns plot rows into dense indices, checks them, and counts missing cells of the layout. */
function indexPlots(data: readonly MultiSitePlot[], what: string): IndexedPlots {
  requireArray(data, what);
  const entries = new LabelIndex("entry");
  const sites = new LabelIndex("site");
  const blocks = new Map<string, number>();
  const blockLabels: string[] = [];
  const blockSiteList: number[] = [];
  const observedBlock: number[] = [];
  const observedEntry: number[] = [];
  const observedValue: number[] = [];
  const blockHasData: boolean[] = [];
  const siteHasData: boolean[] = [];
  for (let i = 0; i < data.length; i++) {
    const plot = data[i];
    const site = sites.indexOf(plot.site);
    const entry = entries.indexOf(plot.entry);
    if (typeof plot.block !== "string") {
      throw new StatsError("INVALID_LABEL", `Plot ${i + 1} has no block name (use "" when the trial has no blocks).`, {
        index: i,
      });
    }
    const blockKey = `${site}\u0000${plot.block}`;
    let block = blocks.get(blockKey);
    if (block === undefined) {
      block = blockLabels.length;
      blocks.set(blockKey, block);
      blockLabels.push(plot.block);
      blockSiteList.push(site);
      blockHasData.push(false);
    }
    siteHasData[site] ??= false;
    const value = plot.value;
    if (value === null || value === undefined) continue;
    if (typeof value !== "number" || !Number.isFinite(value)) nonFinite(i, value);
    observedBlock.push(block);
    observedEntry.push(entry);
    observedValue.push(value);
    blockHasData[block] = true;
    siteHasData[site] = true;
  }
  const entryCount = entries.size;
  const entryCounts = new Float64Array(entryCount);
  for (const e of observedEntry) entryCounts[e]++;
  for (let e = 0; e < entryCount; e++) {
    if (entryCounts[e] === 0) {
      throw new StatsError("EMPTY_ENTRY", `Entry "${entries.labels[e]}" has no observed plots.`, { entry: entries.labels[e] });
    }
  }
  if (entryCount < 2) {
    throw new StatsError("TOO_FEW_ENTRIES", `At least two entries are needed for an analysis of variance (found ${entryCount}).`, {
      entries: entries.labels.slice(),
    });
  }
  for (let s = 0; s < sites.size; s++) {
    if (!siteHasData[s]) {
      throw new StatsError("EMPTY_SITE", `Site "${sites.labels[s]}" has no observed plots.`, { site: sites.labels[s] });
    }
  }
  for (let b = 0; b < blockLabels.length; b++) {
    if (!blockHasData[b]) {
      const site = sites.labels[blockSiteList[b]];
      throw new StatsError(
        "EMPTY_BLOCK",
        `Block "${blockLabels[b]}"${sites.size > 1 ? ` at site "${site}"` : ""} has no observed plots; remove it or enter its data.`,
        { block: blockLabels[b], site },
      );
    }
  }

  const reference = observedValue[0];
  const values = new Float64Array(observedValue.length);
  const entrySums = new Float64Array(entryCount);
  for (let i = 0; i < values.length; i++) {
    values[i] = observedValue[i] - reference;
    entrySums[observedEntry[i]] += values[i];
  }

  // missing = cells of each site's entry x block grid without an observation; balanced = every cell once
  const blockCount = blockLabels.length;
  const cell = new Int32Array(blockCount * entryCount);
  for (let i = 0; i < observedBlock.length; i++) cell[observedBlock[i] * entryCount + observedEntry[i]]++;
  const siteEntries = Array.from({ length: sites.size }, () => new Uint8Array(entryCount));
  for (let i = 0; i < observedBlock.length; i++) siteEntries[blockSiteList[observedBlock[i]]][observedEntry[i]] = 1;
  let missing = 0;
  let balanced = true;
  for (let b = 0; b < blockCount; b++) {
    const entriesAtSite = siteEntries[blockSiteList[b]];
    for (let e = 0; e < entryCount; e++) {
      const count = cell[b * entryCount + e];
      if (entriesAtSite[e] && count === 0) missing++;
      if (count !== 1) balanced = false;
    }
  }

  return {
    arrays: {
      values,
      entry: Int32Array.from(observedEntry),
      block: Int32Array.from(observedBlock),
      blockSite: Int32Array.from(blockSiteList),
      entryCount,
      blockCount,
      siteCount: sites.size,
    },
    entries,
    sites,
    blockLabels,
    reference,
    missing,
    balanced,
    entryCounts,
    entrySums,
  };
}

function assembleTable(
  indexed: IndexedPlots,
  rows: AnovaRow[],
  entryErrorMs: number,
  fit: ReturnType<typeof fitBlockModel>,
  design: "rcbd" | "multi-site",
): AnovaTable {
  const residual = rows[rows.length - 1];
  const k = indexed.entries.size;
  const entryMeans: EntryMean[] = [];
  for (let e = 0; e < k; e++) {
    const n = indexed.entryCounts[e];
    entryMeans.push({
      entry: indexed.entries.labels[e],
      mean: indexed.reference + indexed.entrySums[e] / n,
      n,
      se: Math.sqrt(entryErrorMs / n),
    });
  }
  let lsMeans: LsMean[] | null = null;
  let lsMeanCovariance: number[][] | null = null;
  if (fit.lsMeans && fit.lsMeanCovariance) {
    const means = fit.lsMeans;
    const covariance = fit.lsMeanCovariance;
    lsMeans = [];
    lsMeanCovariance = [];
    for (let e = 0; e < k; e++) {
      lsMeans.push({
        entry: indexed.entries.labels[e],
        mean: indexed.reference + means[e],
        se: Math.sqrt(entryErrorMs * covariance[e * k + e]),
      });
      lsMeanCovariance.push(Array.from(covariance.subarray(e * k, (e + 1) * k)));
    }
  }
  const modelSs = rows.slice(0, -1).reduce((sum, r) => sum + r.ss, 0);
  const grandMean = indexed.reference + fit.grandMean;
  return {
    rows,
    n: fit.n,
    missing: indexed.missing,
    grandMean,
    errorMs: residual.ms,
    errorDf: residual.df,
    cv: (100 * Math.sqrt(residual.ms)) / grandMean,
    entryMeans,
    design,
    rSquared: modelSs / (modelSs + residual.ss),
    balanced: indexed.balanced,
    lsMeans,
    lsMeanCovariance,
  };
}

/**
 * Randomised complete block ANOVA at one site: value ~ block + entry, sequential SS with entry
 * after blocks, in the data's units. Missing plots (value null, or rows left out) are handled by
 * least squares; an entry contrast confounded with blocks loses its df as in R.
 */
export function anovaRcbd(data: readonly RcbdPlot[]): AnovaTable {
  requireArray(data, "block data");
  const indexed = indexPlots(
    data.map((plot) => ({ site: "1", block: plot?.block, entry: plot?.entry, value: plot?.value })),
    "block data",
  );
  const fit = fitBlockModel(indexed.arrays);
  requireResidual(fit.dfResidual, fit.ssResidual);
  const blockRow = row("block", fit.dfBlock, fit.ssBlock);
  const entryRow = row("entry", fit.dfEntry, fit.ssEntry);
  const residualRow = row("residual", fit.dfResidual, fit.ssResidual);
  if (blockRow.df > 0) testRow(blockRow, residualRow);
  testRow(entryRow, residualRow);
  const rows = blockRow.df > 0 ? [blockRow, entryRow, residualRow] : [entryRow, residualRow];
  return assembleTable(indexed, rows, residualRow.ms, fit, "rcbd");
}

/**
 * Combined analysis over sites: value ~ site + site:block + entry + entry:site (sequential SS in
 * that order, as R's lm), in the data's units. Random sites (default): entry is tested against
 * entry x site and site against block within site; fixed sites: everything against the residual.
 * Missing plots (value null, or rows left out) are fitted by least squares; rows whose df are 0
 * (e.g. no blocks) are left out. Block names are local to their site.
 */
export function anovaMultiSite(
  data: readonly MultiSitePlot[],
  opts: { sites?: "random" | "fixed" } = {},
): AnovaTable {
  const sitesMode = opts.sites ?? "random";
  if (sitesMode !== "random" && sitesMode !== "fixed") {
    throw new StatsError("INVALID_ARGUMENT", `Sites must be "random" or "fixed" (got ${String(sitesMode)}).`);
  }
  const indexed = indexPlots(data, "multi-site data");
  if (indexed.sites.size < 2) {
    throw new StatsError(
      "TOO_FEW_GROUPS",
      `A combined analysis needs at least two sites (found ${indexed.sites.size}); analyse a single site with anovaRcbd.`,
      { sites: indexed.sites.labels.slice() },
    );
  }
  const fit = fitBlockModel(indexed.arrays);
  requireResidual(fit.dfResidual, fit.ssResidual);
  const siteRow = row("site", fit.dfSite, fit.ssSite);
  const blockRow = row("block:site", fit.dfBlock, fit.ssBlock);
  const entryRow = row("entry", fit.dfEntry, fit.ssEntry);
  const interactionRow = row("entry:site", fit.dfEntrySite, fit.ssEntrySite);
  const residualRow = row("residual", fit.dfResidual, fit.ssResidual);
  let entryErrorMs = residualRow.ms;
  if (sitesMode === "random") {
    const siteError = blockRow.df > 0 ? blockRow : interactionRow.df > 0 ? interactionRow : residualRow;
    testRow(siteRow, siteError);
    if (interactionRow.df > 0) {
      testRow(entryRow, interactionRow);
      entryErrorMs = interactionRow.ms;
    } else {
      testRow(entryRow, residualRow);
    }
  } else {
    testRow(siteRow, residualRow);
    testRow(entryRow, residualRow);
  }
  if (blockRow.df > 0) testRow(blockRow, residualRow);
  if (interactionRow.df > 0) testRow(interactionRow, residualRow);
  const rows = [siteRow, blockRow, entryRow, interactionRow, residualRow].filter((r) => r.df > 0 || r === residualRow);
  const table = assembleTable(indexed, rows, entryErrorMs, fit, "multi-site");
  table.sites = sitesMode;
  table.siteErrors = indexed.sites.labels.map((site, s) => ({
    site,
    df: fit.siteResidualDf[s],
    ms: fit.siteResidualDf[s] > 0 ? fit.siteResidualSs[s] / fit.siteResidualDf[s] : Number.NaN,
  }));
  return table;
}
