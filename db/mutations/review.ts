import "server-only";
import { and, eq, isNull, sql } from "drizzle-orm";
import type { Tx } from "../index";
import { auditLog, observations, plots, programCoordinators, reviewComments, siteCooperators, submissions, users } from "../schema";
import { getRecordableEnrolment, type RecordableEnrolment } from "../queries/observations";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import type { SubmissionStatus } from "@/lib/domain/vocabulary/enums";

// Persistence for review: server/review decides the transitions and builds the mails, inside its transaction.

/** Locks the site for this viewer and its data set (opened as a draft if there is none yet). */
export async function lockSubmission(tx: Tx, viewer: Viewer, p: { trialId: number; siteId: number }) {
  const enrolment = await getRecordableEnrolment(tx, viewer, p, true);
  if (!enrolment) throw new AppError("not_found", "That site or trial does not exist, or it is not one of yours.");
  let [sub] = await tx.select({ id: submissions.id, status: submissions.status }).from(submissions).where(eq(submissions.enrolmentId, enrolment.enrolmentId)).for("update");
  if (!sub) {
    const [created] = await tx.insert(submissions).values({ enrolmentId: enrolment.enrolmentId, status: "draft" }).$returningId();
    sub = { id: created!.id, status: "draft" };
  }
  return { enrolment, submission: sub };
}

/** The site's active growers (its cooperator and everyone attached to the site). */
export async function listGrowerRecipients(tx: Tx, enrolment: RecordableEnrolment) {
  return tx
    .selectDistinct({ email: users.email, name: users.name, locale: users.locale })
    .from(users)
    .where(
      and(
        eq(users.active, true),
        sql`(${users.id} = ${enrolment.cooperatorId ?? 0} OR ${users.id} IN (SELECT ${siteCooperators.userId} FROM ${siteCooperators} WHERE ${siteCooperators.siteId} = ${enrolment.siteId}))`,
      ),
    );
}

/** The active coordinators of the trial's program. */
export async function listCoordinatorRecipients(tx: Tx, enrolment: RecordableEnrolment) {
  return tx
    .select({ email: users.email, name: users.name })
    .from(programCoordinators)
    .innerJoin(users, eq(users.id, programCoordinators.userId))
    .where(and(eq(programCoordinators.programId, enrolment.programId), eq(users.active, true)));
}

/** How many values (or missing reasons) the site has recorded. */
export async function countEnrolmentObservations(tx: Tx, enrolmentId: number) {
  const [{ n } = { n: 0 }] = await tx
    .select({ n: sql<number>`COUNT(*)`.mapWith(Number) })
    .from(observations)
    .innerJoin(plots, eq(plots.id, observations.plotId))
    .where(eq(plots.enrolmentId, enrolmentId));
  return n;
}

/** Sets a data set's review state with who and when. */
export async function updateSubmission(
  tx: Tx,
  p: { id: number; status: SubmissionStatus; submittedAt?: Date; submittedById?: number; reviewedAt?: Date; reviewedById?: number; reviewComment?: string | null },
) {
  const { id, ...set } = p;
  await tx.update(submissions).set(set).where(eq(submissions.id, id));
}

/** Marks every open comment on a data set answered. */
export async function updateCommentsResolved(tx: Tx, submissionId: number) {
  await tx.update(reviewComments).set({ resolvedAt: new Date() }).where(and(eq(reviewComments.submissionId, submissionId), isNull(reviewComments.resolvedAt)));
}

/** Open comments on a data set, with the plot they are on. */
export async function listOpenCommentBodies(tx: Tx, submissionId: number) {
  return tx
    .select({ body: reviewComments.body, plotCode: plots.plotCode })
    .from(reviewComments)
    .leftJoin(plots, eq(plots.id, reviewComments.plotId))
    .where(and(eq(reviewComments.submissionId, submissionId), isNull(reviewComments.resolvedAt)));
}

/** Whether the plot belongs to the enrolment. */
export async function getEnrolmentPlotId(tx: Tx, p: { enrolmentId: number; plotId: number }) {
  const [plot] = await tx.select({ id: plots.id }).from(plots).where(and(eq(plots.id, p.plotId), eq(plots.enrolmentId, p.enrolmentId)));
  return plot?.id ?? null;
}

/** The observation recorded for one plot, trait and occasion, if any. */
export async function getPlotObservationId(tx: Tx, p: { plotId: number; traitId: number; occasion: number }) {
  const [obs] = await tx.select({ id: observations.id }).from(observations).where(and(eq(observations.plotId, p.plotId), eq(observations.traitId, p.traitId), eq(observations.occasion, p.occasion)));
  return obs?.id ?? null;
}

/** Stores a coordinator's comment and returns its id. */
export async function insertReviewCommentRow(tx: Tx, p: { submissionId: number; plotId: number | null; observationId: number | null; body: string; authorId: number }) {
  const [row] = await tx.insert(reviewComments).values(p).$returningId();
  return row!.id;
}

/** Whether the day's reminder for an enrolment was already queued (the audit log remembers it). */
export async function hasReminderBeenSent(tx: Tx, p: { enrolmentId: number; day: string }) {
  const [already] = await tx
    .select({ id: auditLog.id })
    .from(auditLog)
    .where(and(eq(auditLog.entity, "enrolment"), eq(auditLog.entityId, String(p.enrolmentId)), eq(auditLog.action, "reminder.sent"), sql`JSON_VALUE(${auditLog.newValue}, '$.day') = ${p.day}`));
  return Boolean(already);
}
