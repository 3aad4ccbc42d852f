"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { languageSchema } from "@/lib/validation/users";
import { updateUserLocale } from "@/db/mutations/users";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

/** Sets the signed-in person's own language; the form names no account, so nobody can change another's. */
export const setMyLanguage = defineAction({ roles: ["admin", "coordinator", "cooperator"], schema: languageSchema }, async (input, viewer) => {
  await updateUserLocale({ userId: viewer.id, locale: input.locale });
  revalidatePath("/", "layout");
  return { ok: true, message: translatorFor(input.locale)("account.saved") };
});
