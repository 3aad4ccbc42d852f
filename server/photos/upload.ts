import "server-only";
import { randomUUID } from "node:crypto";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { photoFieldsSchema } from "@/lib/validation/observations";
import { fieldErrorsOf, parseIn } from "@/lib/validation/field-errors";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { assertPhotoTarget, deletePhoto, insertPhoto } from "@/db/mutations/photos";
import { getPhotoForViewer } from "@/db/queries/photos";
import { getStorage } from "@/server/storage";
import { deleteStoredPhotos } from "./stored-objects";
import { db } from "@/db/index";
import { PhotoRefused, preparePhoto } from "./images";

const EXT = { "image/jpeg": "jpg", "image/png": "png", "image/webp": "webp" } as const;

/** Route core: validates the fields, checks ownership, re-encodes the image, stores it, then records it. */
export async function uploadPhotoForViewer(viewer: Viewer, fields: Record<string, unknown>, bytes: Uint8Array) {
  const t = translatorFor(viewer.locale);
  const parsed = parseIn(photoFieldsSchema, fields, t);
  if (!parsed.success) throw new AppError("bad_request", parsed.error.issues[0]?.message ?? t("forms.notUnderstood"), fieldErrorsOf(parsed.error));
  const input = parsed.data;
  const enrolment = await assertPhotoTarget(viewer, input);
  let prepared;
  try {
    prepared = await preparePhoto(bytes, { keepLocation: input.keepLocation, t });
  } catch (e) {
    if (e instanceof PhotoRefused) throw new AppError("bad_request", e.message);
    throw e;
  }
  const storageKey = `photos/${enrolment.trialId}/${enrolment.siteId}/${randomUUID()}.${EXT[prepared.contentType]}`;
  const storage = getStorage();
  await storage.put(storageKey, prepared.bytes, prepared.contentType);
  try {
    const id = await db.transaction((tx) => insertPhoto(tx, viewer, { ...input, storageKey, contentType: prepared.contentType, bytes: prepared.bytes.length }));
    return { id, contentType: prepared.contentType, bytes: prepared.bytes.length };
  } catch (e) {
    // No row, no file: a failed insert must not leave an orphan on disk.
    await storage.delete(storageKey).catch(() => undefined);
    throw e;
  }
}

/** Route core for showing a photo: only to the site's growers and the trial's staff. */
export async function readPhotoForViewer(viewer: Viewer, photoId: number) {
  const photo = await getPhotoForViewer(viewer, photoId);
  if (!photo) throw new AppError("not_found", "That photo does not exist, or it is not one of yours.");
  const bytes = await getStorage().get(photo.storageKey);
  if (!bytes) throw new AppError("not_found", "That photo's file is missing.");
  return { bytes, contentType: photo.contentType };
}

/**
 * Route core for removing a photo: its row goes first (one transaction, with the audit entry), then its
 * object, so a failure in between leaves at worst an unreferenced object, never a row pointing at nothing.
 */
export async function deletePhotoForViewer(viewer: Viewer, photoId: number) {
  const storageKey = await db.transaction((tx) => deletePhoto(tx, viewer, photoId));
  if (!storageKey) throw new AppError("not_found", translatorFor(viewer.locale)("forms.noSuchPhoto"));
  await deleteStoredPhotos([storageKey]);
}
