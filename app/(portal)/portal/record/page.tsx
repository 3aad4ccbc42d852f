import Link from "next/link";
import { requireUser } from "@/server/auth/guards";
import { listRecordableSites } from "@/server/observations/sheet";
import { RecordableSitesList } from "@/components/record/sites-list";
import { KeepReadyOffline } from "@/components/offline/offline-setup";
import { offlineUrlsForSite } from "@/lib/domain/offline";

export const dynamic = "force-dynamic";

export default async function RecordIndexPage() {
  const viewer = await requireUser();
  const sites = await listRecordableSites(viewer);
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-bold text-loam-900">Record data</h1>
        <p className="text-loam-700">Pick a site and trial. What is due today and anything late is listed first.</p>
      </div>
      <RecordableSitesList sites={sites} />
      <KeepReadyOffline userId={viewer.id} urls={["/portal", "/portal/record", ...sites.flatMap((s) => offlineUrlsForSite(s.trialId, s.siteId))]} />
      <p className="text-sm text-loam-700">
        Scanning a plot label opens that plot directly. <Link href="/portal">Back to the portal home</Link>.
      </p>
    </div>
  );
}
