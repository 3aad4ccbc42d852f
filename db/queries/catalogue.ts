import "server-only";
import { and, asc, count, eq, or, sql } from "drizzle-orm";
import { db } from "../index";
import { crops, programs, seedLots, traits, varieties } from "../schema";
import { programIdIn, programScope, staffVarietyScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";

// How many of the viewer's trials use an item, so the tables can say why a delete or an edit would be
// refused; other programs' trials are never counted here. Written with explicit table names: Drizzle
// leaves columns unqualified in a one-table select, and an unqualified `id` inside the subquery would mean
// the subquery's own table.
const trialsGrowing = (viewer: Viewer) => sql<number>`(SELECT COUNT(*) FROM trials t WHERE t.crop_id = crops.id AND ${programIdIn(viewer, "t.program_id")})`.mapWith(Number);
const trialsWithVariety = (viewer: Viewer) =>
  sql<number>`(SELECT COUNT(DISTINCT te.trial_id) FROM trial_entries te JOIN trials t ON t.id = te.trial_id WHERE te.variety_id = varieties.id AND ${programIdIn(viewer, "t.program_id")})`.mapWith(Number);
const trialsWithLot = (viewer: Viewer) =>
  sql<number>`(SELECT COUNT(DISTINCT te.trial_id) FROM trial_entries te JOIN trials t ON t.id = te.trial_id WHERE te.seed_lot_id = seed_lots.id AND ${programIdIn(viewer, "t.program_id")})`.mapWith(Number);
const trialsRecording = (viewer: Viewer) =>
  sql<number>`(SELECT COUNT(*) FROM trial_traits tt JOIN trials t ON t.id = tt.trial_id WHERE tt.trait_id = traits.id AND ${programIdIn(viewer, "t.program_id")})`.mapWith(Number);
/** Whether another program grows the crop (trials or varieties), which leaves renaming and deleting it to admins. */
const cropUsedElsewhere = (viewer: Viewer) =>
  viewer.role === "admin"
    ? sql<boolean>`false`.mapWith((v) => Number(v) === 1)
    : sql<boolean>`(EXISTS (SELECT 1 FROM trials t WHERE t.crop_id = crops.id AND NOT (${programIdIn(viewer, "t.program_id")})) OR EXISTS (SELECT 1 FROM varieties v WHERE v.crop_id = crops.id AND NOT (${programIdIn(viewer, "v.program_id")})))`.mapWith((v) => Number(v) === 1);

/** The shared crop list with how many of the viewer's varieties and trials each has (staff only). */
export async function listCrops(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({
      id: crops.id,
      name: crops.name,
      cropGroup: crops.cropGroup,
      scientificName: crops.scientificName,
      varieties: count(varieties.id),
      trials: trialsGrowing(viewer),
      usedByOtherPrograms: cropUsedElsewhere(viewer),
    })
    .from(crops)
    .leftJoin(varieties, and(eq(varieties.cropId, crops.id), staffVarietyScope(viewer)))
    .groupBy(crops.id)
    .orderBy(asc(crops.name));
}

/** The viewer's programs' varieties with their crop, number of seed lots and trials (staff only; variety names are part of the blind key). */
export async function listVarieties(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({
      id: varieties.id,
      name: varieties.name,
      program: programs.name,
      cropId: crops.id,
      crop: crops.name,
      description: varieties.description,
      seedLots: count(seedLots.id),
      trials: trialsWithVariety(viewer),
    })
    .from(varieties)
    .innerJoin(crops, eq(crops.id, varieties.cropId))
    .innerJoin(programs, eq(programs.id, varieties.programId))
    .leftJoin(seedLots, eq(seedLots.varietyId, varieties.id))
    .where(staffVarietyScope(viewer))
    .groupBy(varieties.id, crops.id, programs.id)
    .orderBy(asc(crops.name), asc(varieties.name));
}

/** Seed lots of the viewer's programs' varieties, with variety and crop (staff only). Germination is null when the label does not state it. */
export async function listSeedLots(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({
      id: seedLots.id,
      varietyId: varieties.id,
      variety: varieties.name,
      crop: crops.name,
      source: seedLots.source,
      lotCode: seedLots.lotCode,
      labelGerminationPct: seedLots.labelGerminationPct,
      germinationTestDate: seedLots.germinationTestDate,
      packetDaysToMaturity: seedLots.packetDaysToMaturity,
      treated: seedLots.treated,
      treatment: seedLots.treatment,
      trials: trialsWithLot(viewer),
    })
    .from(seedLots)
    .innerJoin(varieties, eq(varieties.id, seedLots.varietyId))
    .innerJoin(crops, eq(crops.id, varieties.cropId))
    .where(staffVarietyScope(viewer))
    .orderBy(asc(crops.name), asc(varieties.name), asc(seedLots.lotCode));
}

/** The trait library by name: the shared built-in traits and the viewer's programs' own (staff only). */
export async function listTraits(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({
      id: traits.id,
      code: traits.code,
      name: traits.name,
      program: programs.name,
      unit: traits.unit,
      valueType: traits.valueType,
      minValue: traits.minValue,
      maxValue: traits.maxValue,
      dueDaysAfterSowing: traits.dueDaysAfterSowing,
      dueNote: traits.dueNote,
      computation: traits.computation,
      description: traits.description,
      builtIn: traits.builtIn,
      trials: trialsRecording(viewer),
    })
    .from(traits)
    .leftJoin(programs, eq(programs.id, traits.programId))
    .where(or(eq(traits.builtIn, true), programScope(viewer, traits.programId)))
    .orderBy(asc(traits.name));
}

export type CropRow = Awaited<ReturnType<typeof listCrops>>[number];
export type VarietyRow = Awaited<ReturnType<typeof listVarieties>>[number];
export type SeedLotRow = Awaited<ReturnType<typeof listSeedLots>>[number];
export type TraitRow = Awaited<ReturnType<typeof listTraits>>[number];
