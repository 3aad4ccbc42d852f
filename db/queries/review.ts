import "server-only";
import { and, asc, desc, eq, inArray, isNull, or, sql } from "drizzle-orm";
import { db } from "../index";
import { auditLog, enrolments, observations, plots, reviewComments, sites, submissions, trials, users } from "../schema";
import { staffTrialScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";
import { getRecordableEnrolment } from "./observations";

/**
 * Sites of the staff member's trials that take data, in trial and site order, and the sites of published
 * trials whose data are still not accepted (left out of the published results; a later version can add
 * them). Empty for cooperators.
 */
export async function listReviewSiteRows(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({ trialId: trials.id, siteId: sites.id, trialStatus: trials.status })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .leftJoin(submissions, eq(submissions.enrolmentId, enrolments.id))
    .where(
      and(
        staffTrialScope(viewer),
        sql`${enrolments.randomisedAt} IS NOT NULL`,
        or(inArray(trials.status, ["open", "collecting", "analysing"]), and(eq(trials.status, "published"), sql`COALESCE(${submissions.status}, 'draft') <> 'accepted'`)),
      ),
    )
    .orderBy(asc(trials.code), asc(sites.name));
}

/** Every review comment on an enrolment's data set, answered ones included, newest first. */
export async function listReviewComments(enrolmentId: number) {
  return db
    .select({ id: reviewComments.id, plotId: reviewComments.plotId, observationId: reviewComments.observationId, body: reviewComments.body, author: users.name, createdAt: reviewComments.createdAt, resolvedAt: reviewComments.resolvedAt })
    .from(reviewComments)
    .innerJoin(submissions, eq(submissions.id, reviewComments.submissionId))
    .leftJoin(users, eq(users.id, reviewComments.authorId))
    .where(eq(submissions.enrolmentId, enrolmentId))
    .orderBy(desc(reviewComments.id));
}

/** The latest 30 changes to these observations, from the audit log, newest first. */
export async function listRecentValueChanges(observationIds: number[]) {
  if (observationIds.length === 0) return [];
  return db
    .select({ at: auditLog.at, action: auditLog.action, actor: users.name, oldValue: auditLog.oldValue, newValue: auditLog.newValue })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .where(and(eq(auditLog.entity, "observation"), inArray(auditLog.entityId, observationIds.map(String)), eq(auditLog.action, "observation.change")))
    .orderBy(desc(auditLog.at))
    .limit(30);
}

/** Counts whose due date is tomorrow or past, per cooperator and site, for the reminder job (no viewer: a system job). */
export async function listReminderTargets() {
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
