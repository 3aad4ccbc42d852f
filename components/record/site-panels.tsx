import { useLocale, useTranslations } from "next-intl";
import { Card } from "@/components/ui/card";
import type { Translator } from "@/lib/domain/i18n/catalogue";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { DUE_SOON_DAYS, scheduleSummary, type DueItem } from "@/lib/domain/schedule";
import { SubmissionStatusBadge } from "@/components/ui/status-badge";
import type { RecordingSheet } from "@/server/observations/sheet";
import type { Role } from "@/lib/domain/vocabulary/enums";

export function SiteHeader({ sheet }: { sheet: RecordingSheet }) {
  const status = sheet.submission?.status ?? "draft";
  const t = useTranslations("record");
  const locale = useLocale();
  return (
    <div>
      <p className="text-sm text-loam-700">
        <span className="font-mono">{sheet.enrolment.trialCode}</span> · {t("sown", { date: formatDate(sheet.enrolment.sownOn, locale) })}
      </p>
      <h1 className="text-2xl font-bold text-loam-900">
        {sheet.enrolment.siteName}: {sheet.enrolment.trialTitle}
      </h1>
      <SubmissionStatusBadge status={status} />
    </div>
  );
}

/** Everything the form owes: late, due today, due soon and the values an event times, never "nothing due" while one is missing. */
export function DuePanel({ sheet }: { sheet: RecordingSheet }) {
  const summary = scheduleSummary(sheet.due);
  const t = useTranslations("record");
  const home = useTranslations("home");
  const locale = useLocale();
  const toGo = (d: DueItem) => t("toGo", { missing: String(d.expected - d.recorded), expected: String(d.expected) });
  const groups: { title: string; tone: string; items: DueItem[]; line: (d: DueItem) => string }[] = [
    { title: home("late"), tone: "font-semibold text-beet-700", items: summary.late, line: (d) => t("lateLine", { label: d.label, date: formatDate(d.dueOn, locale), toGo: toGo(d) }) },
    { title: home("dueToday"), tone: "font-semibold text-marigold-800", items: summary.dueToday, line: (d) => t("todayLine", { label: d.label, toGo: toGo(d) }) },
    { title: home("dueSoon", { days: String(DUE_SOON_DAYS) }), tone: "", items: summary.dueSoon, line: (d) => t("soonLine", { label: d.label, date: formatDate(d.dueOn, locale), toGo: toGo(d) }) },
    { title: home("atEvent"), tone: "", items: summary.atEvent, line: (d) => t("eventLine", { label: d.label, when: d.when, toGo: toGo(d) }) },
  ];
  return (
    <Card title={t("whatIsDue")}>
      {!sheet.enrolment.sownOn ? (
        <p className="text-loam-700">{home("noSowingDate")}</p>
      ) : (
        <>
          <p className="text-loam-700">
            {t("valuesRecorded", { recorded: String(summary.values.recorded), expected: String(summary.values.expected) })}
            {summary.allIn ? t("allIn") : ""}
          </p>
          {groups
            .filter((g) => g.items.length > 0)
            .map((g) => (
              <div key={g.title} className="mt-2">
                <p className={g.tone || "font-semibold"}>{g.title}</p>
                <ul className="list-disc pl-5">
                  {g.items.map((d) => (
                    <li key={`${d.traitId}:${d.occasion}`}>{g.line(d)}</li>
                  ))}
                </ul>
              </div>
            ))}
        </>
      )}
    </Card>
  );
}

/** Why the form is read-only for this viewer, or null when values may be changed. */
export function lockMessage(role: Role, sheet: RecordingSheet, t: Translator): string | null {
  if (sheet.enrolment.trialStatus === "published" || sheet.enrolment.trialStatus === "archived") return t("record.lockedPublished");
  if (role !== "cooperator") return null;
  if (sheet.submission?.status === "submitted") return t("record.lockedSubmitted");
  if (sheet.submission?.status === "accepted") return t("record.lockedAccepted");
  return null;
}
