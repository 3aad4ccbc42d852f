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

export const metadata: Metadata = { title: "Site layout" };

export default async function SiteLayoutPage({ params }: { params: Promise<{ trialId: string; siteId: string }> }) {
  const viewer = await requireUser();
  const raw = await params;
  const trialId = idParam.safeParse(raw.trialId);
  const siteId = idParam.safeParse(raw.siteId);
  if (!trialId.success || !siteId.success) notFound();
  const layout = await getSiteLayout(viewer, { trialId: trialId.data, siteId: siteId.data });
  if (!layout) notFound();
  const cautions = cautionsFor({ treatedCodes: treatedCodes(layout.entries), plotUnit: layout.plotUnit, growingSetup: layout.growingSetup });
  const columns = sheetColumns(layout.traits, (day) => (layout.sownOn ? formatDate(addDays(layout.sownOn, day)) : null));
  const pdf = (kind: string) => `/portal/trials/${layout.trialId}/sites/${layout.siteId}/sheets?kind=${kind}`;
  const mapName = layout.plotUnit === "bed_row" ? "Field map" : "Tray map";

  return (
    <div className="space-y-6">
      <p className="no-print text-sm">{layout.showKey ? <Link href={`/portal/trials/${layout.trialId}`}>← {layout.title}</Link> : <Link href="/portal">← Home</Link>}</p>
      <div>
        <h1 className="text-3xl font-bold">
          {mapName}: {layout.siteName}
        </h1>
        <p className="text-loam-700">
          {layout.title} (<span className="font-mono">{layout.code}</span>) · {layout.crop} · sowing {formatDate(layout.sownOn)} · layout seed{" "}
          <span className="font-mono">{layout.randomSeed ?? "—"}</span>
        </p>
      </div>

      {layout.plots.length > 0 && (
        <Card title="Print" className="no-print">
          <div className="flex flex-wrap gap-2">
            <a href={pdf("map")} className={buttonClasses("primary")}>
              {mapName} (PDF)
            </a>
            <a href={pdf("labels")} className={buttonClasses("secondary")}>
              Plot labels with QR codes (PDF)
            </a>
            <a href={pdf("sheet")} className={buttonClasses("secondary")}>
              Field data sheet (PDF)
            </a>
            {viewer.role !== "cooperator" && (
              <a href={pdf("packing")} className={buttonClasses("secondary")}>
                Kit packing list (PDF)
              </a>
            )}
            <PrintButton />
          </div>
          <p className="mt-2 text-sm text-loam-700">
            PDFs are US Letter; add <span className="font-mono">&amp;size=A4</span> to the address for A4.
          </p>
        </Card>
      )}

      <Card title="Where each code goes">
        <SiteMap layout={layout} />
      </Card>

      <Card title="Plots and what to record" className="break-before-page">
        <SitePlotsTable
          plots={layout.plots.map((p) => ({ id: p.id, plotCode: p.plotCode, block: p.block, blindCode: p.blindCode, tray: p.tray, traySlot: p.traySlot, variety: layout.showKey ? p.variety : null }))}
          showKey={layout.showKey}
          plotUnit={layout.plotUnit}
        />
        <h3 className="mt-4 font-semibold">Due on every plot</h3>
        <ul className="list-inside list-disc text-sm">
          {columns.map((c, i) => (
            <li key={i}>
              {c.heading}: {c.when}
            </li>
          ))}
        </ul>
      </Card>

      <Card title="Protocol and safety">
        {layout.protocol && <p className="mb-3 text-sm">{layout.protocol}</p>}
        <CautionList cautions={cautions} />
      </Card>
    </div>
  );
}
