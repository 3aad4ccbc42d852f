// Removal of the throwaway trials that benchmarks add to a running database (bench:analysis, bench:load).
import { and, eq, inArray, like } from "drizzle-orm";
import type { Database } from "../db/client";
import * as s from "../db/schema";

/** What a benchmark made for its trial, recognised by name so demo data is never touched. */
export interface ThrowawayNames {
  /** sites enrolled in the trial whose names start with this are deleted with it */
  sitePrefix: string;
  /** the trial's crop (and its varieties) is deleted when the crop's name starts with this */
  cropPrefix: string;
  /** cooperator accounts enrolled in the trial whose e-mail starts with this are deleted with it */
  emailPrefix?: string;
}

/**
 * Deletes a throwaway trial and everything added for it: plots first (values, history and review
 * items go with them), then enrolments, entries and the trial, then the sites, varieties, crop and
 * accounts made for it. Audit entries stay, with the deleted account shown as unknown.
 */
export async function removeThrowawayTrial(db: Database, trialId: number, names: ThrowawayNames): Promise<void> {
  const [trial] = await db.select({ cropId: s.trials.cropId }).from(s.trials).where(eq(s.trials.id, trialId));
  if (!trial) return;
  const enrolled = await db
    .select({ siteId: s.enrolments.siteId, cooperatorId: s.enrolments.cooperatorId })
    .from(s.enrolments)
    .where(eq(s.enrolments.trialId, trialId));
  const siteIds = enrolled.map((r) => r.siteId);
  const userIds = enrolled.flatMap((r) => (r.cooperatorId === null ? [] : [r.cooperatorId]));
  // Children first: plots refer to entries and sites with ON DELETE RESTRICT.
  await db.delete(s.plots).where(eq(s.plots.trialId, trialId));
  await db.delete(s.enrolments).where(eq(s.enrolments.trialId, trialId));
  await db.delete(s.trialEntries).where(eq(s.trialEntries.trialId, trialId));
  await db.delete(s.trials).where(eq(s.trials.id, trialId));
  if (siteIds.length > 0) await db.delete(s.sites).where(and(inArray(s.sites.id, siteIds), like(s.sites.name, `${names.sitePrefix}%`)));
  const [crop] = await db.select({ name: s.crops.name }).from(s.crops).where(eq(s.crops.id, trial.cropId));
  if (crop?.name.startsWith(names.cropPrefix)) {
    await db.delete(s.varieties).where(eq(s.varieties.cropId, trial.cropId));
    await db.delete(s.crops).where(eq(s.crops.id, trial.cropId));
  }
  if (names.emailPrefix && userIds.length > 0) {
    await db.delete(s.users).where(and(inArray(s.users.id, userIds), like(s.users.email, `${names.emailPrefix}%`)));
  }
}

/** Removes every trial whose code starts with `codePrefix`, left behind by an interrupted run. */
export async function removeLeftoverTrials(db: Database, codePrefix: string, names: ThrowawayNames): Promise<string[]> {
  const leftovers = await db.select({ id: s.trials.id, code: s.trials.code }).from(s.trials).where(like(s.trials.code, `${codePrefix}%`));
  for (const old of leftovers) await removeThrowawayTrial(db, old.id, names);
  return leftovers.map((t) => t.code);
}
