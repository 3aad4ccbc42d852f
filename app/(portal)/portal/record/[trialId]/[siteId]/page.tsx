import Link from "next/link";
import { notFound } from "next/navigation";
import { requireUser } from "@/server/auth/guards";
import { getRecordingSheet, packetChecksForViewer } from "@/server/observations/sheet";
import { idParam } from "@/lib/validation/common";
import { EntryForm } from "@/components/record/entry-form";
import { DuePanel, lockMessage, SiteHeader } from "@/components/record/site-panels";
import { displayValue } from "@/lib/domain/observations/values";
import type { MissingReason } from "@/lib/domain/observations/missing";
import { buttonClasses } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { SubmitForReviewForm } from "@/components/review/review-forms";
import { PhotoForm } from "@/components/record/photo-form";
import { RemovePhoto } from "@/components/record/remove-photo";
import { listSitePhotos } from "@/db/queries/photos";
import { KeepReadyOffline } from "@/components/offline/offline-setup";
import { offlineUrlsForSite } from "@/lib/domain/offline";
import { getTranslations } from "next-intl/server";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

export const dynamic = "force-dynamic";

export default async function RecordSitePage({ params, searchParams }: { params: Promise<{ trialId: string; siteId: string }>; searchParams: Promise<{ plot?: string }> }) {
  const viewer = await requireUser();
  const p = await params;
  const trialId = idParam.safeParse(p.trialId);
  const siteId = idParam.safeParse(p.siteId);
  if (!trialId.success || !siteId.success) notFound();
  const sheet = await getRecordingSheet(viewer, { trialId: trialId.data, siteId: siteId.data });
  if (!sheet) notFound();

  const plotFilter = idParam.safeParse((await searchParams).plot);
  const [photos, packetChecks] = await Promise.all([listSitePhotos(viewer, { trialId: sheet.enrolment.trialId, siteId: sheet.enrolment.siteId }), packetChecksForViewer(viewer, sheet)]);
  const plots = plotFilter.success ? sheet.plots.filter((x) => x.id === plotFilter.data) : sheet.plots;
  const initial: Record<string, string> = {};
  for (const [plotId, byKey] of Object.entries(sheet.values)) {
    for (const [key, v] of Object.entries(byKey)) {
      const col = sheet.columns.find((c) => c.key === key);
      if (col) initial[`${plotId}:${key}`] = displayValue(col, v);
    }
  }
  const initialReasons: Record<string, MissingReason> = {};
  for (const [plotId, byKey] of Object.entries(sheet.missing)) {
    for (const [key, r] of Object.entries(byKey)) initialReasons[`${plotId}:${key}`] = r;
  }
  // Open the form on the oldest late count, else today's, else the first column.
  const pending = sheet.due.find((d) => d.status === "late") ?? sheet.due.find((d) => d.status === "due_today");
  const defaultColumn = (pending && sheet.columns.find((c) => c.traitId === pending.traitId && c.occasion === pending.occasion)?.key) ?? sheet.columns[0]?.key ?? "all";
  const comments: Record<number, string[]> = {};
  for (const c of sheet.comments) if (c.plotId) (comments[c.plotId] ??= []).push(c.body);
  const base = `/portal/record/${sheet.enrolment.trialId}/${sheet.enrolment.siteId}`;
  const t = await getTranslations("record");
  const photoWords = await getTranslations("photos");
  const sendable = (sheet.submission?.status ?? "draft") !== "submitted" && sheet.submission?.status !== "accepted" && Object.keys(sheet.values).length > 0;

  return (
    <div className="space-y-6">
      <SiteHeader sheet={sheet} />
      {/* The plain address (not a one-plot view) is what the phone keeps for use without a signal. */}
      <KeepReadyOffline userId={viewer.id} urls={["/portal", "/portal/record", ...offlineUrlsForSite(sheet.enrolment.trialId, sheet.enrolment.siteId)]} />
      <DuePanel sheet={sheet} />
      {sheet.submission?.status === "returned" && (
        <Card title={t("returnedTitle")}>
          {sheet.submission.reviewComment && <p className="mb-2">{sheet.submission.reviewComment}</p>}
          <ul className="list-disc pl-5">
            {sheet.comments.map((c) => (
              <li key={c.id}>
                {c.plotId ? t("plotComment", { plot: sheet.plots.find((x) => x.id === c.plotId)?.plotCode ?? "", comment: c.body }) : c.body}
              </li>
            ))}
          </ul>
          <p className="mt-2 text-sm text-loam-700">{t("returnedHelp")}</p>
        </Card>
      )}
      <div className="flex flex-wrap gap-2">
        <a className={buttonClasses("secondary")} href={`/api/record/${sheet.enrolment.trialId}/${sheet.enrolment.siteId}/template`}>
          {t("downloadSheet")}
        </a>
        <Link className={buttonClasses("secondary")} href={`${base}/upload`}>
          {t("uploadSheet")}
        </Link>
      </div>
      {sendable && (
        <Card title={t("whenAllIn")}>
          <p className="mb-3 text-loam-700">{t("sendHelp")}</p>
          <SubmitForReviewForm site={{ trialId: sheet.enrolment.trialId, siteId: sheet.enrolment.siteId }} />
        </Card>
      )}
      {plotFilter.success && (
        <p>
          {t("showingOne")} <Link href={base}>{t("showAll", { count: String(sheet.plots.length) })}</Link>
        </p>
      )}
      {plots.length === 0 ? (
        <p className="text-loam-700">{t("noLayout")}</p>
      ) : (
        <EntryForm
          userId={viewer.id}
          trialId={sheet.enrolment.trialId}
          siteId={sheet.enrolment.siteId}
          columns={sheet.columns}
          plots={plots}
          initial={initial}
          initialReasons={initialReasons}
          defaultColumn={plotFilter.success ? "all" : defaultColumn}
          sownOn={sheet.enrolment.sownOn}
          transplantedOn={sheet.enrolment.transplantedOn}
          packetChecks={packetChecks}
          today={sheet.today}
          locked={lockMessage(viewer.role, sheet, translatorFor(viewer.locale))}
          comments={comments}
          plotUnit={sheet.enrolment.plotUnit}
          plotSize={sheet.enrolment.plotSize}
        />
      )}
      {plots.length > 0 && sendable && (
        <Card title={t("doneRecording")}>
          <p className="mb-3 text-loam-700">{t("sendHelp")}</p>
          <SubmitForReviewForm site={{ trialId: sheet.enrolment.trialId, siteId: sheet.enrolment.siteId }} />
        </Card>
      )}
      {plots.length > 0 && (
        <Card title={t("photos")}>
          {photos.length > 0 && (
            <ul className="mb-4 flex flex-wrap gap-3">
              {photos.slice(0, 24).map((ph) => (
                <li key={ph.id} className="w-32 text-xs text-loam-700">
                  <a href={`/api/photos/${ph.id}`}>
                    {/* eslint-disable-next-line @next/next/no-img-element -- private photos are served by our own route, not the image optimiser */}
                    <img src={`/api/photos/${ph.id}`} alt={ph.caption ?? t("photoOf", { what: ph.plotCode ?? t("theSite") })} className="h-24 w-32 rounded-lg object-cover" loading="lazy" />
                  </a>
                  {ph.plotCode ?? t("site")} {ph.caption ? `· ${ph.caption}` : ""}
                  <RemovePhoto photoId={ph.id} trialId={sheet.enrolment.trialId} siteId={sheet.enrolment.siteId} name={ph.caption ?? photoWords("namedPhoto", { what: ph.plotCode ?? photoWords("siteWord") })} />
                </li>
              ))}
            </ul>
          )}
          <PhotoForm trialId={sheet.enrolment.trialId} siteId={sheet.enrolment.siteId} plots={sheet.plots} defaultPlot={plotFilter.success ? plotFilter.data : undefined} />
        </Card>
      )}
    </div>
  );
}
