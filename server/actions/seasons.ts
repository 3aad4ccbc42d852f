"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { editSeasonSchema, newSeasonSchema, seasonClosedSchema } from "@/lib/validation/seasons";
import { createSeason, editSeason, setSeasonClosed } from "@/server/seasons/seasons";

function refreshSeasonPages() {
  revalidatePath("/portal/seasons");
  revalidatePath("/portal/trials");
  revalidatePath("/portal/trials/new");
}

export const addSeason = defineAction({ roles: ["coordinator", "admin"], schema: newSeasonSchema }, async (input, viewer) => {
  await createSeason(viewer, input);
  refreshSeasonPages();
  return { ok: true, message: `${input.name} added. New trials can now be set up in it.` };
});

export const changeSeason = defineAction({ roles: ["coordinator", "admin"], schema: editSeasonSchema }, async (input, viewer) => {
  await editSeason(viewer, input);
  refreshSeasonPages();
  return { ok: true, message: `${input.name} saved.` };
});

export const closeOrReopenSeason = defineAction({ roles: ["coordinator", "admin"], schema: seasonClosedSchema }, async (input, viewer) => {
  const name = await setSeasonClosed(viewer, input);
  refreshSeasonPages();
  return { ok: true, message: input.closed ? `${name} is closed. It takes no new trials; its trials carry on.` : `${name} is open again for new trials.` };
});
