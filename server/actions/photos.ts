"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { removePhotoSchema } from "@/lib/validation/observations";
import { deletePhotoForViewer } from "@/server/photos/upload";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

/** Removes a photo (the site's growers, the trial's staff): its row with an audit entry, then its stored object. */
export const removePhoto = defineAction({ roles: ["cooperator", "coordinator", "admin"], schema: removePhotoSchema }, async (input, viewer) => {
  await deletePhotoForViewer(viewer, input.photoId);
  revalidatePath(`/portal/record/${input.trialId}/${input.siteId}`);
  return { ok: true, message: translatorFor(viewer.locale)("forms.photoRemoved") };
});
