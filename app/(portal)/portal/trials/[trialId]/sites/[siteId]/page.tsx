import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireUser } from "@/server/auth/guards";
import { getSiteLayout } from "@/db/queries/trials";
import { idParam } from "@/lib/validation/common";
import { Card } from "@/components/ui/card";
import { buttonClasses } from "@/components/ui/button";
import { PrintButton } from "@/components/ui/print-button";
import { CautionList, SiteMap } from "@/components/trials/site-layout-view";
import { SitePlotsTable } from "@/components/trials/site-plots-table";
import { cautionsFor, sheetColumns } from "@/lib/domain/design/cautions";
import { treatedCodes } from "@/lib/domain/design/kits";
import { addDays } from "@/lib/domain/schedule";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { getLocale } from "next-intl/server";
import { localeOr, translatorFor } from "@/lib/domain/i18n/catalogue";

export async function generateMetadata(): Promise<Metadata> {
  return { title: translatorFor(localeOr(await getLocale()))("siteLayout.title") };
}

export default async function SiteLayoutPage({ params }: { params: Promise<{ trialId: string; siteId: string }> }) {
  const viewer = await requireUser();
  const raw = await params;
  const trialId = idParam.safeParse(raw.trialId);
  const siteId = idParam.safeParse(raw.siteId);
  if (!trialId.success || !siteId.success) notFound();
  const layout = await getSiteLayout(viewer, { trialId: trialId.data, siteId: siteId.data });
  if (!layout) notFound();
  // In the reader's own language, as the printouts are (a grower reading Spanish gets this page in Spanish).
  const locale = localeOr(await getLocale());
  const t = translatorFor(locale);
  const cautions = cautionsFor({ treatedCodes: treatedCodes(layout.entries), plotUnit: layout.plotUnit, growingSetup: layout.growingSetup }, t);
  const columns = sheetColumns(layout.traits, (day) => (layout.sownOn ? formatDate(addDays(layout.sownOn, day), locale) : null), t);
  const pdf = (kind: string) => `/portal/trials/${layout.trialId}/sites/${layout.siteId}/sheets?kind=${kind}`;
  const mapName = layout.plotUnit === "bed_row" ? t("sheets.fieldMap") : t("sheets.trayMap");
  const mapWords = {
    noLayout: t("siteLayout.noLayout"),
    block: (block: number) => t("sheets.block", { block: String(block) }),
    flat: (tray: number) => t("sheets.flat", { tray: String(tray) }),
    insert: (n: number) => t("sheets.insert", { n: String(n) }),
    empty: t("sheets.empty"),
    insertOrder: t("siteLayout.insertOrder"),
  };
  const tableWords = {
    plot: t("sheets.colPlot"),
    block: t("sheets.colBlock"),
    code: t("sheets.colCode"),
    varietyKey: t("siteLayout.colVarietyKey"),
    flatInsert: t("siteLayout.colFlatInsert"),
    flatCell: t("siteLayout.colFlatCell"),
    caption: t("siteLayout.everyPlot"),
    filter: t("siteLayout.filterPlots"),
  };

  return (
    <div className="space-y-6">
      <p className="no-print text-sm">{layout.showKey ? <Link href={`/portal/trials/${layout.trialId}`}>← {layout.title}</Link> : <Link href="/portal">← {t("siteLayout.backHome")}</Link>}</p>
      <div>
        <h1 className="text-3xl font-bold">
          {mapName}: {layout.siteName}
        </h1>
        <p className="text-loam-700">
          {layout.title} (<span className="font-mono">{layout.code}</span>) · {layout.crop} · {t("siteLayout.sowing", { date: formatDate(layout.sownOn, locale) })} · {t("siteLayout.layoutSeed")}{" "}
          <span className="font-mono">{layout.randomSeed ?? "—"}</span>
        </p>
      </div>

      {layout.plots.length > 0 && (
        <Card title={t("siteLayout.print")} className="no-print">
          <div className="flex flex-wrap gap-2">
            <a href={pdf("map")} className={buttonClasses("primary")}>
              {t("siteLayout.mapPdf", { map: mapName })}
            </a>
            <a href={pdf("labels")} className={buttonClasses("secondary")}>
              {t("siteLayout.labelsPdf")}
            </a>
            <a href={pdf("sheet")} className={buttonClasses("secondary")}>
              {t("siteLayout.sheetPdf")}
            </a>
            {viewer.role !== "cooperator" && (
              <a href={pdf("packing")} className={buttonClasses("secondary")}>
                {t("siteLayout.packingPdf")}
              </a>
            )}
            <PrintButton>{t("siteLayout.printPage")}</PrintButton>
          </div>
          <p className="mt-2 text-sm text-loam-700">
            {t("siteLayout.paperSize", { param: "&size=A4" })}
          </p>
        </Card>
      )}

      <Card title={t("siteLayout.whereCodesGo")}>
        <SiteMap layout={layout} words={mapWords} />
      </Card>

      <Card title={t("siteLayout.plotsToRecord")} className="break-before-page">
        <SitePlotsTable
          plots={layout.plots.map((p) => ({ id: p.id, plotCode: p.plotCode, block: p.block, blindCode: p.blindCode, tray: p.tray, traySlot: p.traySlot, variety: layout.showKey ? p.variety : null }))}
          showKey={layout.showKey}
          plotUnit={layout.plotUnit}
          words={tableWords}
        />
        <h3 className="mt-4 font-semibold">{t("siteLayout.duePerPlot")}</h3>
        <ul className="list-inside list-disc text-sm">
          {columns.map((c, i) => (
            <li key={i}>
              {c.heading}: {c.when}
            </li>
          ))}
        </ul>
      </Card>

      <Card title={t("siteLayout.protocolSafety")}>
        {layout.protocol && <p className="mb-3 text-sm">{layout.protocol}</p>}
        <CautionList cautions={cautions} />
      </Card>
    </div>
  );
}
