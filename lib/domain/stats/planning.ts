/**
 * Planning a randomised complete block trial over sites: the power of one pairwise comparison of
 * entry means, from the CV a past trial reached. The error is the plot-to-plot error (sigma = CV x
 * mean), the error df those of the pooled within-site RCBD error, sites x (entries - 1) x (blocks - 1),
 * and the test a two-sided t test of a difference of two means over blocks x sites plots each.
 * Power is the noncentral t probability beyond either critical value (Cohen 1988, ch. 2).
 */
import { StatsError } from "./errors";
import { studentTQuantile } from "./distributions";
import { noncentralTCdf } from "./noncentral-t";

export interface TrialPlanInput {
  /** coefficient of variation, % of the mean */
  cv: number;
  mean: number;
  /** the difference between two entries worth detecting, in the trait's unit */
  difference: number;
  entries: number;
  blocks: number;
  sites: number;
  /** two-sided significance level; 0.05 when not given */
  alpha?: number;
}

export interface TrialPlan {
  errorDf: number;
  seDifference: number;
  tCritical: number;
  power: number;
  /** least significant difference at alpha for this design */
  lsd: number;
  /** fewest blocks (2 to PLANNING_MAX_BLOCKS) per site giving 80% power; null when none does */
  blocksForPower80: number | null;
}

/** Power a plan aims for: the usual 80% (Cohen 1988). */
export const TARGET_POWER = 0.8;
/** The most blocks per site the search tries; no on-farm trial lays out more (common practice). */
export const PLANNING_MAX_BLOCKS = 50;

function requireCount(name: string, value: number, min: number, words: string): void {
  if (!Number.isInteger(value) || value < min) {
    throw new StatsError("INVALID_ARGUMENT", `${words} (got ${value}).`, { [name]: value });
  }
}

function requirePositive(name: string, value: number, words: string): void {
  if (!Number.isFinite(value) || !(value > 0)) {
    throw new StatsError(Number.isFinite(value) ? "INVALID_ARGUMENT" : "NON_FINITE_VALUE", `${words} (got ${value}).`, { [name]: value });
  }
}

/** Power, LSD and the fewest blocks reaching 80% power for a trial of this size. */
export function planTrial(p: TrialPlanInput): TrialPlan {
  const alpha = p.alpha ?? 0.05;
  requirePositive("cv", p.cv, "The CV must be a number above 0%");
  requirePositive("mean", p.mean, "The expected mean must be a number above 0");
  requirePositive("difference", p.difference, "The difference worth detecting must be a number above 0");
  requireCount("entries", p.entries, 2, "A comparison needs at least 2 entries");
  requireCount("blocks", p.blocks, 2, "A trial needs at least 2 blocks per site to measure plot-to-plot error");
  requireCount("sites", p.sites, 1, "A trial needs at least 1 site");
  if (!(alpha > 0 && alpha < 1)) throw new StatsError("INVALID_PROBABILITY", `The significance level must be between 0 and 1 (got ${alpha}).`, { alpha });
  const sigma = (p.cv / 100) * p.mean;
  const at = (blocks: number) => {
    const errorDf = p.sites * (p.entries - 1) * (blocks - 1);
    const seDifference = sigma * Math.sqrt(2 / (blocks * p.sites));
    const tCritical = studentTQuantile(1 - alpha / 2, errorDf);
    const ncp = p.difference / seDifference;
    const power = 1 - noncentralTCdf(tCritical, errorDf, ncp) + noncentralTCdf(-tCritical, errorDf, ncp);
    return { errorDf, seDifference, tCritical, power };
  };
  const plan = at(p.blocks);
  let blocksForPower80: number | null = null;
  for (let blocks = 2; blocks <= PLANNING_MAX_BLOCKS; blocks++) {
    if (at(blocks).power >= TARGET_POWER) {
      blocksForPower80 = blocks;
      break;
    }
  }
  return { ...plan, lsd: plan.tCritical * plan.seDifference, blocksForPower80 };
}
