"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import {
  cropSchema,
  deleteCropSchema,
  deleteSeedLotSchema,
  deleteTraitSchema,
  deleteVarietySchema,
  seedLotSchema,
  traitSchema,
  updateCropSchema,
  updateSeedLotSchema,
  updateTraitSchema,
  updateVarietySchema,
  varietySchema,
} from "@/lib/validation/catalogue";
import {
  deleteCrop,
  deleteSeedLot,
  deleteTrait,
  deleteVariety,
  insertCrop,
  insertSeedLot,
  insertTrait,
  insertVariety,
  updateCrop,
  updateSeedLot,
  updateTrait,
  updateVariety,
} from "@/db/mutations/catalogue";

const STAFF = ["coordinator", "admin"] as ("coordinator" | "admin")[];

// Trial pages show catalogue names and lot details, so they are refreshed along with the catalogue.
function refreshCatalogue(path = "/portal/catalogue") {
  revalidatePath(path);
  revalidatePath("/portal/trials", "layout");
}

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

export const editCrop = defineAction({ roles: STAFF, schema: updateCropSchema }, async (input, viewer) => {
  await updateCrop(viewer, input);
  refreshCatalogue();
  return { ok: true, message: `${input.name} saved.` };
});

export const editVariety = defineAction({ roles: STAFF, schema: updateVarietySchema }, async (input, viewer) => {
  await updateVariety(viewer, input);
  refreshCatalogue();
  return { ok: true, message: `${input.name} saved.` };
});

export const editSeedLot = defineAction({ roles: STAFF, schema: updateSeedLotSchema }, async (input, viewer) => {
  await updateSeedLot(viewer, input);
  refreshCatalogue();
  return { ok: true, message: `Seed lot ${input.lotCode} saved.` };
});

export const editTrait = defineAction({ roles: STAFF, schema: updateTraitSchema }, async (input, viewer) => {
  await updateTrait(viewer, input);
  refreshCatalogue("/portal/catalogue/traits");
  return { ok: true, message: `${input.name} saved.` };
});

export const removeCrop = defineAction({ roles: STAFF, schema: deleteCropSchema }, async (input, viewer) => {
  await deleteCrop(viewer, input);
  revalidatePath("/portal/catalogue");
  return { ok: true, message: "Crop deleted." };
});

export const removeVariety = defineAction({ roles: STAFF, schema: deleteVarietySchema }, async (input, viewer) => {
  await deleteVariety(viewer, input);
  revalidatePath("/portal/catalogue");
  return { ok: true, message: "Variety deleted." };
});

export const removeSeedLot = defineAction({ roles: STAFF, schema: deleteSeedLotSchema }, async (input, viewer) => {
  await deleteSeedLot(viewer, input);
  revalidatePath("/portal/catalogue");
  return { ok: true, message: "Seed lot deleted." };
});

export const removeTrait = defineAction({ roles: STAFF, schema: deleteTraitSchema }, async (input, viewer) => {
  await deleteTrait(viewer, input);
  revalidatePath("/portal/catalogue/traits");
  return { ok: true, message: "Trait deleted." };
});
