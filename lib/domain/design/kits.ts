/**
 * What goes into one site's seed kit: per blind code, the seed lot, whether it is treated, and how many
 * seeds to count out. Counting a spare share guards against a dropped or dud seed leaving a cell empty.
 */
import type { PlotUnit } from "@/lib/domain/vocabulary/enums";

/** Spare seed packed on top of what the plots need (20%, at least 2 seeds): common practice. */
export const SPARE_SHARE = 0.2;
export const MIN_SPARE_SEEDS = 2;

export interface KitEntry {
  blindCode: string;
  treated: boolean;
  /** "Source · lot code", for the packer; null when no lot is chosen yet */
  lot: string | null;
}

export interface PackingRow extends KitEntry {
  plots: number;
  seedsPerPlot: number;
  seedsNeeded: number;
  spares: number;
  seedsToCount: number;
}

/** Seeds one plot takes: cells (or plant stations in a bed row) times seeds sown in each. */
export function seedsPerPlot(trial: { plotUnit: PlotUnit; plotSize: number; seedsPerCell: number }): number {
  const stations = trial.plotUnit === "insert" ? 6 : trial.plotSize;
  return stations * trial.seedsPerCell;
}

/** One packing row per blind code laid out at the site, in code order. */
export function packingList(
  plots: readonly { blindCode: string }[],
  entries: readonly KitEntry[],
  trial: { plotUnit: PlotUnit; plotSize: number; seedsPerCell: number },
): PackingRow[] {
  const perPlot = seedsPerPlot(trial);
  const plotsByCode = new Map<string, number>();
  for (const p of plots) plotsByCode.set(p.blindCode, (plotsByCode.get(p.blindCode) ?? 0) + 1);
  return entries
    .filter((e) => plotsByCode.has(e.blindCode))
    .sort((a, b) => (a.blindCode < b.blindCode ? -1 : a.blindCode > b.blindCode ? 1 : 0))
    .map((e) => {
      const plotCount = plotsByCode.get(e.blindCode)!;
      const seedsNeeded = plotCount * perPlot;
      const spares = Math.max(MIN_SPARE_SEEDS, Math.ceil(seedsNeeded * SPARE_SHARE));
      return { ...e, plots: plotCount, seedsPerPlot: perPlot, seedsNeeded, spares, seedsToCount: seedsNeeded + spares };
    });
}

/** The blind codes whose packets hold treated seed, in code order. */
export function treatedCodes(entries: readonly KitEntry[]): string[] {
  return entries.filter((e) => e.treated).map((e) => e.blindCode).sort();
}
