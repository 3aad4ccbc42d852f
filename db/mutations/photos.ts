import "server-only";
import { and, eq } from "drizzle-orm";
import { db, type Tx } from "../index";
import { enrolments, photos, plots } from "../schema";
import { getRecordableEnrolment } from "../queries/observations";
import { insertAudit } from "../audit";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";

export interface PhotoTarget {
  trialId: number;
  siteId: number;
  plotId?: number;
}

/** Checks, before any bytes are processed or stored, that the viewer may attach a photo here. */
export async function assertPhotoTarget(viewer: Viewer, t: PhotoTarget) {
  const enrolment = await getRecordableEnrolment(db, viewer, t);
  if (!enrolment) throw new AppError("not_found", "That site or trial does not exist, or it is not one of yours.");
  if (t.plotId !== undefined) {
    const [plot] = await db.select({ id: plots.id }).from(plots).where(and(eq(plots.id, t.plotId), eq(plots.enrolmentId, enrolment.enrolmentId)));
    if (!plot) throw new AppError("not_found", "That plot is not one of this site's plots.");
  }
  return enrolment;
}

/** Records a stored photo with an audit entry; ownership is checked again inside the caller's transaction. */
export async function insertPhoto(tx: Tx, viewer: Viewer, t: PhotoTarget & { storageKey: string; contentType: string; bytes: number; caption?: string; takenOn?: string; keepLocation: boolean }) {
  const enrolment = await getRecordableEnrolment(tx, viewer, t, true);
  if (!enrolment) throw new AppError("not_found", "That site or trial does not exist, or it is not one of yours.");
  if (t.plotId !== undefined) {
    const [plot] = await tx.select({ id: plots.id }).from(plots).where(and(eq(plots.id, t.plotId), eq(plots.enrolmentId, enrolment.enrolmentId)));
    if (!plot) throw new AppError("not_found", "That plot is not one of this site's plots.");
  }
  const [row] = await tx
    .insert(photos)
    .values({ enrolmentId: enrolment.enrolmentId, plotId: t.plotId ?? null, storageKey: t.storageKey, contentType: t.contentType, bytes: t.bytes, caption: t.caption ?? null, takenOn: t.takenOn ?? null, keptLocation: t.keepLocation, uploadedById: viewer.id })
    .$returningId();
  await insertAudit(tx, { actorId: viewer.id, action: "photo.add", entity: "photo", entityId: row!.id, trialId: enrolment.trialId, newValue: { plotId: t.plotId ?? null, bytes: t.bytes, keptLocation: t.keepLocation, caption: t.caption ?? null } });
  return row!.id;
}

/**
 * Removes a photo's row with an audit entry, when the viewer may attach photos at its site (its growers, the
 * trial's staff); returns the storage key whose object the caller deletes after the commit, or null.
 */
export async function deletePhoto(tx: Tx, viewer: Viewer, photoId: number) {
  const [photo] = await tx
    .select({ id: photos.id, storageKey: photos.storageKey, plotId: photos.plotId, trialId: enrolments.trialId, siteId: enrolments.siteId })
    .from(photos)
    .innerJoin(enrolments, eq(enrolments.id, photos.enrolmentId))
    .where(eq(photos.id, photoId));
  if (!photo) return null;
  const enrolment = await getRecordableEnrolment(tx, viewer, { trialId: photo.trialId, siteId: photo.siteId }, true);
  if (!enrolment) return null;
  await tx.delete(photos).where(eq(photos.id, photo.id));
  await insertAudit(tx, { actorId: viewer.id, action: "photo.delete", entity: "photo", entityId: photo.id, trialId: photo.trialId, oldValue: { plotId: photo.plotId, storageKey: photo.storageKey } });
  return photo.storageKey;
}

/**
 * The storage keys of the photos taken of a site's plots, read in the caller's transaction before the plots
 * are replaced: their rows go with the plots (ON DELETE CASCADE), and the caller deletes the objects after commit.
 */
export async function listPlotPhotoKeys(tx: Tx, enrolmentId: number): Promise<string[]> {
  const rows = await tx
    .select({ storageKey: photos.storageKey })
    .from(photos)
    .innerJoin(plots, eq(plots.id, photos.plotId))
    .where(eq(plots.enrolmentId, enrolmentId));
  return rows.map((r) => r.storageKey);
}
