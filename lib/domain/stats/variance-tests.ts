/**
 * Bartlett's test of equal variances (Bartlett 1937), on raw groups or on error variances that
 * come with their own df (e.g. the per-site error mean squares before a combined analysis).
 */
import { chiSquareUpper } from "./distributions";
import { StatsError } from "./errors";

/**
 * Bartlett's K^2 from variances with their degrees of freedom:
 * K^2 = [N ln(sp^2) - sum df_i ln s_i^2] / [1 + (sum 1/df_i - 1/N) / (3 (k - 1))], N = sum df_i.
 */
export function bartlettFromVariances(groups: { df: number; variance: number }[]): { statistic: number; df: number; p: number; pooledVariance: number } {
  if (!Array.isArray(groups) || groups.length < 2) {
    throw new StatsError("TOO_FEW_GROUPS", "Bartlett's test needs at least two groups.");
  }
  let totalDf = 0;
  let pooled = 0;
  let logSum = 0;
  let reciprocalSum = 0;
  groups.forEach(({ df, variance }, i) => {
    if (!(df > 0) || !Number.isFinite(df)) {
      throw new StatsError("NO_RESIDUAL_DF", `Group ${i + 1} has no degrees of freedom for its variance (it needs at least two values).`, {
        group: i,
      });
    }
    if (!Number.isFinite(variance)) {
      throw new StatsError("NON_FINITE_VALUE", `The variance of group ${i + 1} is not a finite number.`, { group: i });
    }
    if (!(variance > 0)) {
      throw new StatsError("NO_VARIATION", `Group ${i + 1} shows no variation (variance 0), so Bartlett's test is undefined.`, {
        group: i,
      });
    }
    totalDf += df;
    pooled += df * variance;
    logSum += df * Math.log(variance);
    reciprocalSum += 1 / df;
  });
  pooled /= totalDf;
  const k = groups.length;
  const statistic = (totalDf * Math.log(pooled) - logSum) / (1 + (reciprocalSum - 1 / totalDf) / (3 * (k - 1)));
  return { statistic, df: k - 1, p: chiSquareUpper(statistic, k - 1), pooledVariance: pooled };
}

/** Bartlett's test that groups of raw values (e.g. plots of each entry) share one variance. */
export function bartlett(groups: number[][]): { statistic: number; df: number; p: number } {
  if (!Array.isArray(groups)) throw new StatsError("INVALID_ARGUMENT", "Bartlett's test needs a list of groups of values.");
  const variances = groups.map((values, i) => {
    if (!Array.isArray(values) || values.length < 2) {
      throw new StatsError("NO_RESIDUAL_DF", `Group ${i + 1} has fewer than two values, so its variance cannot be estimated.`, { group: i });
    }
    values.forEach((value, j) => {
      if (typeof value !== "number" || !Number.isFinite(value)) {
        throw new StatsError("NON_FINITE_VALUE", `Value ${j + 1} of group ${i + 1} is not a finite number (got ${String(value)}).`, {
          group: i,
          index: j,
        });
      }
    });
    // two-pass around a shifted mean
    const reference = values[0];
    let sum = 0;
    for (const value of values) sum += value - reference;
    const mean = sum / values.length;
    let squares = 0;
    for (const value of values) squares += (value - reference - mean) ** 2;
    return { df: values.length - 1, variance: squares / (values.length - 1) };
  });
  const { statistic, df, p } = bartlettFromVariances(variances);
  return { statistic, df, p };
}
