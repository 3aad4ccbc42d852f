import Link from "next/link";
import { useLocale, useTranslations } from "next-intl";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { SubmissionStatusBadge } from "@/components/ui/status-badge";
import type { listRecordableSites } from "@/server/observations/sheet";

type Sites = Awaited<ReturnType<typeof listRecordableSites>>;

/** The viewer's sites in trials taking data, late ones first. */
export function RecordableSitesList({ sites }: { sites: Sites }) {
  const t = useTranslations("record");
  const locale = useLocale();
  if (sites.length === 0) return <p className="text-loam-700">{t("noneTaking")}</p>;
  const ordered = [...sites].sort((a, b) => b.late.length - a.late.length || b.dueToday.length - a.dueToday.length);
  return (
    <ul className="space-y-3">
      {ordered.map((s) => (
        <li key={s.enrolmentId}>
          <Link href={`/portal/record/${s.trialId}/${s.siteId}`} className="block rounded-xl border border-husk-200 bg-white p-4 no-underline shadow-sm hover:border-sprout-500">
            <span className="flex flex-wrap items-center justify-between gap-2">
              <span className="text-lg font-bold text-loam-900">{s.siteName}</span>
              <SubmissionStatusBadge status={s.submissionStatus ?? "draft"} />
            </span>
            <span className="block text-loam-700">
              {s.trialTitle} <span className="font-mono text-sm">{s.trialCode}</span> · {t("siteListLine", { date: formatDate(s.sownOn, locale), plots: s.plotCount })}
            </span>
            {s.late.length > 0 && <span className="mt-1 block font-semibold text-beet-700">{t("lateList", { items: s.late.map((d) => d.label).join(", ") })}</span>}
            {s.dueToday.length > 0 && <span className="mt-1 block font-semibold text-marigold-800">{t("todayList", { items: s.dueToday.map((d) => d.label).join(", ") })}</span>}
            {s.openComments > 0 && <span className="mt-1 block font-semibold text-sky-800">{t("commentsFrom", { count: s.openComments })}</span>}
          </Link>
        </li>
      ))}
    </ul>
  );
}
