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
import { cautionsFor, sheetColumns } from "@/lib/domain/design/cautions";
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
  const cautions = cautionsFor({ hasTreatedSeed: layout.hasTreatedSeed, plotUnit: layout.plotUnit, growingSetup: layout.growingSetup });
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
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Every plot at this site</caption>
            <thead className="border-b border-husk-200 text-loam-700">
              <tr>
                <th scope="col" className="py-2 pr-3">Plot</th>
                <th scope="col" className="py-2 pr-3">Block</th>
                <th scope="col" className="py-2 pr-3">Code</th>
                {layout.showKey && <th scope="col" className="py-2 pr-3">Variety (key)</th>}
                {layout.plotUnit !== "bed_row" && <th scope="col" className="py-2 pr-3">Flat / {layout.plotUnit === "insert" ? "insert" : "first cell"}</th>}
              </tr>
            </thead>
            <tbody>
              {layout.plots.map((p) => (
                <tr key={p.id} className="border-b border-husk-100">
                  <td className="py-1 pr-3">
                    <Link href={`/portal/plots/${p.id}`} className="font-mono">
                      {p.plotCode}
                    </Link>
                  </td>
                  <td className="py-1 pr-3">{p.block}</td>
                  <td className="py-1 pr-3 font-mono font-bold">{p.blindCode}</td>
                  {layout.showKey && <td className="py-1 pr-3">{p.variety}</td>}
                  {layout.plotUnit !== "bed_row" && (
                    <td className="py-1 pr-3">
                      {p.tray} / {p.traySlot}
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
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
