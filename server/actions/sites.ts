"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { siteSchema } from "@/lib/validation/sites";
import { insertSite } from "@/db/mutations/sites";

export const createSite = defineAction({ roles: ["coordinator", "admin"], schema: siteSchema }, async (input, viewer) => {
  await insertSite(viewer, input);
  revalidatePath("/portal/sites");
  return { ok: true, message: `${input.name} added. Its grower is invited when the site joins a trial.` };
});
