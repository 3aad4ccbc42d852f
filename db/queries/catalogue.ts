import "server-only";
import { asc, count, eq, sql } from "drizzle-orm";
import { db } from "../index";
import { crops, seedLots, traits, varieties } from "../schema";
import type { Viewer } from "@/lib/auth/types";

const isStaff = (v: Viewer) => v.role === "coordinator" || v.role === "admin";

// How many trials use an item, so the tables can say why a delete or an edit would be refused. Written
// with explicit table names: Drizzle leaves columns unqualified in a one-table select, and an unqualified
// `id` inside the subquery would mean the subquery's own table.
const trialsGrowing = sql<number>`(SELECT COUNT(*) FROM trials t WHERE t.crop_id = crops.id)`.mapWith(Number);
const trialsWithVariety = sql<number>`(SELECT COUNT(DISTINCT te.trial_id) FROM trial_entries te WHERE te.variety_id = varieties.id)`.mapWith(Number);
const trialsWithLot = sql<number>`(SELECT COUNT(DISTINCT te.trial_id) FROM trial_entries te WHERE te.seed_lot_id = seed_lots.id)`.mapWith(Number);
const trialsRecording = sql<number>`(SELECT COUNT(*) FROM trial_traits tt WHERE tt.trait_id = traits.id)`.mapWith(Number);

/** Crops with how many varieties and trials each has (staff only). */
export async function listCrops(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({ id: crops.id, name: crops.name, cropGroup: crops.cropGroup, scientificName: crops.scientificName, varieties: count(varieties.id), trials: trialsGrowing })
    .from(crops)
    .leftJoin(varieties, eq(varieties.cropId, crops.id))
    .groupBy(crops.id)
    .orderBy(asc(crops.name));
}

/** Varieties with their crop, number of seed lots and trials (staff only; variety names are part of the blind key). */
export async function listVarieties(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({ id: varieties.id, name: varieties.name, cropId: crops.id, crop: crops.name, description: varieties.description, seedLots: count(seedLots.id), trials: trialsWithVariety })
    .from(varieties)
    .innerJoin(crops, eq(crops.id, varieties.cropId))
    .leftJoin(seedLots, eq(seedLots.varietyId, varieties.id))
    .groupBy(varieties.id, crops.id)
    .orderBy(asc(crops.name), asc(varieties.name));
}

/** Seed lots with variety and crop (staff only). Germination is null when the label does not state it. */
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
      trials: trialsWithLot,
    })
    .from(seedLots)
    .innerJoin(varieties, eq(varieties.id, seedLots.varietyId))
    .innerJoin(crops, eq(crops.id, varieties.cropId))
    .orderBy(asc(crops.name), asc(varieties.name), asc(seedLots.lotCode));
}

/** The trait library, built-in traits first (staff only). */
export async function listTraits(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({
      id: traits.id,
      code: traits.code,
      name: traits.name,
      unit: traits.unit,
      valueType: traits.valueType,
      minValue: traits.minValue,
      maxValue: traits.maxValue,
      dueDaysAfterSowing: traits.dueDaysAfterSowing,
      dueNote: traits.dueNote,
      computation: traits.computation,
      description: traits.description,
      builtIn: traits.builtIn,
      trials: trialsRecording,
    })
    .from(traits)
    .orderBy(asc(traits.name));
}

export type CropRow = Awaited<ReturnType<typeof listCrops>>[number];
export type VarietyRow = Awaited<ReturnType<typeof listVarieties>>[number];
export type SeedLotRow = Awaited<ReturnType<typeof listSeedLots>>[number];
export type TraitRow = Awaited<ReturnType<typeof listTraits>>[number];
