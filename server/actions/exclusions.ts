"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { exclusionSchema, removeExclusionSchema, shareResultsSchema } from "@/lib/validation/analysis";
import { deleteExclusion, insertExclusion, updateResultsShared } from "@/db/mutations/exclusions";

const STAFF = ["coordinator", "admin"] as ("coordinator" | "admin")[];

export const excludeFromAnalysis = defineAction({ roles: STAFF, schema: exclusionSchema }, async (input, viewer) => {
  await insertExclusion(viewer, input);
  revalidatePath(`/portal/trials/${input.trialId}/analysis`);
  return { ok: true, message: `${input.siteId !== null ? "Site" : "Plot"} excluded. The data stay stored; the analyses below now leave it out, and published results will list it with its public reason.` };
});

export const includeInAnalysis = defineAction({ roles: STAFF, schema: removeExclusionSchema }, async (input, viewer) => {
  await deleteExclusion(viewer, input);
  revalidatePath(`/portal/trials/${input.trialId}/analysis`);
  return { ok: true, message: "Exclusion removed; the data are back in the analyses." };
});

export const shareSiteResults = defineAction({ roles: STAFF, schema: shareResultsSchema }, async (input, viewer) => {
  await updateResultsShared(viewer, input);
  revalidatePath(`/portal/trials/${input.trialId}/analysis`);
  return { ok: true, message: input.shared ? "The site's growers can now see their own site's results (blind codes only)." : "The site's results are hidden from its growers again." };
});
