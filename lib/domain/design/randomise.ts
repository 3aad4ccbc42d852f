import { seededRandom, shuffled } from "./random";

export interface PlotPlacement {
  block: number; // 1-based
  position: number; // 1-based order within the block (layout order)
  entryIndex: number; // index into the trial's entry list
}

/**
 * Randomised complete blocks: every entry once per block, in an independent random order per block,
 * reproducible from `seed`. Sites get different seeds, so each site has its own layout.
 */
export function randomiseBlocks(p: { entryCount: number; blocks: number; seed: number }): PlotPlacement[] {
  const random = seededRandom(p.seed);
  const indices = Array.from({ length: p.entryCount }, (_, i) => i);
  const plots: PlotPlacement[] = [];
  for (let block = 1; block <= p.blocks; block += 1) {
    shuffled(indices, random).forEach((entryIndex, i) => plots.push({ block, position: i + 1, entryIndex }));
  }
  return plots;
}

/** Plot code shown on labels and sheets: site number, block and position, e.g. "S03-2-04". */
export function plotCode(siteNumber: number, block: number, position: number): string {
  return `S${String(siteNumber).padStart(2, "0")}-${block}-${String(position).padStart(2, "0")}`;
}

/**
 * Completely randomised design (e.g. a germination-chamber test): `replicates` copies of every entry in one
 * random order with no blocking. Stored as block 1 so the layout order is still a single sequence.
 */
export function randomiseCompletely(p: { entryCount: number; replicates: number; seed: number }): PlotPlacement[] {
  const random = seededRandom(p.seed);
  const all: number[] = [];
  for (let r = 0; r < p.replicates; r += 1) for (let e = 0; e < p.entryCount; e += 1) all.push(e);
  return shuffled(all, random).map((entryIndex, i) => ({ block: 1, position: i + 1, entryIndex }));
}
