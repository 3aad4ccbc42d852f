"use server";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { cropSchema, seedLotSchema, traitSchema, varietySchema } from "@/lib/validation/catalogue";
import { insertCrop, insertSeedLot, insertTrait, insertVariety } from "@/db/mutations/catalogue";

const STAFF = ["coordinator", "admin"] as ("coordinator" | "admin")[];

export const createCrop = defineAction({ roles: STAFF, schema: cropSchema }, async (input, viewer) => {
  await insertCrop(viewer, input);
  revalidatePath("/portal/catalogue");
  return { ok: true, message: `${input.name} added to the catalogue.` };
});

export const createVariety = defineAction({ roles: STAFF, schema: varietySchema }, async (input, viewer) => {
  await insertVariety(viewer, input);
  revalidatePath("/portal/catalogue");
  return { ok: true, message: `${input.name} added.` };
});

export const createSeedLot = defineAction({ roles: STAFF, schema: seedLotSchema }, async (input, viewer) => {
  await insertSeedLot(viewer, input);
  revalidatePath("/portal/catalogue");
  return { ok: true, message: `Seed lot ${input.lotCode} recorded.` };
});

export const createTrait = defineAction({ roles: STAFF, schema: traitSchema }, async (input, viewer) => {
  await insertTrait(viewer, input);
  revalidatePath("/portal/catalogue/traits");
  return { ok: true, message: `${input.name} added to the trait library.` };
});
