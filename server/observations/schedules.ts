import "server-only";
import { listScheduleRows } from "@/db/queries/overview";
import type { Viewer } from "@/lib/domain/viewer";
import { scheduleForSite, todayIso, type DueItem } from "@/lib/domain/schedule";

export interface SiteSchedule {
  enrolmentId: number;
  trialId: number;
  trialCode: string;
  trialTitle: string;
  siteId: number;
  siteName: string;
  sownOn: string | null;
  plotCount: number;
  items: DueItem[];
  late: DueItem[];
  next: DueItem | null;
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
  return rows.enrolments.map((r) => {
    const items = scheduleForSite({
      sownOn: r.sownOn,
      plotCount: r.plotCount,
      traits: rows.traits.filter((t) => t.trialId === r.trialId),
      recorded: recordedByEnrolment.get(r.enrolmentId) ?? new Map(),
      today,
    });
    return { ...r, items, late: items.filter((i) => i.status === "late"), next: items.find((i) => i.status !== "done") ?? null };
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
