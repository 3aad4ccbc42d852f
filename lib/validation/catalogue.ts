import { z } from "zod";
import { CROP_GROUPS, TRAIT_COMPUTATIONS, TRAIT_TYPES } from "@/lib/domain/vocabulary/enums";
import { blankToUndefined, checkbox, id, optionalId, optionalIsoDate, optionalNumber, optionalText, requiredText } from "./common";

// A new variety or trait joins the program chosen on the form; the field is left out when the viewer runs
// only one program. Edits never move an item to another program.
const programId = optionalId("Choose the program.");

export const cropSchema = z.object({
  name: requiredText("the crop name", 80),
  cropGroup: z.enum(CROP_GROUPS, { error: "Choose a crop group." }),
  scientificName: optionalText(120),
});

export const varietySchema = z.object({
  programId,
  cropId: id("Choose the crop."),
  name: requiredText("the variety name", 120),
  description: optionalText(2000),
});

export const seedLotSchema = z
  .object({
    varietyId: id("Choose the variety."),
    source: requiredText("where the seed came from", 120),
    lotCode: requiredText("the lot code from the packet", 60),
    labelGerminationPct: optionalNumber("Germination on the label must be a percentage from 0 to 100.", 0, 100),
    germinationTestDate: optionalIsoDate("Enter the test date like 2025-11-15."),
    packetDaysToMaturity: z.preprocess(
      blankToUndefined,
      z.coerce.number({ error: "Days to maturity must be a whole number." }).int("Days to maturity must be a whole number.").min(1, "Days to maturity must be at least 1.").max(400, "Days to maturity must be at most 400.").optional(),
    ),
    treated: checkbox,
    treatment: optionalText(160),
  })
  .refine((v) => !v.treated || !!v.treatment, { path: ["treatment"], message: "Name the seed treatment as shown on the seed tag." });

/** Days after sowing, as typed: "5, 7, 10, 14". */
const dueDays = z.preprocess(
  blankToUndefined,
  z
    .string()
    .regex(/^\s*\d{1,3}(\s*,\s*\d{1,3})*\s*$/, "List days after sowing as whole numbers separated by commas, e.g. 5, 7, 10, 14.")
    .transform((s) => [...new Set(s.split(",").map((d) => Number(d.trim())))].sort((a, b) => a - b))
    .refine((days) => days.every((d) => d >= 0 && d <= 365), "Days after sowing must be between 0 and 365.")
    .optional(),
);

export const traitSchema = z
  .object({
    programId,
    name: requiredText("the trait name", 120, 2),
    code: z
      .string({ error: "Enter a short code." })
      .trim()
      .toLowerCase()
      .regex(/^[a-z][a-z0-9_]{1,39}$/, "Use 2–40 lowercase letters, digits or underscores, starting with a letter (e.g. stem_length)."),
    unit: optionalText(40),
    valueType: z.enum(TRAIT_TYPES, { error: "Choose what kind of value is recorded." }),
    minValue: optionalNumber("The lowest valid value must be a number."),
    maxValue: optionalNumber("The highest valid value must be a number."),
    dueDaysAfterSowing: dueDays,
    dueNote: optionalText(200),
    computation: z.enum(TRAIT_COMPUTATIONS, { error: "Choose how the value is computed." }).default("none"),
    description: optionalText(2000),
  })
  .refine((v) => v.minValue === undefined || v.maxValue === undefined || v.minValue <= v.maxValue, {
    path: ["maxValue"],
    message: "The highest valid value must not be below the lowest.",
  })
  .refine((v) => v.valueType !== "rating" || ((v.minValue ?? 1) >= 1 && (v.maxValue ?? 9) <= 9), {
    path: ["maxValue"],
    message: "Ratings use a 1–9 scale.",
  })
  .refine((v) => v.computation === "none" || v.valueType === "date", {
    path: ["computation"],
    message: "Only a date can be turned into days from sowing or transplanting.",
  });

export type TraitInput = z.infer<typeof traitSchema>;

// Edits carry the item's id with the same fields as the add forms; deletes carry only the id.
export const updateCropSchema = cropSchema.extend({ cropId: id() });
export const updateVarietySchema = varietySchema.extend({ varietyId: id() });
export const updateSeedLotSchema = seedLotSchema.safeExtend({ seedLotId: id() });
export const updateTraitSchema = traitSchema.safeExtend({ traitId: id() });

export const deleteCropSchema = z.object({ cropId: id() });
export const deleteVarietySchema = z.object({ varietyId: id() });
export const deleteSeedLotSchema = z.object({ seedLotId: id() });
export const deleteTraitSchema = z.object({ traitId: id() });
