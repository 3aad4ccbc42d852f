/**
 * Germination and emergence from plots with seeds sown and seedlings emerged: percentages with
 * Wilson intervals, homogeneity across entries (pooled and stratified by site), fit to the
 * labelled germination, and emergence kinetics from dated stand counts.
 */
import { chiSquareGoodnessOfFit, chiSquareIndependence, cochranMantelHaenszel } from "./chi-square";
import { normalQuantile } from "./distributions";
import { StatsError } from "./errors";

export interface GerminationPlot {
  entry: string;
  site?: string;
  sown: number;
  emerged: number;
}

function validatePlot(plot: GerminationPlot, index: number): void {
  const { sown, emerged } = plot ?? ({} as GerminationPlot);
  for (const [name, value] of [
    ["sown", sown],
    ["emerged", emerged],
  ] as const) {
    if (typeof value !== "number" || !Number.isFinite(value)) {
      throw new StatsError("NON_FINITE_VALUE", `Plot ${index + 1}: the number ${name} is not a finite number (got ${String(value)}).`, {
        index,
      });
    }
    if (value < 0 || !Number.isInteger(value)) {
      throw new StatsError("INVALID_COUNT", `Plot ${index + 1}: the number ${name} must be a whole number of zero or more (got ${value}).`, {
        index,
      });
    }
  }
  if (sown === 0) throw new StatsError("INVALID_COUNT", `Plot ${index + 1}: no seeds were sown.`, { index });
  if (emerged > sown) {
    throw new StatsError("EMERGED_EXCEEDS_SOWN", `Plot ${index + 1}: ${emerged} seedlings emerged from only ${sown} seeds sown.`, {
      index,
      sown,
      emerged,
    });
  }
  if (typeof plot.entry !== "string" || plot.entry.trim() === "") {
    throw new StatsError("INVALID_LABEL", `Plot ${index + 1} needs an entry name.`, { index });
  }
}

/**
 * Wilson score interval (Wilson 1927, J. Am. Stat. Assoc. 22, 209-212) for a proportion, as
 * fractions 0-1. Better coverage than the plain +-z*SE interval near 0% and 100% germination.
 */
export function wilsonInterval(successes: number, trials: number, confidence = 0.95): { lower: number; upper: number } {
  if (!(trials > 0) || !(successes >= 0) || successes > trials) {
    throw new StatsError("INVALID_COUNT", `A proportion needs 0 <= successes <= trials and trials > 0 (got ${successes} of ${trials}).`);
  }
  if (!(confidence > 0 && confidence < 1)) {
    throw new StatsError("INVALID_PROBABILITY", `The confidence level must be between 0 and 1 (got ${confidence}).`);
  }
  const z = normalQuantile(1 - (1 - confidence) / 2);
  const z2 = z * z;
  const p = successes / trials;
  const denominator = 1 + z2 / trials;
  const centre = (p + z2 / (2 * trials)) / denominator;
  const half = (z / denominator) * Math.sqrt((p * (1 - p)) / trials + z2 / (4 * trials * trials));
  // the bounds are exactly 0 and 1 at the extremes; the formula would leave rounding dust there
  return {
    lower: successes === 0 ? 0 : Math.max(0, centre - half),
    upper: successes === trials ? 1 : Math.min(1, centre + half),
  };
}

/** Germination % per entry (pooled over plots and sites) with a Wilson interval, in percent. */
export function germinationByEntry(
  plots: GerminationPlot[],
  confidence = 0.95,
): { entry: string; sown: number; emerged: number; percent: number; lower: number; upper: number }[] {
  const totals = poolByEntry(plots);
  return [...totals].map(([entry, { sown, emerged }]) => {
    const interval = wilsonInterval(emerged, sown, confidence);
    return { entry, sown, emerged, percent: (100 * emerged) / sown, lower: 100 * interval.lower, upper: 100 * interval.upper };
  });
}

function poolByEntry(plots: GerminationPlot[]): Map<string, { sown: number; emerged: number }> {
  if (!Array.isArray(plots) || plots.length === 0) {
    throw new StatsError("INVALID_ARGUMENT", "Give at least one plot with seeds sown and seedlings emerged.");
  }
  const totals = new Map<string, { sown: number; emerged: number }>();
  plots.forEach((plot, i) => {
    validatePlot(plot, i);
    const total = totals.get(plot.entry) ?? { sown: 0, emerged: 0 };
    total.sown += plot.sown;
    total.emerged += plot.emerged;
    totals.set(plot.entry, total);
  });
  return totals;
}

/**
 * Chi-square test that germination is the same for all entries: entries x (emerged, not emerged),
 * pooled over sites. Yates' correction applies with exactly two entries unless correct = false.
 */
export function germinationHomogeneity(plots: GerminationPlot[], opts: { correct?: boolean } = {}) {
  const totals = poolByEntry(plots);
  if (totals.size < 2) throw new StatsError("TOO_FEW_ENTRIES", "Comparing germination needs at least two entries.");
  const table = [...totals.values()].map(({ sown, emerged }) => [emerged, sown - emerged]);
  return { entries: [...totals.keys()], ...chiSquareIndependence(table, opts) };
}

/**
 * The same comparison stratified by site (Cochran-Mantel-Haenszel): do entries differ in
 * germination once site-to-site differences are allowed for? Plots without a site form one stratum.
 */
export function germinationHomogeneityBySite(plots: GerminationPlot[], opts: { correct?: boolean } = {}) {
  const totals = poolByEntry(plots);
  const entries = [...totals.keys()];
  if (entries.length < 2) throw new StatsError("TOO_FEW_ENTRIES", "Comparing germination needs at least two entries.");
  const sites = new Map<string, number[][]>();
  for (const plot of plots) {
    const site = plot.site ?? "";
    let table = sites.get(site);
    if (!table) {
      table = entries.map(() => [0, 0]);
      sites.set(site, table);
    }
    const row = table[entries.indexOf(plot.entry)];
    row[0] += plot.emerged;
    row[1] += plot.sown - plot.emerged;
  }
  return { entries, sites: [...sites.keys()], ...cochranMantelHaenszel([...sites.values()], opts) };
}

/**
 * Goodness of fit of emerged / not emerged to the germination % on the seed label. Returns null
 * when the label states no germination ("not stated" is normal for small vegetable packets).
 */
export function germinationVersusLabel(emerged: number, sown: number, labelPercent: number | null) {
  validatePlot({ entry: "label check", sown, emerged }, 0);
  if (labelPercent === null) return null;
  if (!(labelPercent > 0 && labelPercent < 100)) {
    throw new StatsError("INVALID_PROBABILITY", `The labelled germination must be between 0 and 100% exclusive (got ${labelPercent}).`);
  }
  const rate = labelPercent / 100;
  return chiSquareGoodnessOfFit([emerged, sown - emerged], [rate, 1 - rate]);
}

/**
 * Emergence kinetics from dated stand counts: `counts` are cumulative seedlings standing on each
 * day after sowing (day 0 = sowing, with none emerged). Returns final emergence in percent of
 * seeds sown, mean emergence time in days and T50 in days (null when nothing emerged).
 * Mean emergence time = sum(n_i t_i) / sum(n_i), n_i = seedlings new at count i (Ellis & Roberts
 * 1980, "Towards a rational basis for testing seed quality", in Hebblethwaite (ed.), Seed
 * Production, Butterworths, London, 605-635). T50 = t_i + (N/2 - n_i)(t_j - t_i) / (n_j - n_i),
 * N = final count, n_i < N/2 <= n_j cumulative counts at adjacent days t_i < t_j (Coolbear,
 * Francis & Grierson 1984, J. Exp. Bot. 35, 1609-1617; form of Farooq et al. 2005, J. Integr.
 * Plant Biol. 47, 187-193).
 */
export function emergenceKinetics(
  counts: { day: number; emerged: number }[],
  sown: number,
): { finalPercent: number; meanEmergenceTime: number | null; t50: number | null } {
  if (!(Number.isInteger(sown) && sown > 0)) {
    throw new StatsError("INVALID_COUNT", `The number of seeds sown must be a whole number above zero (got ${sown}).`);
  }
  if (!Array.isArray(counts) || counts.length === 0) {
    throw new StatsError("INVALID_ARGUMENT", "Give at least one dated stand count.");
  }
  let previousDay = 0;
  let previousCount = 0;
  let weightedDays = 0;
  counts.forEach(({ day, emerged }, i) => {
    if (!Number.isFinite(day) || day <= previousDay) {
      throw new StatsError("INVALID_ARGUMENT", `Count ${i + 1}: days after sowing must be positive and increasing (got ${day}).`, { index: i });
    }
    if (!Number.isInteger(emerged) || emerged < 0) {
      throw new StatsError("INVALID_COUNT", `Count ${i + 1}: seedlings must be a whole number of zero or more (got ${emerged}).`, { index: i });
    }
    if (emerged > sown) {
      throw new StatsError("EMERGED_EXCEEDS_SOWN", `Count ${i + 1}: ${emerged} seedlings counted from only ${sown} seeds sown.`, { index: i });
    }
    if (emerged < previousCount) {
      throw new StatsError(
        "INVALID_COUNT",
        `Count ${i + 1}: the stand fell from ${previousCount} to ${emerged}; emergence kinetics need cumulative counts.`,
        { index: i },
      );
    }
    weightedDays += (emerged - previousCount) * day;
    previousDay = day;
    previousCount = emerged;
  });
  const final = previousCount;
  if (final === 0) return { finalPercent: 0, meanEmergenceTime: null, t50: null };
  const half = final / 2;
  let t50: number | null = null;
  let lastDay = 0;
  let lastCount = 0;
  for (const { day, emerged } of counts) {
    if (emerged >= half) {
      t50 = lastDay + ((half - lastCount) * (day - lastDay)) / (emerged - lastCount);
      break;
    }
    lastDay = day;
    lastCount = emerged;
  }
  return { finalPercent: (100 * final) / sown, meanEmergenceTime: weightedDays / final, t50 };
}
