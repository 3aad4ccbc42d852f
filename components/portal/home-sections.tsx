import Link from "next/link";
import { useLocale, useTranslations } from "next-intl";
import { Card } from "@/components/ui/card";
import { Badge } from "@/components/ui/badge";
import { TrialStatusBadge } from "@/components/ui/status-badge";
import { formatDate, ROLE_LABELS } from "@/lib/domain/vocabulary/labels";
import type { listMyPublishedTrials, listMySites, listTrialsForViewer } from "@/db/queries/overview";
import { DUE_SOON_DAYS, type DueItem } from "@/lib/domain/schedule";
import type { listLateSites, listMySchedules } from "@/server/observations/schedules";
import type { listUsersForAdmin } from "@/db/queries/users";
import type { listMyLayouts } from "@/db/queries/trials";

type Trials = Awaited<ReturnType<typeof listTrialsForViewer>>;
type LateSites = Awaited<ReturnType<typeof listLateSites>>;

export function TrialsTable({ trials }: { trials: Trials }) {
  if (trials.length === 0) return <p className="text-loam-700">No trials yet in your programs.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Trials in your programs</caption>
        <thead className="border-b border-husk-200 text-loam-700">
          <tr>
            <th scope="col" className="py-2 pr-3">Trial</th>
            <th scope="col" className="py-2 pr-3">Crop</th>
            <th scope="col" className="py-2 pr-3">Season</th>
            <th scope="col" className="py-2 pr-3 text-right">Entries</th>
            <th scope="col" className="py-2 pr-3 text-right">Sites</th>
            <th scope="col" className="py-2">Status</th>
          </tr>
        </thead>
        <tbody>
          {trials.map((t) => (
            <tr key={t.id} className="border-b border-husk-100">
              <td className="py-2 pr-3">
                <Link href={`/portal/trials/${t.id}`} className="font-semibold">
                  {t.title}
                </Link>
                <span className="block font-mono text-xs text-loam-700">{t.code}</span>
              </td>
              <td className="py-2 pr-3">{t.crop}</td>
              <td className="py-2 pr-3">{t.season}</td>
              <td className="py-2 pr-3 text-right tabular-nums">{t.entries}</td>
              <td className="py-2 pr-3 text-right tabular-nums">{t.sites}</td>
              <td className="py-2"><TrialStatusBadge status={t.status} /></td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function LateSitesList({ sites }: { sites: LateSites }) {
  if (sites.length === 0) return <p className="text-loam-700">Every site is up to date. Nothing is overdue.</p>;
  return (
    <ul className="divide-y divide-husk-100">
      {sites.map((s) => {
        const missing = s.late.reduce((sum, i) => sum + (i.expected - i.recorded), 0);
        return (
          <li key={s.enrolmentId} className="flex flex-wrap items-baseline justify-between gap-2 py-2">
            <div>
              <Link href={`/portal/review/${s.trialId}/${s.siteId}`} className="font-semibold">{s.siteName}</Link> <span className="text-sm text-loam-700">· {s.trialCode}</span>
              <span className="block text-sm text-loam-700">
                Late: {s.late.map((i) => i.label).join(", ")}; oldest due {formatDate(s.late[0]!.dueOn)}
              </span>
            </div>
            <Badge tone="bad">{missing} values missing</Badge>
          </li>
        );
      })}
    </ul>
  );
}

function OwedList({ title, items, tone }: { title: string; items: DueItem[]; tone: string }) {
  const t = useTranslations("home");
  const locale = useLocale();
  // One owed item as a grower reads it: "Seeds sown — due Nov 2, 2026, 0 of 20 plots".
  const owedLine = (i: DueItem) => {
    const counts = { label: i.label, recorded: String(i.recorded), expected: String(i.expected) };
    return i.dueOn ? t("owedDated", { ...counts, date: formatDate(i.dueOn, locale) }) : t("owedEvent", { ...counts, when: i.when });
  };
  if (items.length === 0) return null;
  return (
    <div className="mt-2">
      <p className={`text-sm font-semibold ${tone}`}>{title}</p>
      <ul className="list-disc pl-5 text-sm">
        {items.map((i) => (
          <li key={`${i.traitId}:${i.occasion}`}>{owedLine(i)}</li>
        ))}
      </ul>
    </div>
  );
}

/** What one site owes, or where its data set stands once sent: never "all in" while a value is missing. */
function SiteOwed({ s }: { s: Awaited<ReturnType<typeof listMySchedules>>[number] }) {
  const t = useTranslations("home");
  const locale = useLocale();
  const { summary } = s;
  if (s.submissionStatus === "returned") {
    return (
      <div className="mt-2 rounded-lg border border-beet-300 bg-beet-50 p-2 text-sm">
        <p className="font-semibold text-beet-700">{t("returned")}</p>
        {s.reviewComment && <p className="mt-1">{t("coordinatorWrote", { comment: s.reviewComment })}</p>}
        {s.openComments > 0 && <p className="mt-1">{t("openComments", { count: s.openComments })}</p>}
        <p className="mt-1">
          <Link href={`/portal/record/${s.trialId}/${s.siteId}`}>{t("openToCorrect")}</Link>
        </p>
      </div>
    );
  }
  if (s.submissionStatus === "submitted") return <p className="mt-2 text-sm">{t("submitted", { date: s.submittedAt ? formatDate(s.submittedAt.toISOString().slice(0, 10), locale) : "none" })}</p>;
  if (s.submissionStatus === "accepted") return <p className="mt-2 text-sm text-sprout-700">{t("accepted")}</p>;
  if (!s.sownOn) return <p className="mt-2 text-sm">{t("noSowingDate")}</p>;
  return (
    <>
      <p className="mt-1 text-sm">
        <span className="font-semibold">{t("valuesRecorded", { recorded: String(summary.values.recorded), expected: String(summary.values.expected) })}</span>
        {summary.allIn ? t("allIn") : "."}
      </p>
      <OwedList title={t("late")} items={summary.late} tone="text-beet-700" />
      <OwedList title={t("dueToday")} items={summary.dueToday} tone="text-marigold-800" />
      <OwedList title={t("dueSoon", { days: String(DUE_SOON_DAYS) })} items={summary.dueSoon} tone="text-loam-900" />
      <OwedList title={t("atEvent")} items={summary.atEvent} tone="text-loam-900" />
    </>
  );
}

export function MySchedules({
  schedules,
  sites,
  published,
}: {
  schedules: Awaited<ReturnType<typeof listMySchedules>>;
  sites: Awaited<ReturnType<typeof listMySites>>;
  published: Awaited<ReturnType<typeof listMyPublishedTrials>>;
}) {
  const t = useTranslations("home");
  const locale = useLocale();
  // A returned data set is the first thing to deal with.
  const ordered = [...schedules].sort((a, b) => Number(b.submissionStatus === "returned") - Number(a.submissionStatus === "returned"));
  return (
    <div className="grid gap-6 md:grid-cols-2">
      <Card title={t("whatNext")}>
        {schedules.length === 0 ? (
          <p className="text-loam-700">{t("noActive")}</p>
        ) : (
          <ul className="space-y-4">
            {ordered.map((s) => (
              <li key={s.enrolmentId} className="rounded-lg border border-husk-200 p-3">
                <p className="font-semibold">
                  <Link href={`/portal/record/${s.trialId}/${s.siteId}`}>{s.trialTitle}</Link>
                </p>
                <p className="text-sm text-loam-700">
                  {t("siteLine", { site: s.siteName, date: formatDate(s.sownOn, locale), plots: s.plotCount })}
                </p>
                <SiteOwed s={s} />
              </li>
            ))}
          </ul>
        )}
      </Card>
      <div className="space-y-6">
        {published.length > 0 && (
          <Card title={t("published")}>
            <ul className="space-y-1">
              {published.map((p) => (
                <li key={`${p.code}:${p.siteName}`}>
                  <Link href={`/results/${encodeURIComponent(p.code)}${locale === "en" ? "" : `?lang=${locale}`}`}>{p.title}</Link> <span className="text-sm text-loam-700">({p.siteName})</span>
                </li>
              ))}
            </ul>
          </Card>
        )}
      <Card title={t("mySites")}>
        <ul className="space-y-2">
          {sites.map((s) => (
            <li key={s.id}>
              <span className="font-semibold">{s.name}</span>
              <span className="block text-sm text-loam-700">
                {s.region} · {t("setup", { setup: s.growingSetup })}
              </span>
            </li>
          ))}
        </ul>
      </Card>
      </div>
    </div>
  );
}

export function MyLayouts({ layouts }: { layouts: Awaited<ReturnType<typeof listMyLayouts>> }) {
  return (
    <ul className="space-y-1">
      {layouts.map((l) => (
        <li key={`${l.trialId}-${l.siteId}`}>
          <Link href={`/portal/trials/${l.trialId}/sites/${l.siteId}`} className="font-semibold">
            {l.trialTitle}
          </Link>{" "}
          <span className="text-sm text-loam-700">· {l.siteName}</span>
        </li>
      ))}
    </ul>
  );
}

export function UsersSummary({ users }: { users: Awaited<ReturnType<typeof listUsersForAdmin>> }) {
  return (
    <ul className="divide-y divide-husk-100 text-sm">
      {users.map((u) => (
        <li key={u.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
          <span>
            <span className="font-semibold">{u.name}</span> <span className="text-loam-700">{u.email}</span>
          </span>
          <span className="flex gap-2">
            <Badge tone={u.role === "admin" ? "warn" : u.role === "coordinator" ? "info" : "neutral"}>{ROLE_LABELS[u.role]}</Badge>
            {!u.active && <Badge tone="bad">Inactive</Badge>}
            {!u.hasPassword && <Badge>Invited</Badge>}
          </span>
        </li>
      ))}
    </ul>
  );
}

export function SectionLink({ href, children }: { href: string; children: React.ReactNode }) {
  return <Link href={href} className="text-sm font-semibold">{children}</Link>;
}
