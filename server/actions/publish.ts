"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { publishSchema, unpublishSchema } from "@/lib/validation/publish";
import { publishResults, withdrawResults } from "@/server/publish/publish";
import { deliverSoon } from "@/server/mail/outbox";

/** Publishes the trial (or one trait) as a new immutable version and tells its cooperators. */
export const publishTrial = defineAction({ roles: ["coordinator", "admin"], schema: publishSchema }, async (input, viewer) => {
  const { version } = await publishResults(viewer, {
    trialId: input.trialId,
    traitId: input.traitId,
    settings: { siteModel: input.siteModel, separation: input.separation, ...(input.mixed ? { mixed: true } : {}), stabilityInReport: input.stabilityInReport },
    changeNote: input.changeNote ?? null,
    confirmedLeftOut: input.confirmLeftOut,
  });
  await deliverSoon();
  revalidatePath("/results", "layout");
  revalidatePath(`/portal/trials/${input.trialId}/publish`);
  return { ok: true, message: `Published as version ${version}.` };
});

/** Withdraws the public results; the public page keeps a notice with the reason. */
export const unpublishTrial = defineAction({ roles: ["coordinator", "admin"], schema: unpublishSchema }, async (input, viewer) => {
  await withdrawResults(viewer, { trialId: input.trialId, reason: input.reason });
  revalidatePath("/results", "layout");
  revalidatePath(`/portal/trials/${input.trialId}/publish`);
  return { ok: true, message: "The results are withdrawn. The public page now shows your reason." };
});
