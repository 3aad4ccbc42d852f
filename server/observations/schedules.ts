import "server-only";
import { listScheduleRows } from "@/db/queries/overview";
import type { Viewer } from "@/lib/domain/viewer";
import type { SubmissionStatus } from "@/lib/domain/vocabulary/enums";
import { scheduleForSite, scheduleSummary, todayIso, type DueItem } from "@/lib/domain/schedule";
import { entryColumns } from "@/lib/domain/observations/columns";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

export interface SiteSchedule {
  enrolmentId: number;
  trialId: number;
  trialCode: string;
  trialTitle: string;
  siteId: number;
  siteName: string;
  sownOn: string | null;
  plotCount: number;
  submissionStatus: SubmissionStatus | null;
  submittedAt: Date | null;
  reviewComment: string | null;
  openComments: number;
  items: DueItem[];
  summary: ReturnType<typeof scheduleSummary>;
  late: DueItem[];
}

/** Due and late scheduled counts per enrolment, for the enrolments the viewer may see. */
async function listSchedules(viewer: Viewer, today: string): Promise<SiteSchedule[]> {
  const rows = await listScheduleRows(viewer);
  const recordedByEnrolment = new Map<number, Map<string, number>>();
  for (const c of rows.recordedCounts) {
    const m = recordedByEnrolment.get(c.enrolmentId) ?? new Map<string, number>();
    m.set(`${c.traitId}:${c.occasion}`, c.n);
    recordedByEnrolment.set(c.enrolmentId, m);
  }
  const t = translatorFor(viewer.locale);
  return rows.enrolments.map((r) => {
    const items = scheduleForSite({
      t,
      sownOn: r.sownOn,
      plotCount: r.plotCount,
      columns: entryColumns(rows.traits.filter((trait) => trait.trialId === r.trialId), t),
      recorded: recordedByEnrolment.get(r.enrolmentId) ?? new Map(),
      today,
    });
    const summary = scheduleSummary(items);
    return { ...r, items, summary, late: summary.late };
  });
}

/** Sites with overdue counts in the coordinator's active trials. */
export async function listLateSites(viewer: Viewer, today: string = todayIso()) {
  if (viewer.role === "cooperator") return [];
  return (await listSchedules(viewer, today)).filter((s) => s.late.length > 0);
}

/** The cooperator's own sites with what to record next. */
export async function listMySchedules(viewer: Viewer, today: string = todayIso()) {
  if (viewer.role !== "cooperator") return [];
  return listSchedules(viewer, today);
}
