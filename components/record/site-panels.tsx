import { Card } from "@/components/ui/card";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { DUE_SOON_DAYS, scheduleSummary, type DueItem } from "@/lib/domain/schedule";
import { SubmissionStatusBadge } from "@/components/ui/status-badge";
import type { RecordingSheet } from "@/server/observations/sheet";
import type { Role } from "@/lib/domain/vocabulary/enums";

export function SiteHeader({ sheet }: { sheet: RecordingSheet }) {
  const status = sheet.submission?.status ?? "draft";
  return (
    <div>
      <p className="text-sm text-loam-700">
        <span className="font-mono">{sheet.enrolment.trialCode}</span> · sown {formatDate(sheet.enrolment.sownOn)}
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
  const missing = (d: DueItem) => `${d.expected - d.recorded} of ${d.expected} plots to go`;
  const groups: { title: string; tone: string; items: DueItem[]; line: (d: DueItem) => string }[] = [
    { title: "Late", tone: "font-semibold text-beet-700", items: summary.late, line: (d) => `${d.label} (was due ${formatDate(d.dueOn)}) — ${missing(d)}` },
    { title: "Due today", tone: "font-semibold text-marigold-800", items: summary.dueToday, line: (d) => `${d.label} — ${missing(d)}` },
    { title: `Due in the next ${DUE_SOON_DAYS} days`, tone: "", items: summary.dueSoon, line: (d) => `${d.label}, on ${formatDate(d.dueOn)} — ${missing(d)}` },
    { title: "When it happens", tone: "", items: summary.atEvent, line: (d) => `${d.label} (${d.when}) — ${missing(d)}` },
  ];
  return (
    <Card title="What is due">
      {!sheet.enrolment.sownOn ? (
        <p className="text-loam-700">No sowing date is recorded for this site yet; due dates start from it.</p>
      ) : (
        <>
          <p className="text-loam-700">
            {summary.values.recorded} of {summary.values.expected} values recorded.{summary.allIn ? " Everything the form asks for is in: check it, then send it for review." : ""}
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
export function lockMessage(role: Role, sheet: RecordingSheet): string | null {
  if (sheet.enrolment.trialStatus === "published" || sheet.enrolment.trialStatus === "archived") return "This trial's results are published; values can no longer change.";
  if (role !== "cooperator") return null;
  if (sheet.submission?.status === "submitted") return "You have sent this data for review. It is locked until your coordinator accepts it or returns it with comments.";
  if (sheet.submission?.status === "accepted") return "Your coordinator has accepted this data. Ask them if something needs correcting.";
  return null;
}
