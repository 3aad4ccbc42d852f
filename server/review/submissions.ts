import "server-only";
import { db } from "@/db/index";
import type { RecordableEnrolment } from "@/db/queries/observations";
import { insertAudit } from "@/db/audit";
import { insertMail } from "@/db/mutations/mail";
import {
  countEnrolmentObservations,
  getEnrolmentPlotId,
  getPlotObservationId,
  insertReviewCommentRow,
  listCoordinatorRecipients,
  listGrowerRecipients,
  listOpenCommentBodies,
  lockSubmission,
  updateCommentsResolved,
  updateSubmission,
} from "@/db/mutations/review";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";
import type { SubmissionStatus } from "@/lib/domain/vocabulary/enums";
import { dataAcceptedMail, dataReturnedMail, submissionReceivedMail } from "@/lib/domain/mail/observation-mails";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { listTrialColumns } from "@/server/observations/sheet";

export interface Links {
  appUrl: string;
}

function transition(from: SubmissionStatus, allowed: SubmissionStatus[], message: string) {
  if (!allowed.includes(from)) throw new AppError("conflict", message);
}

export const recordLink = (l: Links, e: Pick<RecordableEnrolment, "trialId" | "siteId">) => `${l.appUrl.replace(/\/$/, "")}/portal/record/${e.trialId}/${e.siteId}`;
const reviewLink = (l: Links, e: RecordableEnrolment) => `${l.appUrl.replace(/\/$/, "")}/portal/review/${e.trialId}/${e.siteId}`;

/** The grower sends the site's data for review (draft or returned -> submitted); coordinators are e-mailed. */
export async function updateSubmissionSubmitted(viewer: Viewer, p: { trialId: number; siteId: number }, links: Links) {
  return db.transaction(async (tx) => {
    const { enrolment, submission } = await lockSubmission(tx, viewer, p);
    const t = translatorFor(viewer.locale);
    transition(submission.status, ["draft", "returned"], t(submission.status === "submitted" ? "forms.alreadySent" : "forms.acceptedNoSend"));
    if ((await countEnrolmentObservations(tx, enrolment.enrolmentId)) === 0) throw new AppError("conflict", t("forms.nothingToSend"));
    await updateSubmission(tx, { id: submission.id, status: "submitted", submittedAt: new Date(), submittedById: viewer.id });
    // Sending again answers the coordinator's open comments.
    await updateCommentsResolved(tx, submission.id);
    await insertAudit(tx, { actorId: viewer.id, action: "submission.submit", entity: "submission", entityId: submission.id, trialId: enrolment.trialId, oldValue: { status: submission.status }, newValue: { status: "submitted" } });
    for (const c of await listCoordinatorRecipients(tx, enrolment)) {
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
    await updateSubmission(tx, { id: submission.id, status: "accepted", reviewedAt: new Date(), reviewedById: viewer.id });
    await updateCommentsResolved(tx, submission.id);
    await insertAudit(tx, { actorId: viewer.id, action: "submission.accept", entity: "submission", entityId: submission.id, trialId: enrolment.trialId, oldValue: { status: submission.status }, newValue: { status: "accepted" } });
    for (const g of await listGrowerRecipients(tx, enrolment)) {
      await insertMail(tx, dataAcceptedMail({ to: g.email, name: g.name, siteName: enrolment.siteName, trialTitle: enrolment.trialTitle, link: recordLink(links, enrolment), locale: g.locale }));
    }
  });
}

/** The coordinator returns submitted data with comments (submitted -> returned); the growers are e-mailed. */
export async function updateSubmissionReturned(viewer: Viewer, p: { trialId: number; siteId: number; message?: string }, links: Links) {
  if (!isStaff(viewer)) throw new AppError("forbidden", "Only coordinators can return data.");
  return db.transaction(async (tx) => {
    const { enrolment, submission } = await lockSubmission(tx, viewer, p);
    transition(submission.status, ["submitted"], "Only data that has been sent for review can be returned.");
    const open = await listOpenCommentBodies(tx, submission.id);
    if (open.length === 0 && !p.message) throw new AppError("bad_request", "Add a comment on a value or a message saying what to check before returning the data.", { message: ["Say what the grower should check."] });
    await updateSubmission(tx, { id: submission.id, status: "returned", reviewedAt: new Date(), reviewedById: viewer.id, reviewComment: p.message ?? null });
    await insertAudit(tx, { actorId: viewer.id, action: "submission.return", entity: "submission", entityId: submission.id, trialId: enrolment.trialId, oldValue: { status: submission.status }, newValue: { status: "returned", message: p.message ?? null, comments: open.length } });
    for (const g of await listGrowerRecipients(tx, enrolment)) {
      // The frame is in the grower's language; the coordinator's own words go as they were written.
      const t = translatorFor(g.locale);
      const comments = open.map((c) => (c.plotCode ? t("record.plotComment", { plot: c.plotCode, comment: c.body }) : c.body));
      await insertMail(tx, dataReturnedMail({ to: g.email, name: g.name, siteName: enrolment.siteName, trialTitle: enrolment.trialTitle, message: p.message ?? null, comments, link: recordLink(links, enrolment), locale: g.locale }));
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
      const plotId = await getEnrolmentPlotId(tx, { enrolmentId: enrolment.enrolmentId, plotId: p.plotId });
      if (plotId === null) throw new AppError("not_found", "That plot is not part of this site.");
      if (p.key) {
        const column = (await listTrialColumns(tx, enrolment.trialId)).find((c) => c.key === p.key);
        if (!column) throw new AppError("bad_request", "This trial does not record that value.");
        observationId = await getPlotObservationId(tx, { plotId, traitId: column.traitId, occasion: column.occasion });
      }
    }
    const id = await insertReviewCommentRow(tx, { submissionId: submission.id, plotId: p.plotId ?? null, observationId, body: p.body, authorId: viewer.id });
    await insertAudit(tx, { actorId: viewer.id, action: "review_comment.add", entity: "review_comment", entityId: id, trialId: enrolment.trialId, newValue: { plotId: p.plotId ?? null, key: p.key ?? null, body: p.body } });
    return id;
  });
}
