import "server-only";
import QRCode from "qrcode";
import type { SiteLayout } from "@/db/queries/trials";
import type { SiteSheetData } from "@/reports/shared/sheet-data";
import { cautionsFor, sheetColumns } from "@/lib/domain/design/cautions";
import { packingList, treatedCodes } from "@/lib/domain/design/kits";
import { addDays, todayIso } from "@/lib/domain/schedule";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import type { Locale } from "@/lib/domain/vocabulary/enums";

/** The address a plot label's QR code opens. */
export const plotPageUrl = (appUrl: string, plotId: number) => `${appUrl.replace(/\/$/, "")}/portal/plots/${plotId}`;

/**
 * Turns a scoped site layout into the printable DTO. Variety names are dropped here whatever the viewer
 * may see, because printed sheets travel to growers. QR codes are only drawn for labels.
 */
export async function buildSiteSheetData(layout: SiteLayout, opts: { appUrl: string; pageSize: "LETTER" | "A4"; withQr: boolean; today?: string; locale?: Locale }): Promise<SiteSheetData> {
  const locale = opts.locale ?? "en";
  const t = translatorFor(locale);
  const qrCodes: Record<number, string> = {};
  if (opts.withQr) {
    for (const p of layout.plots) qrCodes[p.id] = await QRCode.toDataURL(plotPageUrl(opts.appUrl, p.id), { errorCorrectionLevel: "M", margin: 1, width: 240 });
  }
  return {
    trialCode: layout.code,
    trialTitle: layout.title,
    crop: layout.crop,
    season: layout.season,
    siteName: layout.siteName,
    region: layout.region,
    design: layout.design,
    blocks: layout.blocks,
    plotUnit: layout.plotUnit,
    plotSize: layout.plotSize,
    seedsPerCell: layout.seedsPerCell,
    protocol: layout.protocol,
    sownOn: layout.sownOn ? formatDate(layout.sownOn, locale) : null,
    randomSeed: layout.randomSeed,
    plots: layout.plots.map(({ id, plotCode, block, position, tray, traySlot, blindCode, treated }) => ({ id, plotCode, block, position, tray, traySlot, blindCode, treated })),
    packing: packingList(layout.plots, layout.entries, layout),
    columns: sheetColumns(layout.traits, (day) => (layout.sownOn ? formatDate(addDays(layout.sownOn, day), locale) : null), t).map(({ heading, when }) => ({ heading, when })),
    cautions: cautionsFor({ treatedCodes: treatedCodes(layout.entries), plotUnit: layout.plotUnit, growingSetup: layout.growingSetup }, t),
    qrCodes,
    appUrl: opts.appUrl,
    pageSize: opts.pageSize,
    generatedOn: formatDate(opts.today ?? todayIso(), locale),
    locale,
  };
}
