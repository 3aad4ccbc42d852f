/**
 * How entries hold up across environments, from the table of entry means per environment (cell means
 * over blocks):
 * - Finlay & Wilkinson (1963): each entry's cell means regressed on the environment means; slope 1 is
 *   the average response, above 1 an entry that gains more than most at good sites; `deviationMs` is the
 *   residual mean square of that line (Eberhart & Russell 1966), the scatter the slope leaves unexplained.
 * - Wricke's (1962) ecovalence: the entry's share of the entry x environment sum of squares.
 * - Shukla's (1972) stability variance: the entry's own variance of the interaction.
 * - GGE (Yan et al. 2000): singular value decomposition of the table centred by environment, with
 *   entry and environment scores on the first two components in symmetric scaling (u sqrt(d), v sqrt(d)).
 *   A component's sign is arbitrary (a whole component may flip).
 */
import { StatsError } from "./errors";
import { svd } from "./svd";

export interface CellMean {
  environment: string;
  entry: string;
  mean: number;
}

export interface EntryStability {
  entry: string;
  mean: number;
  slope: number;
  slopeSe: number;
  deviationMs: number;
  ecovalence: number;
  shuklaVariance: number;
}

export interface GgeResult {
  singularValues: number[];
  /** share of the centred table's sum of squares each component explains (sums to 1) */
  explained: number[];
  entryScores: { entry: string; pc1: number; pc2: number }[];
  environmentScores: { environment: string; pc1: number; pc2: number }[];
}

export interface StabilityResult {
  entries: EntryStability[];
  gge: GgeResult;
}

/** Fewest environments and entries: Shukla's variance divides by (entries - 2) and a line's scatter has (environments - 2) df. */
export const STABILITY_MIN_ENVIRONMENTS = 3;
export const STABILITY_MIN_ENTRIES = 3;

/** Stability statistics of every entry; entries and environments keep their order of first appearance. */
export function stability(cellMeans: CellMean[]): StabilityResult {
  const { entries, environments, table } = cellTable(cellMeans);
  const p = entries.length;
  const q = environments.length;
  const entryMeans = table.map((row) => row.reduce((s, x) => s + x, 0) / q);
  const envMeans = environments.map((_, j) => table.reduce((s, row) => s + row[j]!, 0) / p);
  const grand = envMeans.reduce((s, x) => s + x, 0) / q;
  const envCentred = envMeans.map((m) => m - grand);
  const sxx = envCentred.reduce((s, x) => s + x * x, 0);
  if (!(sxx > 0)) {
    throw new StatsError("NO_VARIATION", "Every site has the same mean, so there is nothing to measure each variety's response against.", {});
  }

  const ecovalence = table.map((row, i) => row.reduce((s, x, j) => s + (x - entryMeans[i]! - envMeans[j]! + grand) ** 2, 0));
  const totalW = ecovalence.reduce((s, w) => s + w, 0);
  const rows: EntryStability[] = table.map((row, i) => {
    const sxy = row.reduce((s, x, j) => s + (x - entryMeans[i]!) * envCentred[j]!, 0);
    const slope = sxy / sxx;
    const residualSs = row.reduce((s, x, j) => s + (x - entryMeans[i]! - slope * envCentred[j]!) ** 2, 0);
    const deviationMs = residualSs / (q - 2);
    return {
      entry: entries[i]!,
      mean: entryMeans[i]!,
      slope,
      slopeSe: Math.sqrt(deviationMs / sxx),
      deviationMs,
      ecovalence: ecovalence[i]!,
      shuklaVariance: (p / ((p - 2) * (q - 1))) * ecovalence[i]! - totalW / ((p - 1) * (p - 2) * (q - 1)),
    };
  });

  const centred = table.map((row) => row.map((x, j) => x - envMeans[j]!));
  const { d, u, v } = svd(centred);
  const sumSquares = d.reduce((s, x) => s + x * x, 0);
  if (!(sumSquares > 0)) {
    throw new StatsError("NO_VARIATION", "Every variety has the same mean at every site, so there is no pattern to draw.", {});
  }
  const scale = [Math.sqrt(d[0]!), Math.sqrt(d[1]!)];
  return {
    entries: rows,
    gge: {
      singularValues: d,
      explained: d.map((x) => (x * x) / sumSquares),
      entryScores: entries.map((entry, i) => ({ entry, pc1: u[0]![i]! * scale[0]!, pc2: u[1]![i]! * scale[1]! })),
      environmentScores: environments.map((environment, j) => ({ environment, pc1: v[0]![j]! * scale[0]!, pc2: v[1]![j]! * scale[1]! })),
    },
  };
}

/** The entries x environments table, refusing a table with gaps, repeats or non-numbers. */
function cellTable(cellMeans: CellMean[]) {
  const entries: string[] = [];
  const environments: string[] = [];
  const entryIndex = new Map<string, number>();
  const envIndex = new Map<string, number>();
  for (const c of cellMeans) {
    if (typeof c.entry !== "string" || c.entry === "" || typeof c.environment !== "string" || c.environment === "") {
      throw new StatsError("INVALID_LABEL", "Every mean needs a variety and a site.", { cell: c });
    }
    if (!Number.isFinite(c.mean)) {
      throw new StatsError("NON_FINITE_VALUE", `The mean of ${c.entry} at ${c.environment} is not a number (${c.mean}).`, { entry: c.entry, environment: c.environment, value: c.mean });
    }
    if (!entryIndex.has(c.entry)) entryIndex.set(c.entry, entries.push(c.entry) - 1);
    if (!envIndex.has(c.environment)) envIndex.set(c.environment, environments.push(c.environment) - 1);
  }
  if (environments.length < STABILITY_MIN_ENVIRONMENTS) {
    throw new StatsError("TOO_FEW_GROUPS", `Stability needs at least ${STABILITY_MIN_ENVIRONMENTS} sites (there ${environments.length === 1 ? "is" : "are"} ${environments.length}): with fewer, each variety's line fits its points exactly and says nothing of its steadiness.`, { environments: environments.length });
  }
  if (entries.length < STABILITY_MIN_ENTRIES) {
    throw new StatsError("TOO_FEW_ENTRIES", `Stability needs at least ${STABILITY_MIN_ENTRIES} varieties (there ${entries.length === 1 ? "is" : "are"} ${entries.length}) to tell one variety's changes from the others'.`, { entries: entries.length });
  }
  const table = entries.map(() => environments.map(() => Number.NaN));
  for (const c of cellMeans) {
    const i = entryIndex.get(c.entry)!;
    const j = envIndex.get(c.environment)!;
    if (!Number.isNaN(table[i]![j]!)) {
      throw new StatsError("TABLE_SHAPE", `${c.entry} has more than one mean at ${c.environment}; give one mean per variety and site.`, { entry: c.entry, environment: c.environment });
    }
    table[i]![j] = c.mean;
  }
  for (let i = 0; i < entries.length; i++) {
    const gaps = environments.filter((_, j) => Number.isNaN(table[i]![j]!));
    if (gaps.length > 0) {
      throw new StatsError("EMPTY_TABLE_ROW", `${entries[i]} has no mean at ${gaps.join(", ")}; stability compares every variety at every site, so leave out that site or variety.`, { entry: entries[i], environments: gaps });
    }
  }
  return { entries, environments, table };
}
