import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { db } from "../index";
import { crops, plots, programs, seasons, seedLots, trialEntries, trialTraits, traits, trials, varieties } from "../schema";
import { staffTrialScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";

// Building blocks shared by the trial page, publishing and analysis queries. Callers check the
// viewer's role first; `findStaffTrial` also scopes the trial to the viewer's programs.

/** A plot's place in the layout and its blind code: what every plot list shows (select with plots joined to trial_entries). */
export const plotLayoutFields = {
  id: plots.id,
  plotCode: plots.plotCode,
  block: plots.block,
  position: plots.position,
  tray: plots.tray,
  traySlot: plots.traySlot,
  blindCode: trialEntries.blindCode,
};

/** One trial with its crop, season and program names; null when it is not in the viewer's programs. */
export async function findStaffTrial(viewer: Viewer, trialId: number) {
  const [row] = await db
    .select({
      id: trials.id,
      code: trials.code,
      title: trials.title,
      purpose: trials.purpose,
      status: trials.status,
      design: trials.design,
      blocks: trials.blocks,
      plotUnit: trials.plotUnit,
      plotSize: trials.plotSize,
      seedsPerCell: trials.seedsPerCell,
      protocol: trials.protocol,
      cropId: trials.cropId,
      crop: crops.name,
      cropGroup: crops.cropGroup,
      season: seasons.name,
      year: seasons.year,
      program: programs.name,
    })
    .from(trials)
    .innerJoin(crops, eq(crops.id, trials.cropId))
    .innerJoin(seasons, eq(seasons.id, trials.seasonId))
    .innerJoin(programs, eq(programs.id, trials.programId))
    .where(and(eq(trials.id, trialId), staffTrialScope(viewer)));
  return row ?? null;
}

/** A trial's entries in entry order with variety and seed lot (decoded: staff only). */
export function listEntriesWithLots(trialId: number) {
  return db
    .select({
      id: trialEntries.id,
      entryNumber: trialEntries.entryNumber,
      blindCode: trialEntries.blindCode,
      isCheck: trialEntries.isCheck,
      varietyId: varieties.id,
      variety: varieties.name,
      seedLotId: seedLots.id,
      source: seedLots.source,
      lotCode: seedLots.lotCode,
      labelGerminationPct: seedLots.labelGerminationPct,
      treated: seedLots.treated,
    })
    .from(trialEntries)
    .innerJoin(varieties, eq(varieties.id, trialEntries.varietyId))
    .leftJoin(seedLots, eq(seedLots.id, trialEntries.seedLotId))
    .where(eq(trialEntries.trialId, trialId))
    .orderBy(asc(trialEntries.entryNumber));
}

/** The traits a trial records, in the coordinator's order, with their valid range. */
export function listTrialTraits(trialId: number) {
  return db
    .select({
      id: traits.id,
      code: traits.code,
      name: traits.name,
      unit: traits.unit,
      valueType: traits.valueType,
      minValue: traits.minValue,
      maxValue: traits.maxValue,
      description: traits.description,
      dueNote: traits.dueNote,
      dueDaysAfterSowing: traits.dueDaysAfterSowing,
    })
    .from(trialTraits)
    .innerJoin(traits, eq(traits.id, trialTraits.traitId))
    .where(eq(trialTraits.trialId, trialId))
    .orderBy(asc(trialTraits.sortOrder));
}
