"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { defineAction } from "./define-action";
import { traitDirectionSchema } from "@/lib/validation/analysis";
import { entryLotSchema, siteNamingSchema, moveTraitSchema, rollForwardSchema, addEntrySchema, changeStatusSchema, createTrialSchema, enrolSiteSchema, randomiseSchema, removeEntrySchema, sowingDateSchema, updateTrialSchema } from "@/lib/validation/trials";
import { addTrialEntry, createTrial as createTrialUseCase, editTrialDesign, moveTrialStatus, moveTrialTrait, removeTrialEntry, setEntrySeedLot, rollTrialForward, setTraitDirection } from "@/server/trials/design";
import { enrolTrialSite, moveSowingDate, randomiseTrialSite, setSiteNaming } from "@/server/trials/enrolment";
import { deliverSoon } from "@/server/mail/outbox";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { STATUS_LABELS } from "@/lib/domain/vocabulary/statuses";

const STAFF = ["coordinator", "admin"] as ("coordinator" | "admin")[];
const trialPath = (id: number) => `/portal/trials/${id}`;

export const createTrial = defineAction({ roles: STAFF, schema: createTrialSchema }, async (input, viewer) => {
  const trialId = await createTrialUseCase(viewer, input);
  revalidatePath("/portal/trials");
  redirect(trialPath(trialId));
});

export const editTrial = defineAction({ roles: STAFF, schema: updateTrialSchema }, async (input, viewer) => {
  await editTrialDesign(viewer, input);
  revalidatePath(trialPath(input.trialId));
  return { ok: true, message: "Trial details saved." };
});

export const addEntry = defineAction({ roles: STAFF, schema: addEntrySchema }, async (input, viewer) => {
  const { blindCode } = await addTrialEntry(viewer, input);
  revalidatePath(trialPath(input.trialId));
  return { ok: true, message: `Entry added with blind code ${blindCode}.` };
});

export const removeEntry = defineAction({ roles: STAFF, schema: removeEntrySchema }, async (input, viewer) => {
  await removeTrialEntry(viewer, input);
  revalidatePath(trialPath(input.trialId));
  return { ok: true, message: "Entry removed." };
});

export const enrolSite = defineAction({ roles: STAFF, schema: enrolSiteSchema }, async (input, viewer) => {
  const { invited } = await enrolTrialSite(viewer, input);
  await deliverSoon();
  revalidatePath(trialPath(input.trialId));
  return { ok: true, message: invited.length > 0 ? `Site enrolled. Invitation sent to ${invited.join(", ")}.` : "Site enrolled." };
});

export const randomiseSite = defineAction({ roles: STAFF, schema: randomiseSchema }, async (input, viewer) => {
  const { seed, plots } = await randomiseTrialSite(viewer, input);
  revalidatePath(trialPath(input.trialId));
  revalidatePath(`${trialPath(input.trialId)}/sites/${input.siteId}`);
  return { ok: true, message: `Laid out ${plots} plots (seed ${seed}).` };
});

export const changeSowingDate = defineAction({ roles: STAFF, schema: sowingDateSchema }, async (input, viewer) => {
  const { sownOn } = input;
  const { changed, values } = await moveSowingDate(viewer, input);
  if (!changed) return { ok: true, message: `The sowing date is already ${formatDate(sownOn)}.` };
  // Every page that shows due dates or days from sowing reads the enrolment, so all of them refresh.
  revalidatePath(trialPath(input.trialId));
  revalidatePath(`${trialPath(input.trialId)}/sites/${input.siteId}`);
  revalidatePath(`/portal/record/${input.trialId}/${input.siteId}`);
  revalidatePath("/portal");
  const recount = values > 0 ? ` Days to emergence and harvest for the ${values} values already recorded are now counted from it.` : "";
  return { ok: true, message: `Sowing date set to ${formatDate(sownOn)}. Due dates follow it; reprint this site's field sheet.${recount}` };
});

export const changeTrialStatus = defineAction({ roles: STAFF, schema: changeStatusSchema }, async (input, viewer) => {
  await moveTrialStatus(viewer, input);
  revalidatePath(trialPath(input.trialId));
  revalidatePath("/portal/trials");
  return { ok: true, message: `Trial is now ${STATUS_LABELS[input.status].toLowerCase()}.` };
});

export const setDirection = defineAction({ roles: STAFF, schema: traitDirectionSchema }, async (input, viewer) => {
  await setTraitDirection(viewer, input);
  revalidatePath(`${trialPath(input.trialId)}/analysis`);
  return {
    ok: true,
    message:
      input.betterWhen === null
        ? "Back to the trait library's direction. Rankings now follow it; published versions keep theirs until you publish again."
        : `Saved: ${input.betterWhen === "neither" ? "no preference, so nothing is ranked or called best" : `${input.betterWhen} is better`}. Published versions keep theirs until you publish again.`,
  };
});

export const planNextSeason = defineAction({ roles: STAFF, schema: rollForwardSchema }, async (input, viewer) => {
  const { trialId } = await rollTrialForward(viewer, input);
  await deliverSoon();
  revalidatePath("/portal/trials");
  revalidatePath(trialPath(input.trialId));
  redirect(trialPath(trialId));
});

export const moveTrait = defineAction({ roles: STAFF, schema: moveTraitSchema }, async (input, viewer) => {
  await moveTrialTrait(viewer, input);
  revalidatePath(trialPath(input.trialId));
  return { ok: true, message: "Trait order saved. The form, sheets, spreadsheet and reports follow it." };
});

export const changeSiteNaming = defineAction({ roles: STAFF, schema: siteNamingSchema }, async (input, viewer) => {
  await setSiteNaming(viewer, input);
  revalidatePath(trialPath(input.trialId));
  return {
    ok: true,
    message: input.named ? "The site will be named in the next published version." : "The site will be published as \"Site N, region\" from the next version on.",
  };
});

export const chooseEntryLot = defineAction({ roles: STAFF, schema: entryLotSchema }, async (input, viewer) => {
  await setEntrySeedLot(viewer, input);
  revalidatePath(trialPath(input.trialId));
  return { ok: true, message: "Seed lot saved." };
});
