import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import type { PlotUnit, TrialDesign } from "@/lib/domain/vocabulary/enums";
import { plotCode, randomiseBlocks, randomiseCompletely } from "./randomise";
import { cellsPerPlot, insertNumber, packTrays } from "./trays";

export interface SitePlot {
  block: number;
  position: number;
  /** Index into the trial's entries in entry-number order. */
  entryIndex: number;
  plotCode: string;
  /** Flat number, or null for bed rows. */
  tray: number | null;
  /** Insert (1-12) for insert plots, first cell (1-72) for cell plots, null for bed rows. */
  traySlot: number | null;
}

/**
 * One site's whole layout from its stored seed: the randomisation, the plot codes and the flats.
 * The app's randomise action and the demo seed both call this, so a stored seed always reproduces
 * exactly the plots the app would lay out. `siteNumber` is the site's place in the trial's enrolment order.
 */
export function siteLayout(p: { design: TrialDesign; blocks: number; plotUnit: PlotUnit; plotSize: number; entryCount: number; seed: number; siteNumber: number }): SitePlot[] {
  const placements =
    p.design === "crd"
      ? randomiseCompletely({ entryCount: p.entryCount, replicates: p.blocks, seed: p.seed })
      : randomiseBlocks({ entryCount: p.entryCount, blocks: p.blocks, seed: p.seed });
  const cells = cellsPerPlot(p.plotUnit, p.plotSize);
  const blockNumbers = [...new Set(placements.map((pl) => pl.block))];
  // packTrays answers block by block in the same order the placements come in.
  const trays = cells === null ? null : packTrays({ blockSizes: blockNumbers.map((b) => placements.filter((pl) => pl.block === b).length), cellsPerPlot: cells }).flat();
  return placements.map((pl, i) => {
    const tray = trays ? trays[i]! : null;
    return {
      block: pl.block,
      position: pl.position,
      entryIndex: pl.entryIndex,
      plotCode: plotCode(p.siteNumber, pl.block, pl.position),
      tray: tray ? tray.tray : null,
      traySlot: tray ? (p.plotUnit === "insert" ? insertNumber(tray.firstCell) : tray.firstCell) : null,
    };
  });
}

/**
 * Where a plot sits, in the one wording every screen and printout uses: "Flat 2, insert 3" for six-cell
 * inserts, "Flat 2, cells 13–18" for cell plots, "position 5" along a bed row.
 */
export function plotPlace(plotUnit: "insert" | "cells" | "bed_row", p: { tray: number | null; traySlot: number | null; position: number }, plotSize = 1, t: Translator = translatorFor()): string {
  if (p.tray === null || p.traySlot === null) return t("places.position", { position: String(p.position) });
  const at = { tray: String(p.tray), slot: String(p.traySlot) };
  if (plotUnit === "insert") return t("places.insert", at);
  return plotSize > 1 ? t("places.cells", { tray: at.tray, from: at.slot, to: String(p.traySlot + plotSize - 1) }) : t("places.cell", at);
}
