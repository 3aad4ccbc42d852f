/**
 * Analysis of variance for variety trials: one-way (completely randomised), randomised complete
 * block at one site, and the combined analysis over sites. Unbalanced data are fitted by least
 * squares (see block-model.ts) and give R's sequential sums of squares.
 */
import { fitBlockModel, type PlotArrays } from "./block-model";
import { fUpper } from "./distributions";
import { StatsError } from "./errors";
import { homeSlot, LabelIndex } from "./label-index";

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

// One-way accumulators, one row of STRIDE per entry (plot counts are kept apart, as integers). The hot
// loop adds values shifted by one reference (the first observed value) into plain partial sums; after
// each chunk of plots those are folded into compensated totals, so no partial sum runs over more than a
// few dozen terms and the per-plot work stays at two additions and a count. Entries whose mean lies far from the reference relative to
// their spread are caught by the cancellation check and recomputed two-pass.
const STRIDE = 2;
const PART_SUM = 0;
const PART_SQ = 1;
// 64 plots, or 16 per entry when there are more than four, keeps NIST SmLs01-03 at full precision
// (32 per entry already drops SmLs03 below its target)
const MIN_CHUNK = 64;
const CHUNK_PER_ENTRY = 16;
/** within-entry SS is recomputed two-pass when the shifted sums cancel by more than this factor */
const CANCELLATION_LIMIT = 1e3;

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
 */
export function anovaOneWay(data: readonly OneWayPlot[]): AnovaTable {
  requireArray(data, "one-way data");
  const entries = new LabelIndex("entry");
  let capacity = 16;
  let acc = new Float64Array(capacity * STRIDE);
  // plots per entry; integer increments keep the counts off the floating-point adder, and the last
  // slot counts missing plots
  let plotCounts = new Int32Array(capacity + 1);
  let totals = new Float64Array(capacity * 4); // sum, its compensation, sum of squares, its compensation
  const reference = firstObservedValue(data);
  for (let start = 0; start < data.length; ) {
    const end = Math.min(data.length, start + Math.max(MIN_CHUNK, CHUNK_PER_ENTRY * entries.size));
    const stopped = accumulateOneWay(data, start, end, entries, acc, plotCounts, capacity, reference);
    foldOneWay(acc, totals, entries.size < capacity ? entries.size : capacity);
    // a stop before `end` means a new entry beyond capacity or a regrown label table
    if (entries.size > capacity) {
      capacity *= 4;
      const grownAcc = new Float64Array(capacity * STRIDE);
      grownAcc.set(acc);
      acc = grownAcc;
      const grownCounts = new Int32Array(capacity + 1);
      grownCounts.set(plotCounts.subarray(0, capacity / 4));
      grownCounts[capacity] = plotCounts[capacity / 4];
      plotCounts = grownCounts;
      const grownTotals = new Float64Array(capacity * 4);
      grownTotals.set(totals);
      totals = grownTotals;
    }
    start = stopped;
  }
  const missing = plotCounts[capacity];

  const k = entries.size;
  if (k < 2) {
    throw new StatsError("TOO_FEW_ENTRIES", `At least two entries are needed for an analysis of variance (found ${k}).`, {
      entries: entries.labels.slice(),
    });
  }
  const counts = new Float64Array(k);
  const shiftedMeans = new Float64Array(k); // mean minus the entry's reference value
  const withinSs = new Float64Array(k);
  const needsTwoPass: number[] = [];
  let n = 0;
  for (let e = 0; e < k; e++) {
    const count = plotCounts[e];
    if (count === 0) {
      throw new StatsError("EMPTY_ENTRY", `Entry "${entries.labels[e]}" has no observed plots.`, { entry: entries.labels[e] });
    }
    const sum = totals[e * 4] + totals[e * 4 + 1];
    const squares = totals[e * 4 + 2] + totals[e * 4 + 3];
    if (!Number.isFinite(sum) || !Number.isFinite(squares)) {
      const index = data.findIndex((plot) => typeof plot.value === "number" && !Number.isFinite(plot.value));
      nonFinite(index, data[index]?.value);
    }
    counts[e] = count;
    shiftedMeans[e] = sum / count;
    const correction = sum * shiftedMeans[e];
    withinSs[e] = squares - correction;
    if (correction > CANCELLATION_LIMIT * withinSs[e]) needsTwoPass.push(e);
    n += count;
  }
  if (needsTwoPass.length > 0) recomputeWithinTwoPass(data, entries, needsTwoPass, reference, shiftedMeans, withinSs);

  // entry means relative to one common reference (the first entry's), kept small for accuracy
  const centred = new Float64Array(k);
  let weighted = 0;
  for (let e = 0; e < k; e++) {
    centred[e] = shiftedMeans[e];
    weighted += counts[e] * centred[e];
  }
  const centre = weighted / n;
  let betweenSs = 0;
  let residualSs = 0;
  for (let e = 0; e < k; e++) {
    const deviation = centred[e] - centre;
    betweenSs += counts[e] * deviation * deviation;
    residualSs += Math.max(withinSs[e], 0);
  }
  const grandMean = reference + centre;
  const dfResidual = n - k;
  requireResidual(dfResidual, residualSs);

  const entryRow = row("entry", k - 1, betweenSs);
  const residualRow = row("residual", dfResidual, residualSs);
  testRow(entryRow, residualRow);
  const errorMs = residualRow.ms;
  const entryMeans: EntryMean[] = [];
  const lsMeans: LsMean[] = [];
  const covariance: number[][] = [];
  let balanced = true;
  for (let e = 0; e < k; e++) {
    const mean = reference + shiftedMeans[e];
    const se = Math.sqrt(errorMs / counts[e]);
    entryMeans.push({ entry: entries.labels[e], mean, n: counts[e], se });
    lsMeans.push({ entry: entries.labels[e], mean, se });
    const covarianceRow = new Array<number>(k).fill(0);
    covarianceRow[e] = 1 / counts[e];
    covariance.push(covarianceRow);
    if (counts[e] !== counts[0]) balanced = false;
  }
  return {
    rows: [entryRow, residualRow],
    n,
    missing,
    grandMean,
    errorMs,
    errorDf: dfResidual,
    cv: (100 * Math.sqrt(errorMs)) / grandMean,
    entryMeans,
    design: "one-way",
    rSquared: betweenSs / (betweenSs + residualSs),
    balanced,
    lsMeans,
    lsMeanCovariance: covariance,
  };
}

/** The first non-null value, used as the common shift (0 when every plot is missing). */
function firstObservedValue(data: readonly OneWayPlot[]): number {
  for (const plot of data) {
    if (typeof plot.value === "number" && Number.isFinite(plot.value)) return plot.value;
  }
  return 0;
}

/**
 * Adds plots start..end-1 into the per-entry partial sums. Returns end, or the index of the first
 * plot whose entry does not fit in `capacity` (the caller grows the arrays and resumes there).
 * Kept small and free of reallocation so the engine compiles it to a tight loop.
 */
function accumulateOneWay(
  data: readonly OneWayPlot[],
  start: number,
  end: number,
  entries: LabelIndex,
  acc: Float64Array,
  counts: Int32Array,
  capacity: number,
  reference: number,
): number {
  // The label table's first probe is inlined with the table in locals; a label that is not in its
  // home slot goes through entries.indexOf, and if that replaced the table the caller re-enters.
  const slots = entries.slots;
  const slotIndex = entries.slotIndex;
  const mask = entries.mask;
  let i = start;
  while (i < end) {
    // Two ordinary plots at a time: both rows' fields are loaded before either label lookup, so the
    // memory reads of the second overlap the first's string comparison. The sums still receive the
    // plots in order, so the result is identical to one plot at a time.
    if (i + 1 < end) {
      const first = data[i];
      const second = data[i + 1];
      const x = first.value;
      const y = second.value;
      const a = first.entry;
      const b = second.entry;
      if (typeof a === "string" && typeof b === "string" && typeof x === "number" && typeof y === "number") {
        const p = homeSlot(a, mask);
        const q = homeSlot(b, mask);
        // labels already in the table have indices below capacity: a label that would not fit
        // leaves through the stop below before it can be found here
        if (slots[p] === a && slots[q] === b) {
          // literal offsets: each module-level constant read here costs a context load and an
          // initialisation check per plot in optimised code
          const e = slotIndex[p];
          const g = e * 2;
          const v = x - reference;
          acc[g] += v;
          acc[g + 1] += v * v;
          counts[e]++;
          const f = slotIndex[q];
          const h = f * 2;
          const w = y - reference;
          acc[h] += w;
          acc[h + 1] += w * w;
          counts[f]++;
          i += 2;
          continue;
        }
      }
    }
    const plot = data[i];
    const e = entries.indexOf(plot.entry);
    if (e >= capacity || entries.slots !== slots) return i;
    const x = plot.value;
    i++;
    if (typeof x !== "number") {
      if (x !== null && x !== undefined) nonFinite(i - 1, x);
      counts[capacity]++;
      continue;
    }
    const g = e * 2;
    const v = x - reference;
    acc[g] += v;
    acc[g + 1] += v * v;
    counts[e]++;
  }
  return end;
}

/** Moves the partial sums into the running totals with Neumaier's compensated addition. */
function foldOneWay(acc: Float64Array, totals: Float64Array, size: number): void {
  for (let e = 0; e < size; e++) {
    const g = e * STRIDE;
    const t = e * 4;
    const v = acc[g + PART_SUM];
    const sum = totals[t];
    const newSum = sum + v;
    totals[t + 1] += Math.abs(sum) >= Math.abs(v) ? sum - newSum + v : v - newSum + sum;
    totals[t] = newSum;
    acc[g + PART_SUM] = 0;
    const square = acc[g + PART_SQ];
    const sq = totals[t + 2];
    const newSq = sq + square;
    totals[t + 3] += sq >= square ? sq - newSq + square : square - newSq + sq;
    totals[t + 2] = newSq;
    acc[g + PART_SQ] = 0;
  }
}

/** Second pass for entries whose mean lies far from the reference value (their shifted sums cancelled). */
function recomputeWithinTwoPass(
  data: readonly OneWayPlot[],
  entries: LabelIndex,
  groups: number[],
  reference: number,
  shiftedMeans: Float64Array,
  withinSs: Float64Array,
): void {
  const wanted = new Map<number, number[]>(groups.map((e) => [e, []]));
  for (const plot of data) {
    if (typeof plot.value !== "number") continue;
    const values = wanted.get(entries.indexOf(plot.entry));
    if (values) values.push(plot.value);
  }
  for (const [e, values] of wanted) {
    let sum = 0;
    let compensation = 0;
    for (const value of values) {
      const v = value - reference;
      const t = sum + v;
      compensation += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
      sum = t;
    }
    const mean = (sum + compensation) / values.length;
    let squares = 0;
    let squaresCompensation = 0;
    for (const value of values) {
      const d = value - reference - mean;
      const square = d * d;
      const t = squares + square;
      squaresCompensation += squares >= square ? squares - t + square : square - t + squares;
      squares = t;
    }
    shiftedMeans[e] = mean;
    withinSs[e] = squares + squaresCompensation;
  }
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
