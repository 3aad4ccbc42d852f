// Lays randomised plots onto physical seed trays. A standard 1020 flat holds twelve six-cell inserts,
// 72 cells (common practice); the cell counts are parameters so other flats can be described later.

export const CELLS_PER_FLAT = 72;
export const CELLS_PER_INSERT = 6;

export interface TrayPlacement {
  /** 1-based flat number at this site. */
  tray: number;
  /** 1-based first cell of the plot within its flat (cells numbered row by row). */
  firstCell: number;
  cells: number;
}

/**
 * Packs blocks onto flats in layout order. A block that fits in one flat never straddles two: when it does
 * not fit in what is left of the current flat, it starts a fresh one (the gap stays empty, which is cheaper
 * than a block split across trays that may sit under different lights). A block larger than a flat spills
 * over, but no single plot is ever split.
 *
 * `blockSizes[i]` is the number of plots in block i; returns one placement per plot, block by block.
 */
export function packTrays(p: { blockSizes: number[]; cellsPerPlot: number; cellsPerFlat?: number }): TrayPlacement[][] {
  const cellsPerFlat = p.cellsPerFlat ?? CELLS_PER_FLAT;
  if (!Number.isInteger(p.cellsPerPlot) || p.cellsPerPlot < 1) throw new RangeError("A plot needs at least one cell.");
  if (p.cellsPerPlot > cellsPerFlat) throw new RangeError(`A plot of ${p.cellsPerPlot} cells does not fit in a ${cellsPerFlat}-cell flat.`);
  let tray = 1;
  let used = 0;
  return p.blockSizes.map((plotsInBlock) => {
    const blockCells = plotsInBlock * p.cellsPerPlot;
    if (used > 0 && blockCells <= cellsPerFlat && used + blockCells > cellsPerFlat) {
      tray += 1;
      used = 0;
    }
    const placements: TrayPlacement[] = [];
    for (let i = 0; i < plotsInBlock; i += 1) {
      if (used + p.cellsPerPlot > cellsPerFlat) {
        tray += 1;
        used = 0;
      }
      placements.push({ tray, firstCell: used + 1, cells: p.cellsPerPlot });
      used += p.cellsPerPlot;
    }
    return placements;
  });
}

/** Cells one plot takes on a tray, or null when the plot unit is not grown in trays. */
export function cellsPerPlot(plotUnit: "insert" | "cells" | "bed_row", plotSize: number): number | null {
  if (plotUnit === "insert") return CELLS_PER_INSERT;
  if (plotUnit === "cells") return plotSize;
  return null;
}

/** For insert plots, the 1-based insert number (1-12) a first cell falls in. */
export const insertNumber = (firstCell: number, cellsPerInsert = CELLS_PER_INSERT) => Math.floor((firstCell - 1) / cellsPerInsert) + 1;

/** The flat count a layout needs. */
export const flatsUsed = (placements: TrayPlacement[][]) => placements.flat().reduce((max, p) => Math.max(max, p.tray), 0);
