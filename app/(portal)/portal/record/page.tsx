import Link from "next/link";
import { requireUser } from "@/server/auth/guards";
import { listRecordableSites } from "@/server/observations/sheet";
import { RecordableSitesList } from "@/components/record/sites-list";
import { KeepReadyOffline } from "@/components/offline/offline-setup";
import { offlineUrlsForSite } from "@/lib/domain/offline";
import { getTranslations } from "next-intl/server";

export const dynamic = "force-dynamic";

export default async function RecordIndexPage() {
  const viewer = await requireUser();
  const [sites, t] = await Promise.all([listRecordableSites(viewer), getTranslations("record")]);
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-bold text-loam-900">{t("title")}</h1>
        <p className="text-loam-700">{t("indexIntro")}</p>
      </div>
      <RecordableSitesList sites={sites} />
      <KeepReadyOffline userId={viewer.id} urls={["/portal", "/portal/record", ...sites.flatMap((s) => offlineUrlsForSite(s.trialId, s.siteId))]} />
      <p className="text-sm text-loam-700">
        {t("indexScan")} <Link href="/portal">{t("backHome")}</Link>.
      </p>
    </div>
  );
}
