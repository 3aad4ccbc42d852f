import { z } from "zod";
import { id, idParam } from "./common";
import { MISSING_REASONS } from "@/lib/domain/vocabulary/enums";
import { VALUE_AND_REASON_MESSAGE } from "@/lib/domain/observations/values";

// Requests from the data-entry form and the review page. Values stay strings here: how a string becomes a
// count, date or rating depends on the trait, which lib/domain/observations/values.ts decides with the trait row.

// What the phone last knew as saved in a slot when the value was typed; a slot that changed on the server since
// then comes back as a choice instead of being overwritten.
const knownSavedSchema = z.object({
  value: z.string().max(2000, "That value is too long.").nullable(),
  missingReason: z.enum(MISSING_REASONS).nullable(),
});

export const saveObservationsSchema = z.object({
  trialId: idParam,
  siteId: idParam,
  // The phone's own id for this save, so a save sent again after a lost answer is written once.
  clientSaveId: z.uuid({ error: "That save id is not valid." }).optional(),
  values: z
    .array(
      z
        .object({
          plotId: z.number({ error: "Each value needs its plot." }).int().positive(),
          key: z.string().min(1).max(80),
          value: z.string().max(2000, "That value is too long.").nullable(),
          // Why the plot has no value; sending null with no value clears both.
          missingReason: z.enum(MISSING_REASONS, { error: "Choose one of the listed reasons." }).nullable().optional(),
          knownSaved: knownSavedSchema.optional(),
        })
        .refine((v) => !(v.missingReason && v.value !== null && v.value.trim() !== ""), { error: VALUE_AND_REASON_MESSAGE }),
    )
    .min(1, "There is nothing to save.")
    .max(1000, "Save at most 1,000 values at a time."),
});
export type SaveObservationsInput = z.infer<typeof saveObservationsSchema>;

export const siteParamsSchema = z.object({ trialId: idParam, siteId: idParam });

const optionalTextField = (max: number) => z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v), z.string().trim().max(max, `Use at most ${max} characters.`).optional());

export const returnSubmissionSchema = siteParamsSchema.extend({ message: optionalTextField(2000) });

export const reviewCommentSchema = siteParamsSchema.extend({
  plotId: z.preprocess((v) => (v === "" ? undefined : v), idParam.optional()),
  key: optionalTextField(80),
  body: z.string({ error: "Write the comment." }).trim().min(1, "Write the comment.").max(2000, "Use at most 2,000 characters."),
});

export const photoFieldsSchema = siteParamsSchema.extend({
  plotId: z.preprocess((v) => (v === "" || v === null ? undefined : v), idParam.optional()),
  caption: optionalTextField(300),
  takenOn: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Enter the date like 2026-11-30.").optional()),
  keepLocation: z.preprocess((v) => v === "on" || v === "true" || v === true, z.boolean()),
});

/** Removing a photo from a site's page: the photo, and the site page to show again. */
export const removePhotoSchema = z.object({ photoId: id("That photo does not exist."), trialId: id(), siteId: id() });
