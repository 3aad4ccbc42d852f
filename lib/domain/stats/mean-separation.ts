/**
 * Comparisons of entry means after an ANOVA: Fisher's protected LSD and Tukey's HSD, with
 * compact letter displays. Both use the same error term and df as the entry F test (the entry x
 * site mean square when sites are random). With missing plots they compare the LS means with the
 * exact standard error of each difference (Tukey-Kramer form for Tukey).
 */
import type { AnovaTable, Source } from "./anova";
import { studentizedRangeQuantile, studentizedRangeUpper, studentTQuantile, studentTTwoSided } from "./distributions";
import { StatsError } from "./errors";

interface ComparisonBasis {
  labels: string[];
  means: number[];
  /** variance of mean i - mean j per unit error variance */
  differenceVariance: (i: number, j: number) => number;
  errorMs: number;
  errorDf: number;
  errorSource: Source;
  entryP: number | null;
  /** all differences share one standard error */
  equalPrecision: boolean;
}

function requireAlpha(alpha: number): void {
  if (!(alpha > 0 && alpha < 1)) {
    throw new StatsError("INVALID_PROBABILITY", `The significance level must be between 0 and 1 (got ${alpha}).`, { alpha });
  }
}

/** Error term of the entry test, means to compare and the variance of their differences. */
function comparisonBasis(table: AnovaTable): ComparisonBasis {
  const entryRow = table.rows.find((r) => r.source === "entry");
  if (!entryRow) throw new StatsError("INVALID_ARGUMENT", "The ANOVA table has no entry row to compare means from.");
  const errorSource: Source = entryRow.testedAgainst ?? "residual";
  const errorRow = table.rows.find((r) => r.source === errorSource);
  const errorMs = errorSource === "residual" ? table.errorMs : errorRow?.ms;
  const errorDf = errorSource === "residual" ? table.errorDf : errorRow?.df;
  if (!(errorMs !== undefined && errorMs > 0 && errorDf !== undefined && errorDf > 0)) {
    throw new StatsError("NO_RESIDUAL_DF", "The entry error term has no degrees of freedom, so means cannot be compared.");
  }
  if (table.lsMeans === null) {
    throw new StatsError(
      "NOT_ESTIMABLE",
      "Entry means cannot all be estimated: some entry contrast is confounded with blocks, so LSD and Tukey comparisons are not available.",
    );
  }
  if (table.lsMeans && table.lsMeanCovariance) {
    const covariance = table.lsMeanCovariance;
    const k = table.lsMeans.length;
    let first = -1;
    let equal = true;
    for (let i = 0; i < k && equal; i++) {
      for (let j = 0; j < i; j++) {
        const v = covariance[i][i] + covariance[j][j] - 2 * covariance[i][j];
        if (first < 0) first = v;
        else if (Math.abs(v - first) > 1e-12 * first) {
          equal = false;
          break;
        }
      }
    }
    return {
      labels: table.lsMeans.map((m) => m.entry),
      means: table.lsMeans.map((m) => m.mean),
      differenceVariance: (i, j) => covariance[i][i] + covariance[j][j] - 2 * covariance[i][j],
      errorMs,
      errorDf,
      errorSource,
      entryP: entryRow.p,
      equalPrecision: equal,
    };
  }
  // hand-built table: plain means with 1/n_i + 1/n_j
  const counts = table.entryMeans.map((m) => m.n);
  return {
    labels: table.entryMeans.map((m) => m.entry),
    means: table.entryMeans.map((m) => m.mean),
    differenceVariance: (i, j) => 1 / counts[i] + 1 / counts[j],
    errorMs,
    errorDf,
    errorSource,
    entryP: entryRow.p,
    equalPrecision: counts.every((n) => n === counts[0]),
  };
}

export interface LsdPair {
  /** later entry (in order of first appearance) */
  a: string;
  b: string;
  /** mean(a) - mean(b), in the data's units */
  diff: number;
  /** standard error of the difference */
  sed: number;
  /** least significant difference for this pair */
  lsd: number;
  t: number;
  /** two-sided p-value of the pairwise t test, unadjusted */
  p: number;
  significant: boolean;
}

/**
 * Every pairwise t test behind Fisher's LSD, in TukeyHSD's pair order, plus letters ('a' marks the
 * highest mean; entries sharing a letter do not differ at alpha). Not protected: see lsd().
 */
export function pairwiseLsd(
  table: AnovaTable,
  alpha = 0.05,
): { t: number; df: number; ms: number; errorSource: Source; pairs: LsdPair[]; letters: Record<string, string> } {
  requireAlpha(alpha);
  const basis = comparisonBasis(table);
  const t = studentTQuantile(1 - alpha / 2, basis.errorDf);
  const pairs: LsdPair[] = [];
  forEachPair(basis.labels.length, (i, j) => {
    const diff = basis.means[i] - basis.means[j];
    const sed = Math.sqrt(basis.errorMs * basis.differenceVariance(i, j));
    const tValue = diff / sed;
    pairs.push({
      a: basis.labels[i],
      b: basis.labels[j],
      diff,
      sed,
      lsd: t * sed,
      t: tValue,
      p: studentTTwoSided(tValue, basis.errorDf),
      significant: Math.abs(diff) > t * sed,
    });
  });
  const letters = compactLetters(basis.labels, basis.means, pairs.map((p) => ({ a: p.a, b: p.b, differ: p.significant })));
  return { t, df: basis.errorDf, ms: basis.errorMs, errorSource: basis.errorSource, pairs, letters };
}

/**
 * The letters of pairwiseLsd alone. A pair differs when its difference exceeds its own LSD, which needs no
 * p-value, so the pairwise t tests' p-values (an incomplete beta function each, 780 pairs for 40 entries at
 * every site) are not computed.
 */
export function lsdLetters(table: AnovaTable, alpha = 0.05): Record<string, string> {
  requireAlpha(alpha);
  const basis = comparisonBasis(table);
  const t = studentTQuantile(1 - alpha / 2, basis.errorDf);
  return lettersByIndex(basis.labels, basis.means, (i, j) => Math.abs(basis.means[i] - basis.means[j]) > t * Math.sqrt(basis.errorMs * basis.differenceVariance(i, j)));
}

/**
 * Fisher's protected LSD at level alpha, in the data's units: null when the entry F test is not
 * significant. With missing plots the pairs differ; `lsd` is then the mean over pairs (use
 * pairwiseLsd for each pair's own value). Uses the entry test's error MS and df.
 */
export function lsd(
  table: AnovaTable,
  alpha = 0.05,
): { lsd: number; df: number; t: number; ms: number; equalReplication: boolean } | null {
  requireAlpha(alpha);
  const basis = comparisonBasis(table);
  if (basis.entryP === null || !(basis.entryP < alpha)) return null;
  const t = studentTQuantile(1 - alpha / 2, basis.errorDf);
  let sedSum = 0;
  let pairCount = 0;
  forEachPair(basis.labels.length, (i, j) => {
    sedSum += Math.sqrt(basis.errorMs * basis.differenceVariance(i, j));
    pairCount++;
  });
  const sed = basis.equalPrecision ? Math.sqrt(basis.errorMs * basis.differenceVariance(1, 0)) : sedSum / pairCount;
  return { lsd: t * sed, df: basis.errorDf, t, ms: basis.errorMs, equalReplication: basis.equalPrecision };
}

/**
 * Tukey's honestly significant difference at family level alpha: simultaneous intervals for every
 * pair (Tukey-Kramer with unequal precision), adjusted p-values and compact letters. Uses the
 * entry test's error MS and df; intervals and diffs are in the data's units.
 */
export function tukeyHsd(
  table: AnovaTable,
  alpha = 0.05,
): {
  pairs: { a: string; b: string; diff: number; lower: number; upper: number; pAdj: number }[];
  letters: Record<string, string>;
  q: number;
  df: number;
  ms: number;
  errorSource: Source;
} {
  requireAlpha(alpha);
  const basis = comparisonBasis(table);
  const k = basis.labels.length;
  const q = studentizedRangeQuantile(1 - alpha, k, basis.errorDf);
  const pairs: { a: string; b: string; diff: number; lower: number; upper: number; pAdj: number }[] = [];
  forEachPair(k, (i, j) => {
    const diff = basis.means[i] - basis.means[j];
    const se = Math.sqrt((basis.errorMs * basis.differenceVariance(i, j)) / 2);
    pairs.push({
      a: basis.labels[i],
      b: basis.labels[j],
      diff,
      lower: diff - q * se,
      upper: diff + q * se,
      pAdj: Math.min(1, studentizedRangeUpper(Math.abs(diff) / se, k, basis.errorDf)),
    });
  });
  const letters = compactLetters(basis.labels, basis.means, pairs.map((p) => ({ a: p.a, b: p.b, differ: p.pAdj < alpha })));
  return { pairs, letters, q, df: basis.errorDf, ms: basis.errorMs, errorSource: basis.errorSource };
}

/** Pairs (i, j) with i > j, ordered by j then i: the order of R's TukeyHSD. */
function forEachPair(k: number, visit: (i: number, j: number) => void): void {
  for (let j = 0; j < k; j++) for (let i = j + 1; i < k; i++) visit(i, j);
}

/**
 * Compact letter display by insert-and-absorb (Piepho 2004, J. Comput. Graph. Stat. 13, 456-466):
 * two entries share a letter exactly when they do not differ. Letters are assigned so that 'a'
 * marks the set holding the highest mean.
 */
export function compactLetters(
  labels: string[],
  means: number[],
  comparisons: { a: string; b: string; differ: boolean }[],
): Record<string, string> {
  const labelIndex = new Map(labels.map((label, i) => [label, i]));
  const differs = new Map<number, boolean>();
  for (const c of comparisons) {
    const a = labelIndex.get(c.a)!;
    const b = labelIndex.get(c.b)!;
    differs.set(Math.max(a, b) * labels.length + Math.min(a, b), c.differ);
  }
  return lettersByIndex(labels, means, (i, j) => differs.get(i * labels.length + j) ?? false);
}

/**
 * compactLetters with whether entries i > j differ told by index, so no comparison list is built. Columns are
 * bit sets over ranks (32 per word) kept side by side in one buffer, so the subset tests of the absorb step,
 * which run for every pair of columns after every split, cost a few word operations, and a split allocates
 * nothing: this runs once per site and once across sites (51 times for a 50-site trial), much of it before
 * V8 has compiled it.
 */
function lettersByIndex(labels: string[], means: number[], differAt: (i: number, j: number) => boolean): Record<string, string> {
  const k = labels.length;
  // rank entries by mean, highest first (stable for ties)
  const order = labels.map((_, i) => i).sort((x, y) => means[y] - means[x] || x - y);
  const position = new Int32Array(k);
  for (let rank = 0; rank < k; rank++) position[order[rank]!] = rank;
  const differ = new Uint8Array(k * k);
  for (let j = 0; j < k; j++) {
    for (let i = j + 1; i < k; i++) {
      if (!differAt(i, j)) continue;
      differ[position[i]! * k + position[j]!] = 1;
      differ[position[j]! * k + position[i]!] = 1;
    }
  }
  const words = Math.ceil(k / 32);
  // columns[c * words + w]: word w of column c; a split writes the next list into `spare`, then the two swap
  let capacity = 8;
  let columns = new Uint32Array(capacity * words);
  let spare = new Uint32Array(capacity * words);
  let fresh = new Uint8Array(capacity);
  let keep = new Uint8Array(capacity);
  let count = 1;
  for (let x = 0; x < k; x++) columns[x >>> 5]! |= 1 << (x & 31);
  for (let i = 0; i < k - 1; i++) {
    const wordI = i >>> 5;
    const bitI = 1 << (i & 31);
    for (let j = i + 1; j < k; j++) {
      if (differ[i * k + j] === 0) continue;
      const wordJ = j >>> 5;
      const bitJ = 1 << (j & 31);
      // Only a column holding both entries splits; when none does, the columns (already absorbed) stay as they are.
      let holding = 0;
      for (let c = 0; c < count; c++) if ((columns[c * words + wordI]! & bitI) !== 0 && (columns[c * words + wordJ]! & bitJ) !== 0) holding++;
      if (holding === 0) continue;
      const size = count + holding;
      if (size > capacity) {
        while (capacity < size) capacity *= 2;
        spare = new Uint32Array(capacity * words);
        fresh = new Uint8Array(capacity);
        keep = new Uint8Array(capacity);
      }
      // split: a column holding both becomes two, one without i and one without j, in its place
      let next = 0;
      for (let c = 0; c < count; c++) {
        const from = c * words;
        if ((columns[from + wordI]! & bitI) !== 0 && (columns[from + wordJ]! & bitJ) !== 0) {
          spare.set(columns.subarray(from, from + words), next * words);
          spare[next * words + wordI]! &= ~bitI;
          fresh[next] = 1;
          next++;
          spare.set(columns.subarray(from, from + words), next * words);
          spare[next * words + wordJ]! &= ~bitJ;
          fresh[next] = 1;
          next++;
        } else {
          spare.set(columns.subarray(from, from + words), next * words);
          fresh[next] = 0;
          next++;
        }
      }
      // absorb: drop a column contained in another (keeping the first of two equal columns). Only a column
      // just split off can be contained in another: the columns kept from before contain none of each other
      // (absorbed last time), nor any part of a split column (which was not contained in them either).
      keep.fill(1, 0, size);
      for (let p = 0; p < size; p++) {
        if (fresh[p] === 0) continue;
        for (let r = 0; r < size; r++) {
          if (p === r || keep[p] === 0 || keep[r] === 0) continue;
          let subset = true;
          let strict = false;
          for (let w = 0; w < words; w++) {
            const a = spare[p * words + w]!;
            const b = spare[r * words + w]!;
            if ((a & ~b) !== 0) {
              subset = false;
              break;
            }
            if ((b & ~a) !== 0) strict = true;
          }
          if (subset && (strict || p > r)) keep[p] = 0;
        }
      }
      // the kept columns, in order, become the list; the old list's buffer is the next spare
      if (columns.length < capacity * words) columns = new Uint32Array(capacity * words);
      count = 0;
      for (let p = 0; p < size; p++) {
        if (keep[p] === 0) continue;
        columns.set(spare.subarray(p * words, p * words + words), count * words);
        count++;
      }
    }
  }
  // letters go to columns in order of their best-ranked entry ('a' holds the highest mean; ties keep their order)
  const firstRank = new Int32Array(count);
  for (let c = 0; c < count; c++) {
    firstRank[c] = -1;
    for (let x = 0; x < k; x++) {
      if ((columns[c * words + (x >>> 5)]! & (1 << (x & 31))) !== 0) {
        firstRank[c] = x;
        break;
      }
    }
  }
  const columnOrder = Array.from({ length: count }, (_, c) => c).sort((x, y) => firstRank[x]! - firstRank[y]!);
  const result: Record<string, string> = {};
  for (let rank = 0; rank < k; rank++) {
    let text = "";
    for (let c = 0; c < count; c++) {
      const column = columnOrder[c]!;
      if ((columns[column * words + (rank >>> 5)]! & (1 << (rank & 31))) !== 0) text += letterName(c);
    }
    result[labels[order[rank]!]!] = text;
  }
  // same key order as the input labels
  return Object.fromEntries(labels.map((label) => [label, result[label]]));
}

function letterName(index: number): string {
  const alphabet = "abcdefghijklmnopqrstuvwxyz";
  if (index < 26) return alphabet[index];
  if (index < 52) return alphabet[index - 26].toUpperCase();
  return `${alphabet[index % 26]}${Math.floor(index / 26) - 1}`;
}
