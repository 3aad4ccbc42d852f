"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { publishSchema, unpublishSchema } from "@/lib/validation/publish";
import { insertPublishedReport, updateUnpublished } from "@/db/mutations/publish";
import { listTrialCooperatorEmails } from "@/db/queries/publish";
import { buildSnapshot } from "@/server/publish/build";
import { resultsPublishedMail } from "@/lib/domain/mail/templates";
import { deliverSoon } from "@/server/mail/outbox";
import { env } from "@/lib/env";

/** Publishes the trial (or one trait) as a new immutable version and tells its cooperators. */
export const publishTrial = defineAction({ roles: ["coordinator", "admin"], schema: publishSchema }, async (input, viewer) => {
  const cooperators = await listTrialCooperatorEmails(input.trialId);
  const { version } = await insertPublishedReport(viewer, {
    trialId: input.trialId,
    traitId: input.traitId,
    changeNote: input.changeNote ?? null,
    build: (v, publishedAt) =>
      buildSnapshot(viewer, {
        trialId: input.trialId,
        traitId: input.traitId,
        settings: { siteModel: input.siteModel, separation: input.separation },
        version: v,
        changeNote: input.changeNote ?? null,
        publishedAt,
      }),
    notices: (snapshot) =>
      cooperators.map((c) =>
        resultsPublishedMail({ to: c.email, name: c.name, trialTitle: snapshot.trial.title, version: snapshot.version, link: `${env.APP_URL}/results/${snapshot.trial.code}` }),
      ),
  });
  await deliverSoon();
  revalidatePath("/results", "layout");
  revalidatePath(`/portal/trials/${input.trialId}/publish`);
  return { ok: true, message: `Published as version ${version}.` };
});

/** Withdraws the public results; the public page keeps a notice with the reason. */
export const unpublishTrial = defineAction({ roles: ["coordinator", "admin"], schema: unpublishSchema }, async (input, viewer) => {
  await updateUnpublished(viewer, { trialId: input.trialId, reason: input.reason });
  revalidatePath("/results", "layout");
  revalidatePath(`/portal/trials/${input.trialId}/publish`);
  return { ok: true, message: "The results are withdrawn. The public page now shows your reason." };
});
