import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { db } from "../index";
import { crops, seasons, traits, trialTraits, trials } from "../schema";
import { staffTrialScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";

/** Crops the viewer's programs have trials of (staff only), for the across-seasons view. */
export async function listCropsWithTrials(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .selectDistinct({ id: crops.id, name: crops.name })
    .from(trials)
    .innerJoin(crops, eq(crops.id, trials.cropId))
    .where(staffTrialScope(viewer))
    .orderBy(asc(crops.name));
}

/** Every trial of one crop in the viewer's programs, newest season first (staff only). */
export async function listCropTrials(viewer: Viewer, cropId: number) {
  if (!isStaff(viewer)) return [];
  return db
    .select({ id: trials.id, code: trials.code, title: trials.title, status: trials.status, season: seasons.name, year: seasons.year, seasonId: seasons.id })
    .from(trials)
    .innerJoin(seasons, eq(seasons.id, trials.seasonId))
    .where(and(eq(trials.cropId, cropId), staffTrialScope(viewer)))
    .orderBy(desc(seasons.year), desc(seasons.id), asc(trials.code));
}

/** The traits recorded by any of these trials, by code (the same trait across seasons), staff only. */
export async function listTraitsOfTrials(viewer: Viewer, trialIds: number[]) {
  if (!isStaff(viewer) || trialIds.length === 0) return [];
  return db
    .selectDistinct({ code: traits.code, name: traits.name, valueType: traits.valueType })
    .from(trialTraits)
    .innerJoin(traits, eq(traits.id, trialTraits.traitId))
    .innerJoin(trials, eq(trials.id, trialTraits.trialId))
    .where(and(inArray(trialTraits.trialId, trialIds), staffTrialScope(viewer)))
    .orderBy(asc(traits.name));
}
