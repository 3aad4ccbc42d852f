"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { siteSchema, sitePrintLanguageSchema } from "@/lib/validation/sites";
import { insertSite, updateSitePrintLocale } from "@/db/mutations/sites";

export const createSite = defineAction({ roles: ["coordinator", "admin"], schema: siteSchema }, async (input, viewer) => {
  await insertSite(viewer, input);
  revalidatePath("/portal/sites");
  return { ok: true, message: `${input.name} added. Its grower is invited when the site joins a trial.` };
});

/** Staff choose the language of a site's printouts (field sheets, labels, maps, packing lists). */
export const setSitePrintLanguage = defineAction({ roles: ["coordinator", "admin"], schema: sitePrintLanguageSchema }, async (input, viewer) => {
  await updateSitePrintLocale(viewer, { siteId: input.siteId, printLocale: input.printLocale });
  revalidatePath("/portal/sites");
  return { ok: true, message: "Printout language saved." };
});
