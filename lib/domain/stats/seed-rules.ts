/**
 * Quality checks from the Federal Seed Act regulations: the maximum tolerated range between
 * 100-seed replicates of a germination test (7 CFR 201.55) and the tolerance between a test
 * result and the labelled germination (7 CFR 201.63).
 */
import { StatsError } from "./errors";

// 7 CFR 201.55 table, keyed by the higher average (the table pairs 99 with 2, 98 with 3, ...,
// i.e. a low average L reads as 101 - L). Values: [4 replicates, 2 replicates]; null = no entry.
// Rows 71-99 as printed in the regulation; below 71 the 4-replicate limits follow the same table
// (67-70: 18, 56-66: 19, 51-55: 20) and no 2-replicate limit is tabulated.
const MAX_RANGE: Record<number, [number, number | null]> = {
  99: [5, null], 98: [6, null], 97: [7, 6], 96: [8, 6], 95: [9, 7], 94: [10, 8], 93: [10, 8], 92: [11, 9],
  91: [11, 9], 90: [12, 9], 89: [12, 10], 88: [13, 10], 87: [13, 11], 86: [14, 11], 85: [14, 11], 84: [14, 11],
  83: [15, 12], 82: [15, 12], 81: [15, 12], 80: [16, 13], 79: [16, 13], 78: [16, 13], 77: [17, 13], 76: [17, 13],
  75: [17, 14], 74: [17, 14], 73: [17, 14], 72: [18, 14], 71: [18, 14],
};

/**
 * Maximum tolerated range (percentage points) between the 100-seed replicates of one test,
 * 7 CFR 201.55, for an average germination in percent (rounded to a whole percent). Returns null
 * when the regulation's table has no value (2 replicates at 98-99% or below 71%).
 */
export function maxToleratedRange(averagePercent: number, replicates: 4 | 2 = 4): number | null {
  if (!(averagePercent >= 0 && averagePercent <= 100)) {
    throw new StatsError("INVALID_PROBABILITY", `The average germination must be a percentage from 0 to 100 (got ${averagePercent}).`);
  }
  if (replicates !== 4 && replicates !== 2) {
    throw new StatsError("INVALID_ARGUMENT", `The table covers tests of 4 or 2 replicates of 100 seeds (got ${replicates}).`);
  }
  let average = Math.round(averagePercent);
  if (average <= 50) average = 101 - average; // the table's low column: 2 pairs with 99, 50 with 51
  average = Math.min(average, 99); // 100% (or 0-1%) reads as the 99% row
  let limits = MAX_RANGE[average];
  if (!limits) limits = average >= 67 ? [18, null] : average >= 56 ? [19, null] : [20, null];
  return replicates === 4 ? limits[0] : limits[1];
}

/** Range check of one germination test's replicates (percent germinated in each 100-seed replicate). */
export function checkReplicateRange(replicatePercents: number[]): {
  average: number;
  range: number;
  maxRange: number | null;
  retestNeeded: boolean | null;
} {
  if (!Array.isArray(replicatePercents) || (replicatePercents.length !== 4 && replicatePercents.length !== 2)) {
    throw new StatsError("INVALID_ARGUMENT", "Give the germination percentages of 4 (or 2) replicates of 100 seeds.");
  }
  replicatePercents.forEach((value, i) => {
    if (typeof value !== "number" || !(value >= 0 && value <= 100)) {
      throw new StatsError("INVALID_COUNT", `Replicate ${i + 1} must be a percentage from 0 to 100 (got ${value}).`, { index: i, value });
    }
  });
  const average = replicatePercents.reduce((sum, x) => sum + x, 0) / replicatePercents.length;
  const range = Math.max(...replicatePercents) - Math.min(...replicatePercents);
  const maxRange = maxToleratedRange(average, replicatePercents.length as 4 | 2);
  return { average, range, maxRange, retestNeeded: maxRange === null ? null : range > maxRange };
}

/**
 * Tolerance (percentage points) allowed between a germination test and the label, 7 CFR 201.63,
 * looked up by the mean germination of test and label (rounded to a whole percent): >= 96: 5,
 * 90-95: 6, 80-89: 7, 70-79: 8, 60-69: 9, below 60: 10; 2 more when only 200 seeds were tested.
 */
export function labelTolerance(meanPercent: number, seedsTested = 400): number {
  if (!(meanPercent >= 0 && meanPercent <= 100)) {
    throw new StatsError("INVALID_PROBABILITY", `The mean germination must be a percentage from 0 to 100 (got ${meanPercent}).`);
  }
  if (!(seedsTested >= 200)) {
    throw new StatsError("INVALID_COUNT", `The tolerances apply to tests of at least 200 seeds (got ${seedsTested}).`);
  }
  const mean = Math.round(meanPercent);
  const base = mean >= 96 ? 5 : mean >= 90 ? 6 : mean >= 80 ? 7 : mean >= 70 ? 8 : mean >= 60 ? 9 : 10;
  return seedsTested < 400 ? base + 2 : base;
}

/** Whether a test result (percent) is within tolerance of the labelled germination (percent). */
export function checkAgainstLabel(
  testPercent: number,
  labelPercent: number,
  seedsTested = 400,
): { shortfall: number; tolerance: number; withinTolerance: boolean } {
  const tolerance = labelTolerance((testPercent + labelPercent) / 2, seedsTested);
  const shortfall = labelPercent - testPercent;
  return { shortfall, tolerance, withinTolerance: shortfall <= tolerance };
}
