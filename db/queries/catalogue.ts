import "server-only";
import { asc, count, eq } from "drizzle-orm";
import { db } from "../index";
import { crops, seedLots, traits, varieties } from "../schema";
import type { Viewer } from "@/lib/auth/types";

const isStaff = (v: Viewer) => v.role === "coordinator" || v.role === "admin";

/** Crops with how many varieties each has (staff only). */
export async function listCrops(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({ id: crops.id, name: crops.name, cropGroup: crops.cropGroup, scientificName: crops.scientificName, varieties: count(varieties.id) })
    .from(crops)
    .leftJoin(varieties, eq(varieties.cropId, crops.id))
    .groupBy(crops.id)
    .orderBy(asc(crops.name));
}

/** Varieties with their crop and number of seed lots (staff only; variety names are part of the blind key). */
export async function listVarieties(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db
    .select({ id: varieties.id, name: varieties.name, cropId: crops.id, crop: crops.name, description: varieties.description, seedLots: count(seedLots.id) })
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
      builtIn: traits.builtIn,
    })
    .from(traits)
    .orderBy(asc(traits.name));
}

export type CropRow = Awaited<ReturnType<typeof listCrops>>[number];
export type VarietyRow = Awaited<ReturnType<typeof listVarieties>>[number];
export type SeedLotRow = Awaited<ReturnType<typeof listSeedLots>>[number];
export type TraitRow = Awaited<ReturnType<typeof listTraits>>[number];
