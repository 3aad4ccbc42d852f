import "server-only";
import { eq } from "drizzle-orm";
import { db } from "../index";
import { crops, seedLots, traits, varieties } from "../schema";
import { insertAudit } from "../audit";
import { isDuplicateKey, requireStaff } from "../access";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/auth/types";
import type { z } from "zod";
import type { cropSchema, seedLotSchema, traitSchema, varietySchema } from "@/lib/validation/catalogue";

/** Runs a catalogue insert with its audit entry; a unique-key clash becomes a plain field error. */
async function insertWithAudit<T extends Record<string, unknown>>(p: {
  viewer: Viewer;
  entity: string;
  duplicate: { field: string; message: string };
  write: (tx: Parameters<Parameters<typeof db.transaction>[0]>[0]) => Promise<number>;
  values: T;
}) {
  requireStaff(p.viewer);
  try {
    return await db.transaction(async (tx) => {
      const id = await p.write(tx);
      await insertAudit(tx, { actorId: p.viewer.id, action: "create", entity: p.entity, entityId: id, newValue: p.values });
      return id;
    });
  } catch (e) {
    if (isDuplicateKey(e)) throw new AppError("conflict", p.duplicate.message, { [p.duplicate.field]: [p.duplicate.message] });
    throw e;
  }
}

export async function insertCrop(viewer: Viewer, input: z.infer<typeof cropSchema>) {
  return insertWithAudit({
    viewer,
    entity: "crop",
    values: input,
    duplicate: { field: "name", message: "A crop with this name is already in the catalogue." },
    write: async (tx) => (await tx.insert(crops).values({ name: input.name, cropGroup: input.cropGroup, scientificName: input.scientificName ?? null }).$returningId())[0]!.id,
  });
}

export async function insertVariety(viewer: Viewer, input: z.infer<typeof varietySchema>) {
  return insertWithAudit({
    viewer,
    entity: "variety",
    values: input,
    duplicate: { field: "name", message: "This crop already has a variety with this name." },
    write: async (tx) => {
      const [crop] = await tx.select({ id: crops.id }).from(crops).where(eq(crops.id, input.cropId));
      if (!crop) throw new AppError("bad_request", "That crop is not in the catalogue.", { cropId: ["Choose a crop from the list."] });
      return (await tx.insert(varieties).values({ cropId: input.cropId, name: input.name, description: input.description ?? null }).$returningId())[0]!.id;
    },
  });
}

export async function insertSeedLot(viewer: Viewer, input: z.infer<typeof seedLotSchema>) {
  return insertWithAudit({
    viewer,
    entity: "seed_lot",
    values: input,
    duplicate: { field: "lotCode", message: "This lot from this source is already recorded for the variety." },
    write: async (tx) => {
      const [variety] = await tx.select({ id: varieties.id }).from(varieties).where(eq(varieties.id, input.varietyId));
      if (!variety) throw new AppError("bad_request", "That variety is not in the catalogue.", { varietyId: ["Choose a variety from the list."] });
      return (
        await tx
          .insert(seedLots)
          .values({
            varietyId: input.varietyId,
            source: input.source,
            lotCode: input.lotCode,
            labelGerminationPct: input.labelGerminationPct ?? null,
            germinationTestDate: input.germinationTestDate ?? null,
            packetDaysToMaturity: input.packetDaysToMaturity ?? null,
            treated: input.treated,
            treatment: input.treated ? (input.treatment ?? null) : null,
          })
          .$returningId()
      )[0]!.id;
    },
  });
}

/** Adds a trait to the shared library; built-in traits come only from the seed script. */
export async function insertTrait(viewer: Viewer, input: z.infer<typeof traitSchema>) {
  return insertWithAudit({
    viewer,
    entity: "trait",
    values: input,
    duplicate: { field: "code", message: "A trait with this code already exists; choose another code." },
    write: async (tx) =>
      (
        await tx
          .insert(traits)
          .values({
            code: input.code,
            name: input.name,
            unit: input.unit ?? null,
            valueType: input.valueType,
            minValue: input.minValue ?? null,
            maxValue: input.maxValue ?? null,
            dueDaysAfterSowing: input.dueDaysAfterSowing ?? null,
            dueNote: input.dueNote ?? null,
            computation: input.computation,
            description: input.description ?? null,
            builtIn: false,
          })
          .$returningId()
      )[0]!.id,
  });
}
