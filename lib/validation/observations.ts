import { z } from "zod";
import { id, idParam } from "./common";
import { MISSING_REASONS } from "@/lib/domain/vocabulary/enums";
import type { Translator } from "@/lib/domain/i18n/catalogue";

// Requests from the data-entry form and the review page. Values stay strings here: how a string becomes a
// count, date or rating depends on the trait, which lib/domain/observations/values.ts decides with the trait row.
// Schemas a grower's request goes through take the grower's Translator, so their messages are in the
// grower's language (parse them with parseIn from ./field-errors).

// What the phone last knew as saved in a slot when the value was typed; a slot that changed on the server since
// then comes back as a choice instead of being overwritten.
const knownSavedSchema = (t: Translator) =>
  z.object({
    value: z.string().max(2000, t("forms.valueTooLong")).nullable(),
    missingReason: z.enum(MISSING_REASONS).nullable(),
  });

export const saveObservationsSchema = (t: Translator) =>
  z.object({
    trialId: idParam,
    siteId: idParam,
    // The phone's own id for this save, so a save sent again after a lost answer is written once.
    clientSaveId: z.uuid({ error: t("forms.badSaveId") }).optional(),
    values: z
      .array(
        z
          .object({
            plotId: z.number({ error: t("forms.valueNeedsPlot") }).int().positive(),
            key: z.string().min(1).max(80),
            value: z.string().max(2000, t("forms.valueTooLong")).nullable(),
            // Why the plot has no value; sending null with no value clears both.
            missingReason: z.enum(MISSING_REASONS, { error: t("forms.chooseReason") }).nullable().optional(),
            knownSaved: knownSavedSchema(t).optional(),
          })
          .refine((v) => !(v.missingReason && v.value !== null && v.value.trim() !== ""), { error: t("values.valueAndReason") }),
      )
      .min(1, t("forms.nothingToSave"))
      .max(1000, t("forms.tooManyValues")),
  });
export type SaveObservationsInput = z.infer<ReturnType<typeof saveObservationsSchema>>;

export const siteParamsSchema = z.object({ trialId: idParam, siteId: idParam });

const optionalTextField = (max: number) => z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v), z.string().trim().max(max, `Use at most ${max} characters.`).optional());

export const returnSubmissionSchema = siteParamsSchema.extend({ message: optionalTextField(2000) });

export const reviewCommentSchema = siteParamsSchema.extend({
  plotId: z.preprocess((v) => (v === "" ? undefined : v), idParam.optional()),
  key: optionalTextField(80),
  body: z.string({ error: "Write the comment." }).trim().min(1, "Write the comment.").max(2000, "Use at most 2,000 characters."),
});

export const photoFieldsSchema = (t: Translator) =>
  siteParamsSchema.extend({
    plotId: z.preprocess((v) => (v === "" || v === null ? undefined : v), idParam.optional()),
    caption: z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v), z.string().trim().max(300, t("forms.atMostChars", { max: "300" })).optional()),
    takenOn: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.string().regex(/^\d{4}-\d{2}-\d{2}$/, t("forms.photoDate")).optional()),
    keepLocation: z.preprocess((v) => v === "on" || v === "true" || v === true, z.boolean()),
  });

/** Removing a photo from a site's page: the photo, and the site page to show again. */
export const removePhotoSchema = (t: Translator) => z.object({ photoId: id(t("forms.noSuchPhoto")), trialId: id(t("forms.chooseItem")), siteId: id(t("forms.chooseItem")) });
