import "server-only";
import { and, eq, isNull, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { auditLog, observations, plots, programCoordinators, reviewComments, siteCooperators, submissions, users } from "../schema";
import { getRecordableEnrolment, getRecordingSheet, listTrialColumns, type RecordableEnrolment } from "../queries/observations";
import { listReminderTargets } from "../queries/review";
import { insertAudit } from "../audit";
import { insertMail } from "./mail";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";
import type { SubmissionStatus } from "@/lib/domain/vocabulary/enums";
import { dataAcceptedMail, dataReturnedMail, reminderMail, submissionReceivedMail } from "@/lib/domain/mail/observation-mails";
import { addDays, todayIso } from "@/lib/domain/schedule";

interface Links {
  appUrl: string;
}

async function lockSubmission(tx: Tx, viewer: Viewer, p: { trialId: number; siteId: number }) {
  const enrolment = await getRecordableEnrolment(tx, viewer, p, true);
  if (!enrolment) throw new AppError("not_found", "That site or trial does not exist, or it is not one of yours.");
  let [sub] = await tx.select({ id: submissions.id, status: submissions.status }).from(submissions).where(eq(submissions.enrolmentId, enrolment.enrolmentId)).for("update");
  if (!sub) {
    const [created] = await tx.insert(submissions).values({ enrolmentId: enrolment.enrolmentId, status: "draft" }).$returningId();
    sub = { id: created!.id, status: "draft" };
  }
  return { enrolment, submission: sub };
}

async function growerRecipients(tx: Tx, enrolment: RecordableEnrolment) {
  return tx
    .selectDistinct({ email: users.email, name: users.name })
    .from(users)
    .where(
      and(
        eq(users.active, true),
        sql`(${users.id} = ${enrolment.cooperatorId ?? 0} OR ${users.id} IN (SELECT ${siteCooperators.userId} FROM ${siteCooperators} WHERE ${siteCooperators.siteId} = ${enrolment.siteId}))`,
      ),
    );
}

async function coordinatorRecipients(tx: Tx, enrolment: RecordableEnrolment) {
  return tx
    .select({ email: users.email, name: users.name })
    .from(programCoordinators)
    .innerJoin(users, eq(users.id, programCoordinators.userId))
    .where(and(eq(programCoordinators.programId, enrolment.programId), eq(users.active, true)));
}

function transition(from: SubmissionStatus, allowed: SubmissionStatus[], message: string) {
  if (!allowed.includes(from)) throw new AppError("conflict", message);
}

const recordLink = (l: Links, e: RecordableEnrolment) => `${l.appUrl.replace(/\/$/, "")}/portal/record/${e.trialId}/${e.siteId}`;
const reviewLink = (l: Links, e: RecordableEnrolment) => `${l.appUrl.replace(/\/$/, "")}/portal/review/${e.trialId}/${e.siteId}`;

/** The grower sends the site's data for review (draft or returned -> submitted); coordinators are e-mailed. */
export async function updateSubmissionSubmitted(viewer: Viewer, p: { trialId: number; siteId: number }, links: Links) {
  return db.transaction(async (tx) => {
    const { enrolment, submission } = await lockSubmission(tx, viewer, p);
    transition(submission.status, ["draft", "returned"], submission.status === "submitted" ? "This data has already been sent for review." : "This data has been accepted and is locked.");
    const [{ n } = { n: 0 }] = await tx
      .select({ n: sql<number>`COUNT(*)`.mapWith(Number) })
      .from(observations)
      .innerJoin(plots, eq(plots.id, observations.plotId))
      .where(eq(plots.enrolmentId, enrolment.enrolmentId));
    if (n === 0) throw new AppError("conflict", "There are no values to send yet. Record some values first.");
    await tx.update(submissions).set({ status: "submitted", submittedAt: new Date(), submittedById: viewer.id }).where(eq(submissions.id, submission.id));
    // Sending again answers the coordinator's open comments.
    await tx.update(reviewComments).set({ resolvedAt: new Date() }).where(and(eq(reviewComments.submissionId, submission.id), isNull(reviewComments.resolvedAt)));
    await insertAudit(tx, { actorId: viewer.id, action: "submission.submit", entity: "submission", entityId: submission.id, trialId: enrolment.trialId, oldValue: { status: submission.status }, newValue: { status: "submitted" } });
    for (const c of await coordinatorRecipients(tx, enrolment)) {
      await insertMail(tx, submissionReceivedMail({ to: c.email, name: c.name, siteName: enrolment.siteName, trialTitle: enrolment.trialTitle, growerName: viewer.name, link: reviewLink(links, enrolment) }));
    }
    return { submissionId: submission.id };
  });
}

/** The coordinator accepts submitted data (submitted -> accepted); the growers are e-mailed. */
export async function updateSubmissionAccepted(viewer: Viewer, p: { trialId: number; siteId: number }, links: Links) {
  if (!isStaff(viewer)) throw new AppError("forbidden", "Only coordinators can accept data.");
  return db.transaction(async (tx) => {
    const { enrolment, submission } = await lockSubmission(tx, viewer, p);
    transition(submission.status, ["submitted"], "Only data that has been sent for review can be accepted.");
    await tx.update(submissions).set({ status: "accepted", reviewedAt: new Date(), reviewedById: viewer.id }).where(eq(submissions.id, submission.id));
    await tx.update(reviewComments).set({ resolvedAt: new Date() }).where(and(eq(reviewComments.submissionId, submission.id), isNull(reviewComments.resolvedAt)));
    await insertAudit(tx, { actorId: viewer.id, action: "submission.accept", entity: "submission", entityId: submission.id, trialId: enrolment.trialId, oldValue: { status: submission.status }, newValue: { status: "accepted" } });
    for (const g of await growerRecipients(tx, enrolment)) {
      await insertMail(tx, dataAcceptedMail({ to: g.email, name: g.name, siteName: enrolment.siteName, trialTitle: enrolment.trialTitle, link: recordLink(links, enrolment) }));
    }
  });
}

/** The coordinator returns submitted data with comments (submitted -> returned); the growers are e-mailed. */
export async function updateSubmissionReturned(viewer: Viewer, p: { trialId: number; siteId: number; message?: string }, links: Links) {
  if (!isStaff(viewer)) throw new AppError("forbidden", "Only coordinators can return data.");
  return db.transaction(async (tx) => {
    const { enrolment, submission } = await lockSubmission(tx, viewer, p);
    transition(submission.status, ["submitted"], "Only data that has been sent for review can be returned.");
    const open = await tx
      .select({ body: reviewComments.body, plotCode: plots.plotCode })
      .from(reviewComments)
      .leftJoin(plots, eq(plots.id, reviewComments.plotId))
      .where(and(eq(reviewComments.submissionId, submission.id), isNull(reviewComments.resolvedAt)));
    if (open.length === 0 && !p.message) throw new AppError("bad_request", "Add a comment on a value or a message saying what to check before returning the data.", { message: ["Say what the grower should check."] });
    await tx.update(submissions).set({ status: "returned", reviewedAt: new Date(), reviewedById: viewer.id, reviewComment: p.message ?? null }).where(eq(submissions.id, submission.id));
    await insertAudit(tx, { actorId: viewer.id, action: "submission.return", entity: "submission", entityId: submission.id, trialId: enrolment.trialId, oldValue: { status: submission.status }, newValue: { status: "returned", message: p.message ?? null, comments: open.length } });
    const comments = open.map((c) => (c.plotCode ? `Plot ${c.plotCode}: ${c.body}` : c.body));
    for (const g of await growerRecipients(tx, enrolment)) {
      await insertMail(tx, dataReturnedMail({ to: g.email, name: g.name, siteName: enrolment.siteName, trialTitle: enrolment.trialTitle, message: p.message ?? null, comments, link: recordLink(links, enrolment) }));
    }
  });
}

/** A coordinator's comment on a site's data, on a plot or one value of it. */
export async function insertReviewComment(viewer: Viewer, p: { trialId: number; siteId: number; plotId?: number; key?: string; body: string }) {
  if (!isStaff(viewer)) throw new AppError("forbidden", "Only coordinators can comment on data.");
  return db.transaction(async (tx) => {
    const { enrolment, submission } = await lockSubmission(tx, viewer, p);
    let observationId: number | null = null;
    if (p.plotId !== undefined) {
      const [plot] = await tx.select({ id: plots.id }).from(plots).where(and(eq(plots.id, p.plotId), eq(plots.enrolmentId, enrolment.enrolmentId)));
      if (!plot) throw new AppError("not_found", "That plot is not part of this site.");
      if (p.key) {
        const column = (await listTrialColumns(tx, enrolment.trialId)).find((c) => c.key === p.key);
        if (!column) throw new AppError("bad_request", "This trial does not record that value.");
        const [obs] = await tx.select({ id: observations.id }).from(observations).where(and(eq(observations.plotId, plot.id), eq(observations.traitId, column.traitId), eq(observations.occasion, column.occasion)));
        observationId = obs?.id ?? null;
      }
    }
    const [row] = await tx.insert(reviewComments).values({ submissionId: submission.id, plotId: p.plotId ?? null, observationId, body: p.body, authorId: viewer.id }).$returningId();
    await insertAudit(tx, { actorId: viewer.id, action: "review_comment.add", entity: "review_comment", entityId: row!.id, trialId: enrolment.trialId, newValue: { plotId: p.plotId ?? null, key: p.key ?? null, body: p.body } });
    return row!.id;
  });
}

// The reminder job reads every active site; it acts for the program, not for a signed-in person.
const SYSTEM_READER: Viewer = { id: 0, email: "system@seedplot.invalid", name: "Seedplot", role: "admin" };

/**
 * Queues one reminder per grower and site for counts due tomorrow or overdue, at most once a day per
 * site: the audit log remembers which days were already reminded. Returns how many messages were queued.
 */
export async function insertDueReminders(p: { today?: string; appUrl: string }) {
  const today = p.today ?? todayIso();
  const tomorrow = addDays(today, 1);
  let queued = 0;
  for (const target of await listReminderTargets(today)) {
    const sheet = await getRecordingSheet(SYSTEM_READER, target, today);
    if (!sheet || sheet.submission?.status === "submitted" || sheet.submission?.status === "accepted") continue;
    const dueTomorrow = sheet.due.filter((d) => d.status === "upcoming" && d.dueOn === tomorrow);
    const overdue = sheet.due.filter((d) => d.status === "late");
    if (dueTomorrow.length === 0 && overdue.length === 0) continue;
    queued += await db.transaction(async (tx) => {
      const enrolment = await getRecordableEnrolment(tx, SYSTEM_READER, target, true);
      if (!enrolment) return 0;
      const [already] = await tx
        .select({ id: auditLog.id })
        .from(auditLog)
        .where(and(eq(auditLog.entity, "enrolment"), eq(auditLog.entityId, String(enrolment.enrolmentId)), eq(auditLog.action, "reminder.sent"), sql`JSON_VALUE(${auditLog.newValue}, '$.day') = ${today}`));
      if (already) return 0;
      const label = (d: (typeof overdue)[number]) => `${d.traitName}, day ${d.occasion} (due ${d.dueOn}): ${d.expected - d.recorded} of ${d.expected} plots to record`;
      const recipients = await growerRecipients(tx, enrolment);
      for (const g of recipients) {
        await insertMail(tx, reminderMail({ to: g.email, name: g.name, siteName: enrolment.siteName, trialTitle: enrolment.trialTitle, tomorrow: dueTomorrow.map(label), overdue: overdue.map(label), link: `${p.appUrl.replace(/\/$/, "")}/portal/record/${enrolment.trialId}/${enrolment.siteId}` }));
      }
      await insertAudit(tx, { actorId: null, action: "reminder.sent", entity: "enrolment", entityId: enrolment.enrolmentId, trialId: enrolment.trialId, newValue: { day: today, to: recipients.length, tomorrow: dueTomorrow.length, overdue: overdue.length } });
      return recipients.length;
    });
  }
  return queued;
}
