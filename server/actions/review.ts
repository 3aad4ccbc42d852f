"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { returnSubmissionSchema, reviewCommentSchema, siteParamsSchema } from "@/lib/validation/observations";
import { insertReviewComment, updateSubmissionAccepted, updateSubmissionReturned, updateSubmissionSubmitted } from "@/server/review/submissions";
import { deliverSoon } from "@/server/mail/outbox";
import { env } from "@/lib/env";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

const STAFF = ["coordinator", "admin"] as ("coordinator" | "admin")[];
const paths = (p: { trialId: number; siteId: number }) => {
  revalidatePath(`/portal/record/${p.trialId}/${p.siteId}`);
  revalidatePath(`/portal/review/${p.trialId}/${p.siteId}`);
  revalidatePath("/portal/review");
  revalidatePath("/portal/record");
};

export const submitForReview = defineAction({ roles: ["cooperator", "coordinator", "admin"], schema: siteParamsSchema }, async (input, viewer) => {
  await updateSubmissionSubmitted(viewer, input, { appUrl: env.APP_URL });
  await deliverSoon();
  paths(input);
  return { ok: true, message: translatorFor(viewer.locale)("forms.sentForReview") };
});

export const acceptSubmission = defineAction({ roles: STAFF, schema: siteParamsSchema }, async (input, viewer) => {
  await updateSubmissionAccepted(viewer, input, { appUrl: env.APP_URL });
  await deliverSoon();
  paths(input);
  return { ok: true, message: "Accepted. The grower has been told." };
});

export const returnSubmission = defineAction({ roles: STAFF, schema: returnSubmissionSchema }, async (input, viewer) => {
  await updateSubmissionReturned(viewer, input, { appUrl: env.APP_URL });
  await deliverSoon();
  paths(input);
  return { ok: true, message: "Returned with your comments. The grower has been e-mailed." };
});

export const addReviewComment = defineAction({ roles: STAFF, schema: reviewCommentSchema }, async (input, viewer) => {
  await insertReviewComment(viewer, input);
  paths(input);
  return { ok: true, message: "Comment added. It goes to the grower when you return the data." };
});
