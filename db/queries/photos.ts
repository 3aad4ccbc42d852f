import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { db } from "../index";
import { enrolments, photos, plots, trials } from "../schema";
import { recordScope } from "./observations";
import type { Viewer } from "@/lib/domain/viewer";

/** Photos of one site in one trial, newest first, for the site's growers and the trial's staff. */
export async function listSitePhotos(viewer: Viewer, p: { trialId: number; siteId: number }) {
  return db
    .select({ id: photos.id, plotId: photos.plotId, plotCode: plots.plotCode, caption: photos.caption, takenOn: photos.takenOn, keptLocation: photos.keptLocation, createdAt: photos.createdAt })
    .from(photos)
    .innerJoin(enrolments, eq(enrolments.id, photos.enrolmentId))
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .leftJoin(plots, eq(plots.id, photos.plotId))
    .where(and(eq(enrolments.trialId, p.trialId), eq(enrolments.siteId, p.siteId), recordScope(viewer)))
    .orderBy(desc(photos.id))
    .limit(200);
}

/** One photo's storage key and type if the viewer may see it; null otherwise. */
export async function getPhotoForViewer(viewer: Viewer, photoId: number) {
  const [row] = await db
    .select({ storageKey: photos.storageKey, contentType: photos.contentType })
    .from(photos)
    .innerJoin(enrolments, eq(enrolments.id, photos.enrolmentId))
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .where(and(eq(photos.id, photoId), recordScope(viewer)));
  return row ?? null;
}
