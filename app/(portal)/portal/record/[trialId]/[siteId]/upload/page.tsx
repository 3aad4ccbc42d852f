import Link from "next/link";
import { notFound } from "next/navigation";
import { requireUser } from "@/server/auth/guards";
import { getRecordingSheet } from "@/server/observations/sheet";
import { idParam } from "@/lib/validation/common";
import { UploadForm } from "@/components/record/upload-form";
import { lockMessage, SiteHeader } from "@/components/record/site-panels";
import { getTranslations } from "next-intl/server";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

export const dynamic = "force-dynamic";

export default async function UploadPage({ params }: { params: Promise<{ trialId: string; siteId: string }> }) {
  const viewer = await requireUser();
  const p = await params;
  const trialId = idParam.safeParse(p.trialId);
  const siteId = idParam.safeParse(p.siteId);
  if (!trialId.success || !siteId.success) notFound();
  const sheet = await getRecordingSheet(viewer, { trialId: trialId.data, siteId: siteId.data });
  if (!sheet) notFound();
  const base = `/portal/record/${sheet.enrolment.trialId}/${sheet.enrolment.siteId}`;
  const locked = lockMessage(viewer.role, sheet, translatorFor(viewer.locale));
  const t = await getTranslations("upload");
  return (
    <div className="space-y-6">
      <SiteHeader sheet={sheet} />
      <div className="space-y-2 text-loam-900">
        <h2 className="text-xl font-bold">{t("title")}</h2>
        <p>
          {t("introBefore")} <a href={`/api/record/${sheet.enrolment.trialId}/${sheet.enrolment.siteId}/template`}>{t("templateLink")}</a> {t("introAfter")}
        </p>
      </div>
      {locked ? (
        <p className="rounded-lg border border-sky-600 bg-sky-100 px-3 py-2 text-sky-800">{locked}</p>
      ) : (
        <UploadForm endpoint={`/api/record/${sheet.enrolment.trialId}/${sheet.enrolment.siteId}/upload`} backHref={base} />
      )}
      <p>
        <Link href={base}>{t("backToPlots")}</Link>
      </p>
    </div>
  );
}
