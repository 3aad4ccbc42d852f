import type { PackingRow } from "@/lib/domain/design/kits";
import type { Locale } from "@/lib/domain/vocabulary/enums";

// The one DTO every site printable is rendered from. Built by the route from a scoped query; it never
// carries variety names, so a printed sheet handed to a grower cannot unblind the trial.

export interface SheetPlot {
  id: number;
  plotCode: string;
  block: number;
  position: number;
  tray: number | null;
  traySlot: number | null;
  blindCode: string;
  /** the packet holds treated seed */
  treated: boolean;
}

export interface SiteSheetData {
  trialCode: string;
  trialTitle: string;
  crop: string;
  season: string;
  siteName: string;
  region: string;
  design: "rcbd" | "crd";
  blocks: number;
  plotUnit: "insert" | "cells" | "bed_row";
  plotSize: number;
  seedsPerCell: number;
  protocol: string | null;
  sownOn: string | null;
  randomSeed: number | null;
  plots: SheetPlot[];
  columns: { heading: string; when: string }[];
  cautions: { title: string; text: string }[];
  /** one row per blind code: lot, treated, seeds to count (lots only for staff) */
  packing: PackingRow[];
  /** Plot id -> PNG data URL of the QR code that opens the plot's page. */
  qrCodes?: Record<number, string>;
  /** Base address for the plot pages the QR codes open, e.g. https://seedplot.example. */
  appUrl: string;
  pageSize: "LETTER" | "A4";
  generatedOn: string;
  /** The language the sheet prints in: the site's printout language, else the reader's. */
  locale: Locale;
}
