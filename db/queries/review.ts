import "server-only";
import { and, asc, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import { db } from "../index";
import { auditLog, enrolments, observations, plots, reviewComments, sites, submissions, trials, users } from "../schema";
import { staffTrialScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";
import { flagValues } from "@/lib/domain/observations/flags";
import { getRecordableEnrolment, getRecordingSheet } from "./observations";
import { todayIso } from "@/lib/domain/schedule";

/**
 * Sites of the coordinator's trials that take data, with review state, completeness (values recorded of
 * values expected so far), late counts and how many values are flagged. Empty for cooperators.
 */
export async function listReviewQueue(viewer: Viewer, today: string = todayIso()) {
  if (!isStaff(viewer)) return [];
  const rows = await db
    .select({ trialId: trials.id, siteId: sites.id })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .where(and(staffTrialScope(viewer), inArray(trials.status, ["open", "collecting", "analysing"]), sql`${enrolments.randomisedAt} IS NOT NULL`))
    .orderBy(asc(trials.code), asc(sites.name));
  const out = [];
  for (const r of rows) {
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
      flags: flagValues(sheet).length,
      openComments: sheet.comments.length,
    });
  }
  // Waiting for review first, then by trial.
  const order = { submitted: 0, returned: 1, draft: 2, accepted: 3 } as const;
  return out.sort((a, b) => order[a.status] - order[b.status]);
}

/** Values recorded against values expected: scheduled counts due by today, and every other column once. */
function completeness(sheet: NonNullable<Awaited<ReturnType<typeof getRecordingSheet>>>) {
  const dueKeys = new Set(sheet.due.filter((d) => d.dueOn <= sheet.today).map((d) => `${d.traitId}:${d.occasion}`));
  // Notes are optional, so they never count as missing.
  const expectedColumns = sheet.columns.filter((c) => c.valueType !== "text" && (c.dueDay === null || dueKeys.has(`${c.traitId}:${c.occasion}`)));
  let recorded = 0;
  for (const p of sheet.plots) for (const c of expectedColumns) if (sheet.values[p.id]?.[c.key]) recorded += 1;
  return { recorded, expected: expectedColumns.length * sheet.plots.length };
}

/** One site's data for review: values with flags, comments, and recent changes from the audit log. Staff only. */
export async function getReviewSheet(viewer: Viewer, p: { trialId: number; siteId: number }, today: string = todayIso()) {
  if (!isStaff(viewer)) return null;
  const sheet = await getRecordingSheet(viewer, p, today);
  if (!sheet) return null;
  const observationIds = Object.values(sheet.observationIds);
  const [comments, changes] = await Promise.all([
    db
      .select({ id: reviewComments.id, plotId: reviewComments.plotId, observationId: reviewComments.observationId, body: reviewComments.body, author: users.name, createdAt: reviewComments.createdAt, resolvedAt: reviewComments.resolvedAt })
      .from(reviewComments)
      .innerJoin(submissions, eq(submissions.id, reviewComments.submissionId))
      .leftJoin(users, eq(users.id, reviewComments.authorId))
      .where(eq(submissions.enrolmentId, sheet.enrolment.enrolmentId))
      .orderBy(desc(reviewComments.id)),
    observationIds.length === 0
      ? Promise.resolve([])
      : db
          .select({ at: auditLog.at, action: auditLog.action, actor: users.name, oldValue: auditLog.oldValue, newValue: auditLog.newValue })
          .from(auditLog)
          .leftJoin(users, eq(users.id, auditLog.actorId))
          .where(and(eq(auditLog.entity, "observation"), inArray(auditLog.entityId, observationIds.map(String)), eq(auditLog.action, "observation.change")))
          .orderBy(desc(auditLog.at))
          .limit(30),
  ]);
  return { ...sheet, flags: flagValues(sheet), allComments: comments, recentChanges: changes, completeness: completeness(sheet) };
}
export type ReviewSheet = NonNullable<Awaited<ReturnType<typeof getReviewSheet>>>;

/** Counts whose due date is tomorrow or past, per cooperator and site, for the reminder job (no viewer: a system job). */
export async function listReminderTargets(today: string) {
  const rows = await db
    .select({ enrolmentId: enrolments.id, trialId: trials.id, siteId: sites.id })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .where(and(inArray(trials.status, ["open", "collecting"]), sql`${enrolments.sownOn} IS NOT NULL`, sql`${enrolments.randomisedAt} IS NOT NULL`));
  return rows;
}

/** Observation ids of an enrolment, to pin a comment on one value. */
export async function getObservationIdForPlot(p: { enrolmentId: number; plotId: number; traitId: number; occasion: number }) {
  const [row] = await db
    .select({ id: observations.id })
    .from(observations)
    .innerJoin(plots, eq(plots.id, observations.plotId))
    .where(and(eq(plots.enrolmentId, p.enrolmentId), eq(observations.plotId, p.plotId), eq(observations.traitId, p.traitId), eq(observations.occasion, p.occasion)));
  return row?.id ?? null;
}

/** Submission state of one site, for the JSON API. */
export async function getSubmissionState(viewer: Viewer, p: { trialId: number; siteId: number }) {
  const enrolment = await getRecordableEnrolment(db, viewer, p);
  if (!enrolment) return null;
  const [sub] = await db.select({ status: submissions.status, submittedAt: submissions.submittedAt, reviewedAt: submissions.reviewedAt, reviewComment: submissions.reviewComment }).from(submissions).where(eq(submissions.enrolmentId, enrolment.enrolmentId));
  const open = await db.select({ id: reviewComments.id }).from(reviewComments).innerJoin(submissions, eq(submissions.id, reviewComments.submissionId)).where(and(eq(submissions.enrolmentId, enrolment.enrolmentId), isNull(reviewComments.resolvedAt)));
  return { status: sub?.status ?? "draft", submittedAt: sub?.submittedAt ?? null, reviewedAt: sub?.reviewedAt ?? null, reviewComment: sub?.reviewComment ?? null, openComments: open.length };
}
