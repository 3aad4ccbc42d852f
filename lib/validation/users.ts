import { z } from "zod";
import { id } from "./common";
import { LOCALES } from "@/lib/domain/vocabulary/enums";
import type { Translator } from "@/lib/domain/i18n/catalogue";

/** Program checkboxes are named `program_<id>`; they are gathered into one list. */
const withProgramIds = (v: unknown) => {
  if (!v || typeof v !== "object") return v;
  const programIds = Object.entries(v as Record<string, unknown>)
    .filter(([k, val]) => /^program_\d+$/.test(k) && (val === "on" || val === "true"))
    .map(([k]) => Number(k.slice(8)));
  return { ...(v as object), programIds };
};

// The person being invited, not the one filling in the form.
const theirEmail = z
  .string({ error: "Enter their e-mail address." })
  .trim()
  .toLowerCase()
  .min(1, "Enter their e-mail address.")
  .max(254, "That e-mail address is too long.")
  .pipe(z.email({ error: "Enter an e-mail address like name@example.org." }));

const programIds = z.array(z.number().int().positive()).max(100, "Choose at most 100 programs.");

// Staff are invited as coordinators (of the programs ticked) or administrators (of every program).
export const inviteStaffSchema = z.preprocess(
  withProgramIds,
  z
    .object({
      name: z.string({ error: "Enter the person's name." }).trim().min(2, "Enter the person's name.").max(120, "Use at most 120 characters."),
      email: theirEmail,
      role: z.enum(["coordinator", "admin"], { error: "Choose coordinator or administrator." }),
      programIds,
    })
    .refine((v) => v.role !== "coordinator" || v.programIds.length > 0, { path: ["programIds"], message: "Tick at least one program for the coordinator." }),
);

export const coordinatorProgramsSchema = z.preprocess(withProgramIds, z.object({ userId: id(), programIds }));

export const invitationSchema = z.object({ userId: id() });

/** A person's own language (profile), worded in their current one; only the viewer's own account is ever changed. */
export const languageSchema = (t: Translator) =>
  z.object({
    locale: z.enum(LOCALES, { error: t("forms.chooseLanguage") }),
  });
