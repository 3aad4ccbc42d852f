import { Card } from "@/components/ui/card";
import { formatDate } from "@/lib/domain/vocabulary/labels";
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

/** Today's and late scheduled counts, with how many plots are still missing. */
export function DuePanel({ sheet }: { sheet: RecordingSheet }) {
  const late = sheet.due.filter((d) => d.status === "late");
  const today = sheet.due.filter((d) => d.status === "due_today");
  const next = sheet.due.find((d) => d.status === "upcoming");
  return (
    <Card title="What is due">
      {late.length === 0 && today.length === 0 ? (
        <p className="text-loam-700">Nothing is due today and nothing is late.{next ? ` Next: ${next.traitName} day ${next.occasion}, on ${formatDate(next.dueOn)}.` : ""}</p>
      ) : (
        <ul className="space-y-1">
          {late.map((d) => (
            <li key={`${d.traitId}:${d.occasion}`} className="font-semibold text-beet-700">
              Late: {d.traitName} day {d.occasion} (was due {formatDate(d.dueOn)}) — {d.expected - d.recorded} of {d.expected} plots missing
            </li>
          ))}
          {today.map((d) => (
            <li key={`${d.traitId}:${d.occasion}`} className="font-semibold text-marigold-800">
              Due today: {d.traitName} day {d.occasion} — {d.expected - d.recorded} of {d.expected} plots to go
            </li>
          ))}
        </ul>
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
