import "server-only";
import { listRecentValueChanges, listReviewComments, listReviewSiteRows } from "@/db/queries/review";
import { listPlotPacketDays } from "@/db/queries/observations";
import { db } from "@/db/index";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";
import { flagValues } from "@/lib/domain/observations/flags";
import { describeCorrections } from "@/lib/domain/observations/corrections";
import { todayIso } from "@/lib/domain/schedule";
import { getRecordingSheet, type RecordingSheet } from "@/server/observations/sheet";

/** Values recorded against values expected: scheduled counts due by today, and every other column once. */
function completeness(sheet: RecordingSheet) {
  const dueKeys = new Set(sheet.due.filter((d) => d.dueOn !== null && d.dueOn <= sheet.today).map((d) => `${d.traitId}:${d.occasion}`));
  // Notes are optional, so they never count as missing.
  const expectedColumns = sheet.columns.filter((c) => c.valueType !== "text" && (c.dueDay === null || dueKeys.has(`${c.traitId}:${c.occasion}`)));
  let recorded = 0;
  for (const p of sheet.plots) for (const c of expectedColumns) if (sheet.values[p.id]?.[c.key]) recorded += 1;
  return { recorded, expected: expectedColumns.length * sheet.plots.length };
}

/** Every value to check at a site: ranges, outliers, and dates out of order or far from the packet. */
async function siteFlags(sheet: RecordingSheet) {
  const packetDays = await listPlotPacketDays(db, sheet.enrolment.enrolmentId);
  return flagValues({ ...sheet, dates: { site: { sownOn: sheet.enrolment.sownOn, transplantedOn: sheet.enrolment.transplantedOn }, packetDays } });
}

/**
 * Sites of the coordinator's trials that take data, with review state, completeness (values recorded of
 * values expected so far), late counts and how many values are flagged. Empty for cooperators.
 */
export async function listReviewQueue(viewer: Viewer, today: string = todayIso()) {
  const out = [];
  for (const r of await listReviewSiteRows(viewer)) {
    const sheet = await getRecordingSheet(viewer, r, today);
    if (!sheet) continue;
    const c = completeness(sheet);
    out.push({
      trialId: sheet.enrolment.trialId,
      trialCode: sheet.enrolment.trialCode,
      trialTitle: sheet.enrolment.trialTitle,
      siteId: sheet.enrolment.siteId,
      siteName: sheet.enrolment.siteName,
      status: sheet.submission?.status ?? "draft",
      submittedAt: sheet.submission?.submittedAt ?? null,
      recorded: c.recorded,
      expected: c.expected,
      late: sheet.due.filter((d) => d.status === "late").length,
      flags: (await siteFlags(sheet)).length,
      openComments: sheet.comments.length,
      /** the trial's results are published and this site's data are not in them */
      leftOutOfPublished: r.trialStatus === "published",
    });
  }
  // Waiting for review first, then by trial.
  const order = { submitted: 0, returned: 1, draft: 2, accepted: 3 } as const;
  return out.sort((a, b) => order[a.status] - order[b.status]);
}
export type ReviewQueue = Awaited<ReturnType<typeof listReviewQueue>>;

/** One site's data for review: values with flags, comments, and recent changes from the audit log. Staff only. */
export async function getReviewSheet(viewer: Viewer, p: { trialId: number; siteId: number }, today: string = todayIso()) {
  if (!isStaff(viewer)) return null;
  const sheet = await getRecordingSheet(viewer, p, today);
  if (!sheet) return null;
  const [comments, changes, flags] = await Promise.all([listReviewComments(sheet.enrolment.enrolmentId), listRecentValueChanges(Object.values(sheet.observationIds)), siteFlags(sheet)]);
  return { ...sheet, flags, allComments: comments, recentChanges: describeCorrections(changes, sheet.columns), completeness: completeness(sheet) };
}
export type ReviewSheet = NonNullable<Awaited<ReturnType<typeof getReviewSheet>>>;
